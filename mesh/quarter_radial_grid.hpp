#pragma once
// A rectilinear grid for flow to a well in an aquifer that is the same in every direction:
// one quarter of a grid that is symmetric about the well, cells growing geometrically away
// from it (a radial-telescoping grid). The well lies at the grid's south-west corner, in the
// corner cell; the two edges through the well are lines of symmetry (no flow), so a quarter
// of the rate there gives the drawdown of the whole grid. Includes only the standard library.
#include <vector>

#include "mesh/rectilinear_grid.hpp"

namespace aquiledger {

/// How the quarter grid is built.
struct QuarterRadialGridSpec {
  double inner = 1.0;   ///< L, width of the well's cell in the whole (symmetric) grid
  double growth = 1.1;  ///< -, ratio of consecutive widths away from the well (> 1)
  double extent = 1e3;  ///< L, the grid reaches at least this far from the well
  /// L, distances from the well at which a column centre must lie (observation wells, whose
  /// heads then need no interpolation between centres); any order. Between two of them the
  /// widths grow by the ratio nearest `growth` that puts a centre exactly there; one closer
  /// than a cell width to the centre before it is left between centres.
  std::vector<double> anchors;
};

/// Column widths west to east (L): inner / 2 (the half of the well's cell east of the well),
/// then inner g, inner g^2, ... (adjusted to the anchors) until their sum reaches
/// spec.extent. Throws
/// std::invalid_argument for inner <= 0, growth <= 1 or extent <= inner.
std::vector<double> quarter_radial_widths(const QuarterRadialGridSpec& spec);

/// The grid: columns quarter_radial_widths west to east, rows the same south to north (so the
/// well's quarter cell is the south-west one, row n - 1, column 0), origin (0, 0) at the well.
RectilinearGrid quarter_radial_grid(const QuarterRadialGridSpec& spec);

/// The factor (-) on a cell's conductivity across the lines of symmetry that makes the quarter
/// grid's faces those of the whole grid: cells of the first column (row n - 1) are half as
/// wide (high) as the whole grid's cell cut by the symmetry line, so with the half-cell
/// resistances d / (2 K) of a face (harmonic mean) their K along x (y) is halved:
/// (inner / 2) / (2 K / 2) = inner / (2 K). 0.5 on those cells, 1 elsewhere.
double quarter_radial_x_factor(const RectilinearGrid& grid, int col);
double quarter_radial_y_factor(const RectilinearGrid& grid, int row);

}  // namespace aquiledger
