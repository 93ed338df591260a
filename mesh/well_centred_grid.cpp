#include "mesh/well_centred_grid.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

#include "mesh/quarter_radial_grid.hpp"

namespace aquiledger {
namespace {

/// Index of the width whose centre lies at distance r from the well (widths from the well
/// outward, the first the half well cell), or -1. The centre of width i >= 1 is the sum of the
/// widths before it plus half its own.
int side_column_centred_at(const std::vector<double>& widths, double r) {
  double sum = widths.front();
  for (std::size_t i = 1; i < widths.size(); ++i) {
    if (std::abs(sum + 0.5 * widths[i] - r) <= 1e-9 * r) return static_cast<int>(i);
    sum += widths[i];
  }
  return -1;
}

}  // namespace

std::vector<double> well_centred_side_widths(const WellCentredGridSpec& spec,
                                             const GridSide& side) {
  const bool bounded = side.end != GridSideEnd::far;
  std::vector<double> required = side.faces;
  if (bounded) required.push_back(side.end_distance);
  std::sort(required.begin(), required.end());
  for (double r : required)
    if (!(std::isfinite(r) && r > 0.5 * spec.inner))
      throw std::invalid_argument("well-centred grid: a boundary or zone line at " +
                                  std::to_string(r) + " lies inside the well's cell");
  if (bounded && !side.faces.empty() &&
      *std::max_element(side.faces.begin(), side.faces.end()) >= side.end_distance)
    throw std::invalid_argument("well-centred grid: a zone line lies beyond the boundary");
  std::vector<double> optional;
  for (double a : side.anchors)
    if (!bounded || a < side.end_distance) optional.push_back(a);
  std::sort(optional.begin(), optional.end());
  for (;;) {
    QuarterRadialGridSpec q;
    q.inner = spec.inner;
    q.growth = spec.growth;
    q.extent = bounded ? side.end_distance : std::max(spec.extent, 1.5 * spec.inner);
    q.anchors = optional;
    q.anchors.insert(q.anchors.end(), required.begin(), required.end());
    std::vector<double> widths = quarter_radial_widths(q);
    double missing = -1.0;
    for (double r : required)
      if (side_column_centred_at(widths, r) < 0) {
        missing = r;
        break;
      }
    if (missing > 0.0) {
      // A well's centre just before the line took its place: leave that well between
      // centres (interpolated) and try again.
      const auto before = std::lower_bound(optional.begin(), optional.end(), missing);
      if (before == optional.begin())
        throw std::invalid_argument(
            "well-centred grid: the line at " + std::to_string(missing) +
            " is closer than a cell width to the well or to another line; move it or use a "
            "smaller well cell");
      optional.erase(std::prev(before));
      continue;
    }
    if (bounded) {
      const int i = side_column_centred_at(widths, side.end_distance);
      widths.resize(static_cast<std::size_t>(i) + 1);
      if (side.end == GridSideEnd::barrier) widths.back() *= 0.5;  // the edge on the line
    }
    // Split the columns centred on zone lines from the outermost in (indices stay valid).
    std::vector<double> faces = side.faces;
    std::sort(faces.rbegin(), faces.rend());
    for (double f : faces) {
      const auto i = static_cast<std::size_t>(side_column_centred_at(widths, f));
      widths[i] *= 0.5;
      widths.insert(widths.begin() + static_cast<std::ptrdiff_t>(i), widths[i]);
    }
    return widths;
  }
}

WellCentredGrid well_centred_grid(const WellCentredGridSpec& spec) {
  const auto side = [&](int s) { return well_centred_side_widths(spec, spec.sides[s]); };
  const std::vector<double> east = side(grid_east), north = side(grid_north);
  std::vector<double> west, south;
  if (!spec.mirror_west) west = side(grid_west);
  if (!spec.mirror_south) south = side(grid_south);

  // Columns west to east; rows north to south. A mirrored side leaves the half well cell
  // (inner / 2) at the symmetry edge.
  std::vector<double> dx, dy;
  WellCentredGrid out;
  if (spec.mirror_west) {
    dx = east;
  } else {
    dx.assign(west.rbegin(), west.rend() - 1);
    dx.push_back(spec.inner);
    dx.insert(dx.end(), east.begin() + 1, east.end());
  }
  out.well_col = spec.mirror_west ? 0 : static_cast<int>(west.size()) - 1;
  dy.assign(north.rbegin(), north.rend() - 1);
  if (spec.mirror_south) {
    dy.push_back(north.front());
  } else {
    dy.push_back(spec.inner);
    dy.insert(dy.end(), south.begin() + 1, south.end());
  }
  out.well_row = static_cast<int>(north.size()) - 1;
  double origin_x = 0.0, origin_y = 0.0;  // south-west corner, the well at (0, 0)
  for (double w : west) origin_x -= w;
  for (double w : south) origin_y -= w;
  out.x_factor.assign(dx.size(), 1.0);
  out.y_factor.assign(dy.size(), 1.0);
  if (spec.mirror_west) out.x_factor.front() = 0.5;
  if (spec.mirror_south) out.y_factor.back() = 0.5;
  out.rate_share = (spec.mirror_west ? 0.5 : 1.0) * (spec.mirror_south ? 0.5 : 1.0);
  const int n_cols = static_cast<int>(dx.size()), n_rows = static_cast<int>(dy.size());
  out.grid = RectilinearGrid(std::move(dx), std::move(dy), origin_x, origin_y);

  const auto fixed = [&](int s) {
    return (s == grid_west && spec.mirror_west) || (s == grid_south && spec.mirror_south)
               ? false
               : spec.sides[s].end == GridSideEnd::recharge;
  };
  for (int row = 0; row < n_rows; ++row)
    for (int col = 0; col < n_cols; ++col)
      if ((fixed(grid_east) && col == n_cols - 1) || (fixed(grid_west) && col == 0) ||
          (fixed(grid_north) && row == 0) || (fixed(grid_south) && row == n_rows - 1))
        out.fixed_cells.push_back(out.grid.cell(row, col));
  return out;
}

}  // namespace aquiledger
