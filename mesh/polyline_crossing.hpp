#pragma once
// Length of a polyline inside each cell of a rectilinear grid, exact: each segment is cut
// at every column and row edge it crosses, and each piece belongs to the cell holding its
// midpoint. Pure geometry, no files.
#include <array>
#include <span>
#include <utility>
#include <vector>

#include "mesh/rectilinear_grid.hpp"

namespace aquiledger {

struct CellLength {
  CellIndex cell;
  double length = 0.0;  ///< L of the polyline inside the cell
  /// (vertex, weight in L) pairs, weights summing to `length`: a quantity given at the
  /// vertices and linear along each segment has the mean sum(weight v_vertex) / length over
  /// the cell's pieces (each piece is linear, so its integral is its length times the value
  /// at its midpoint).
  std::vector<std::pair<std::size_t, double>> vertex_weights;
};

struct PolylineCrossing {
  std::vector<CellLength> active;  ///< active cells crossed, in the order first met
  double inactive_length = 0.0;    ///< L inside the grid but in inactive cells
  double outside_length = 0.0;     ///< L outside the grid
  double total_length = 0.0;       ///< L of the whole polyline
};

/// points: vertices (x, y) in L, at least two.
PolylineCrossing cross_polyline(const RectilinearGrid& grid,
                                std::span<const std::array<double, 2>> points);

}  // namespace aquiledger
