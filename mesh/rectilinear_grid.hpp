#pragma once
#include <cassert>
#include <cstdint>
#include <optional>
#include <span>
#include <vector>

#include "mesh/cell_index.hpp"

namespace aquiledger {

/// A structured 2D grid with variable column widths and row heights and an active mask.
/// Index space follows the raster convention (row 0 north, column 0 west); geometry
/// follows the map convention (x east, y north, origin at the south-west corner).
class RectilinearGrid {
 public:
  RectilinearGrid() = default;
  /// dx: column widths west to east (L); dy: row heights north to south (L);
  /// origin: south-west corner (L); active: n_rows * n_cols flags in raster order (empty = all).
  RectilinearGrid(std::vector<double> dx, std::vector<double> dy, double origin_x, double origin_y,
                  std::vector<std::uint8_t> active = {});

  int n_rows() const { return static_cast<int>(dy_.size()); }
  int n_cols() const { return static_cast<int>(dx_.size()); }
  int n_cells() const { return n_rows() * n_cols(); }
  int n_active() const { return n_active_; }

  CellIndex cell(int row, int col) const {
    assert(row >= 0 && row < n_rows() && col >= 0 && col < n_cols());
    return CellIndex{row * n_cols() + col};
  }
  RowCol row_col(CellIndex c) const {
    assert(c.valid() && c.value < n_cells());
    return RowCol{c.value / n_cols(), c.value % n_cols()};
  }
  bool is_active(CellIndex c) const { return active_[static_cast<std::size_t>(c.value)] != 0; }

  /// Column width (L) and row height (L).
  double dx(int col) const { return dx_[static_cast<std::size_t>(col)]; }
  double dy(int row) const { return dy_[static_cast<std::size_t>(row)]; }
  std::span<const double> column_widths() const { return dx_; }
  std::span<const double> row_heights() const { return dy_; }
  /// Plan area of a cell (L2).
  double area(CellIndex c) const {
    const RowCol rc = row_col(c);
    return dx(rc.col) * dy(rc.row);
  }
  /// Cell-centre coordinates (L).
  double x_center(int col) const { return 0.5 * (x_edges_[col] + x_edges_[col + 1]); }
  double y_center(int row) const { return 0.5 * (y_edges_[row] + y_edges_[row + 1]); }

  /// Cell edges: x west to east (n_cols + 1 values), y north to south (n_rows + 1 values).
  std::span<const double> x_edges() const { return x_edges_; }
  std::span<const double> y_edges() const { return y_edges_; }
  double x_min() const { return x_edges_.front(); }
  double x_max() const { return x_edges_.back(); }
  double y_min() const { return y_edges_.back(); }
  double y_max() const { return y_edges_.front(); }

  /// The cell containing the point, if it lies inside the grid. A point on an interior edge
  /// belongs to the cell east or south of it; points on the outer boundary are inside.
  std::optional<CellIndex> locate(double x, double y) const;

  /// East neighbour (col + 1) and south neighbour (row + 1), if they exist.
  std::optional<CellIndex> east_of(CellIndex c) const;
  std::optional<CellIndex> south_of(CellIndex c) const;

 private:
  std::vector<double> dx_;
  std::vector<double> dy_;
  std::vector<double> x_edges_;
  std::vector<double> y_edges_;
  std::vector<std::uint8_t> active_;
  int n_active_ = 0;
};

}  // namespace aquiledger
