#pragma once
// A rectilinear grid centred on a pumped well whose four sides away from the well need not be
// alike: each side (east, north, west, south) ends far away, on a straight boundary parallel
// to the grid's axes (no flow, or a fixed head on the line), and may hold lines across which
// the aquifer changes (a cell face lies on each). Where the two sides of an axis are alike the
// axis is a line of symmetry and only one side is built (a half grid; a quarter grid when both
// axes are), as in quarter_radial_grid.hpp, whose width rule builds every side.
// Includes only the standard library.
#include <array>
#include <vector>

#include "mesh/rectilinear_grid.hpp"

namespace aquiledger {

/// How one side of the grid (from the well outward along an axis) ends.
enum class GridSideEnd {
  far,       ///< at the grid's extent: no flow there, meant to be out of the cone's reach
  barrier,   ///< no flow across the line at `end_distance` (the grid's edge lies on it)
  recharge,  ///< the head is fixed on the line at `end_distance` (a column of fixed cells
             ///< whose centres lie on it)
};

/// One side of the grid, distances from the well along the axis (L).
struct GridSide {
  GridSideEnd end = GridSideEnd::far;
  double end_distance = 0.0;  ///< L, for barrier and recharge (> the well's half cell)
  /// L, lines across which the aquifer changes: a cell face lies exactly on each (the column
  /// the width rule centres there is split in two halves). Before end_distance.
  std::vector<double> faces;
  /// L, distances at which a centre should lie (observation wells), as
  /// QuarterRadialGridSpec::anchors; one that would keep a face or the end off its line is
  /// dropped (its head is then interpolated).
  std::vector<double> anchors;
};

/// Sides in the order east (+x), north (+y), west (-x), south (-y).
enum GridSideIndex { grid_east = 0, grid_north = 1, grid_west = 2, grid_south = 3 };

struct WellCentredGridSpec {
  double inner = 1.0;   ///< L, width of the well's cell in the whole grid
  double growth = 1.1;  ///< -, ratio of consecutive widths away from the well (> 1)
  double extent = 1e3;  ///< L, a far side reaches at least this far from the well
  std::array<GridSide, 4> sides;
  /// Build only the east (north) side: the y (x) axis through the well is a line of symmetry.
  /// The west (south) side's spec is then ignored.
  bool mirror_west = false, mirror_south = false;
};

/// The grid and what the flow model needs of it.
struct WellCentredGrid {
  /// Origin such that the well lies at (0, 0): at its cell's centre, or on the symmetry
  /// edges of a half or quarter grid.
  RectilinearGrid grid;
  int well_row = 0, well_col = 0;
  /// -, the factor on K along x per column and along y per row: 0.5 on the half cells cut by
  /// a line of symmetry (see quarter_radial_x_factor), 1 elsewhere.
  std::vector<double> x_factor, y_factor;
  /// -, the share of the whole well's rate its cell takes: 1, 1/2 or 1/4.
  double rate_share = 1.0;
  /// The cells of fixed head (recharge sides), ascending, no repeats.
  std::vector<CellIndex> fixed_cells;
};

/// Widths of one side from the well outward (L): the first is inner / 2 (the side's half of
/// the well's cell), then quarter_radial_widths' rule toward the side's anchors, faces and
/// end. A barrier side ends on the half of the column centred on the line (its edge on the
/// line); a recharge side ends with the column centred on it. Throws std::invalid_argument
/// when a face or the end cannot be put on its line (closer than a cell width to the well or
/// to another face) or a face lies beyond the end.
std::vector<double> well_centred_side_widths(const WellCentredGridSpec& spec, const GridSide& side);

WellCentredGrid well_centred_grid(const WellCentredGridSpec& spec);

}  // namespace aquiledger
