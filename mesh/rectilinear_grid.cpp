#include "mesh/rectilinear_grid.hpp"

#include <algorithm>
#include <stdexcept>

namespace aquiledger {

RectilinearGrid::RectilinearGrid(std::vector<double> dx, std::vector<double> dy, double origin_x,
                                 double origin_y, std::vector<std::uint8_t> active)
    : dx_(std::move(dx)), dy_(std::move(dy)), active_(std::move(active)) {
  if (dx_.empty() || dy_.empty())
    throw std::invalid_argument("grid needs at least one row and column");
  for (double w : dx_)
    if (!(w > 0.0)) throw std::invalid_argument("column widths must be positive");
  for (double h : dy_)
    if (!(h > 0.0)) throw std::invalid_argument("row heights must be positive");
  const std::size_t n = dx_.size() * dy_.size();
  if (active_.empty()) active_.assign(n, 1);
  if (active_.size() != n) throw std::invalid_argument("active mask has the wrong number of cells");

  x_edges_.resize(dx_.size() + 1);
  x_edges_[0] = origin_x;
  for (std::size_t j = 0; j < dx_.size(); ++j) x_edges_[j + 1] = x_edges_[j] + dx_[j];
  // y edges run north to south: the south edge is the origin.
  double total_y = 0.0;
  for (double h : dy_) total_y += h;
  y_edges_.resize(dy_.size() + 1);
  y_edges_[0] = origin_y + total_y;
  for (std::size_t i = 0; i < dy_.size(); ++i) y_edges_[i + 1] = y_edges_[i] - dy_[i];
  y_edges_.back() = origin_y;
  n_active_ = static_cast<int>(
      std::count_if(active_.begin(), active_.end(), [](auto a) { return a != 0; }));
}

std::optional<CellIndex> RectilinearGrid::locate(double x, double y) const {
  if (!(x >= x_min() && x <= x_max() && y >= y_min() && y <= y_max())) return std::nullopt;
  // Column: last edge <= x. Row: edges decrease southward; first row whose south edge < y.
  auto xe = std::upper_bound(x_edges_.begin(), x_edges_.end(), x);
  int col = std::clamp(static_cast<int>(xe - x_edges_.begin()) - 1, 0, n_cols() - 1);
  auto ye = std::upper_bound(y_edges_.begin(), y_edges_.end(), y, std::greater<double>());
  // ye points to the first edge strictly below y; the row lies above that edge.
  int row = std::clamp(static_cast<int>(ye - y_edges_.begin()) - 1, 0, n_rows() - 1);
  return cell(row, col);
}

std::optional<CellIndex> RectilinearGrid::east_of(CellIndex c) const {
  const RowCol rc = row_col(c);
  if (rc.col + 1 >= n_cols()) return std::nullopt;
  return cell(rc.row, rc.col + 1);
}

std::optional<CellIndex> RectilinearGrid::south_of(CellIndex c) const {
  const RowCol rc = row_col(c);
  if (rc.row + 1 >= n_rows()) return std::nullopt;
  return cell(rc.row + 1, rc.col);
}

}  // namespace aquiledger
