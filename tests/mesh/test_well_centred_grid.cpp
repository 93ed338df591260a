// The well-centred grid (mesh/well_centred_grid.hpp): the quarter grid when both axes are
// lines of symmetry, and each kind of side put exactly on its line.
#include <catch2/catch.hpp>
#include <cmath>
#include <numeric>

#include "mesh/quarter_radial_grid.hpp"
#include "mesh/well_centred_grid.hpp"

using namespace aquiledger;

namespace {

WellCentredGridSpec well_centred_spec() {
  WellCentredGridSpec spec;
  spec.inner = 2.0;
  spec.growth = 1.2;
  spec.extent = 500.0;
  return spec;
}

bool has_x_centre(const RectilinearGrid& g, double x) {
  for (int c = 0; c < g.n_cols(); ++c)
    if (std::abs(g.x_center(c) - x) < 1e-9 * std::abs(x)) return true;
  return false;
}

}  // namespace

TEST_CASE("with both axes mirrored the well-centred grid is the quarter grid", "[mesh]") {
  WellCentredGridSpec spec = well_centred_spec();
  spec.mirror_west = spec.mirror_south = true;
  spec.sides[grid_east].anchors = {25.0, 80.0};
  spec.sides[grid_north].anchors = {25.0, 80.0};
  const WellCentredGrid w = well_centred_grid(spec);
  QuarterRadialGridSpec q;
  q.inner = 2.0;
  q.growth = 1.2;
  q.extent = 500.0;
  q.anchors = {25.0, 80.0};
  const RectilinearGrid g = quarter_radial_grid(q);
  REQUIRE(w.grid.n_cols() == g.n_cols());
  REQUIRE(w.grid.n_rows() == g.n_rows());
  for (int c = 0; c < g.n_cols(); ++c) CHECK(w.grid.dx(c) == g.dx(c));
  for (int r = 0; r < g.n_rows(); ++r) CHECK(w.grid.dy(r) == g.dy(r));
  CHECK(w.rate_share == 0.25);
  CHECK(w.well_row == g.n_rows() - 1);
  CHECK(w.well_col == 0);
  CHECK(w.x_factor.front() == quarter_radial_x_factor(g, 0));
  CHECK(w.y_factor.back() == quarter_radial_y_factor(g, g.n_rows() - 1));
  CHECK(w.x_factor[1] == 1.0);
  CHECK(w.fixed_cells.empty());
}

TEST_CASE("a barrier side ends on its line, a recharge side centres its last column on it",
          "[mesh]") {
  WellCentredGridSpec spec = well_centred_spec();
  spec.mirror_south = true;
  spec.sides[grid_east] = {GridSideEnd::barrier, 150.0, {}, {25.0, 140.0}};
  spec.sides[grid_west] = {GridSideEnd::recharge, 90.0, {}, {60.0}};
  spec.sides[grid_north].anchors = {30.0};
  const WellCentredGrid w = well_centred_grid(spec);
  // The well's cell is whole along x (2 m centred on x = 0) and half along y.
  CHECK(w.grid.dx(w.well_col) == 2.0);
  CHECK(w.grid.x_center(w.well_col) == Approx(0.0).margin(1e-12));
  CHECK(w.y_factor.back() == 0.5);
  CHECK(w.x_factor[static_cast<std::size_t>(w.well_col)] == 1.0);
  CHECK(w.rate_share == 0.5);
  CHECK(w.grid.x_max() == Approx(150.0).epsilon(1e-12));  // the edge on the barrier
  // The westmost column is centred on the recharge line, and is the fixed one.
  CHECK(w.grid.x_center(0) == Approx(-90.0).epsilon(1e-12));
  CHECK(static_cast<int>(w.fixed_cells.size()) == w.grid.n_rows());
  for (CellIndex c : w.fixed_cells) CHECK(w.grid.row_col(c).col == 0);
  CHECK(has_x_centre(w.grid, 25.0));
  CHECK(has_x_centre(w.grid, -60.0));
  // 140 m lies within a cell of the barrier's column: it yields (interpolated), the barrier
  // does not.
  CHECK_FALSE(has_x_centre(w.grid, 140.0));
  // Widths sum to the extents.
  const auto cols = w.grid.column_widths();
  CHECK(std::accumulate(cols.begin(), cols.end(), 0.0) ==
        Approx(150.0 + 90.0 + 0.5 * w.grid.dx(0)));
}

TEST_CASE("a zone line is a cell face; bad lines are refused", "[mesh]") {
  WellCentredGridSpec spec = well_centred_spec();
  spec.mirror_west = true;
  spec.sides[grid_north].faces = {100.0};
  spec.sides[grid_north].anchors = {40.0, 160.0};
  const WellCentredGrid w = well_centred_grid(spec);
  bool face = false;
  for (double y : w.grid.y_edges()) face |= std::abs(y - 100.0) < 1e-9 * 100.0;
  CHECK(face);
  CHECK(w.grid.y_max() >= 500.0);
  CHECK(w.grid.y_min() <= -500.0);
  // A line inside the well's cell, a zone line beyond the barrier.
  spec.sides[grid_north].faces = {0.5};
  CHECK_THROWS_AS(well_centred_grid(spec), std::invalid_argument);
  spec.sides[grid_north] = {GridSideEnd::barrier, 100.0, {120.0}, {}};
  CHECK_THROWS_AS(well_centred_grid(spec), std::invalid_argument);
  // Two lines within a cell width of each other.
  spec.sides[grid_north] = {GridSideEnd::barrier, 100.0, {99.0}, {}};
  CHECK_THROWS_AS(well_centred_grid(spec), std::invalid_argument);
}
