// Channel length per cell against hand geometry (Pythagoras on each piece of a straight
// segment between the cell edges it crosses).
#include <catch2/catch.hpp>
#include <cmath>

#include "mesh/polyline_crossing.hpp"

using namespace aquiledger;

namespace {
PolylineCrossing cross(const RectilinearGrid& g, std::vector<std::array<double, 2>> pts) {
  return cross_polyline(g, pts);
}
}  // namespace

TEST_CASE("a diagonal across a square cell has length sqrt(2) dx", "[polyline]") {
  const RectilinearGrid g({10.0}, {10.0}, 0.0, 0.0);
  const auto c = cross(g, {{0.0, 0.0}, {10.0, 10.0}});
  REQUIRE(c.active.size() == 1);
  CHECK(c.active[0].length == Approx(std::sqrt(2.0) * 10.0).epsilon(1e-14));
}

TEST_CASE("a diagonal through a grid corner touches only the two diagonal cells", "[polyline]") {
  // 2 x 2 cells of 10 m; from the south-west to the north-east corner through (10, 10).
  const RectilinearGrid g({10.0, 10.0}, {10.0, 10.0}, 0.0, 0.0);
  const auto c = cross(g, {{0.0, 0.0}, {20.0, 20.0}});
  REQUIRE(c.active.size() == 2);
  CHECK(g.row_col(c.active[0].cell) == RowCol{1, 0});  // south-west cell first
  CHECK(g.row_col(c.active[1].cell) == RowCol{0, 1});
  CHECK(c.active[0].length == Approx(std::sqrt(200.0)).epsilon(1e-14));
  CHECK(c.active[1].length == Approx(std::sqrt(200.0)).epsilon(1e-14));
}

TEST_CASE("a slope of one half splits at the column edge", "[polyline]") {
  // One row of two 10 m cells, (0, 0) -> (20, 10): crosses x = 10 at y = 5; each piece is
  // sqrt(10^2 + 5^2).
  const RectilinearGrid g({10.0, 10.0}, {10.0}, 0.0, 0.0);
  const auto c = cross(g, {{0.0, 0.0}, {20.0, 10.0}});
  REQUIRE(c.active.size() == 2);
  CHECK(c.active[0].length == Approx(std::sqrt(125.0)).epsilon(1e-14));
  CHECK(c.active[1].length == Approx(std::sqrt(125.0)).epsilon(1e-14));
}

TEST_CASE("a straight line across variable columns takes each width", "[polyline]") {
  const RectilinearGrid g({1.0, 2.0, 3.0}, {4.0}, 0.0, 0.0);
  const auto c = cross(g, {{0.0, 2.0}, {6.0, 2.0}});
  REQUIRE(c.active.size() == 3);
  CHECK(c.active[0].length == Approx(1.0));
  CHECK(c.active[1].length == Approx(2.0));
  CHECK(c.active[2].length == Approx(3.0));
}

TEST_CASE("a bent polyline adds the length of both legs per cell", "[polyline]") {
  // 1 x 1 cell of 10 m: (1, 1) -> (9, 1) -> (9, 7): legs of 8 and 6 m.
  const RectilinearGrid g({10.0}, {10.0}, 0.0, 0.0);
  const auto c = cross(g, {{1.0, 1.0}, {9.0, 1.0}, {9.0, 7.0}});
  REQUIRE(c.active.size() == 1);
  CHECK(c.active[0].length == Approx(14.0));
  CHECK(c.total_length == Approx(14.0));
}

TEST_CASE("length outside the grid and in inactive cells is kept apart", "[polyline]") {
  const RectilinearGrid g({10.0, 10.0}, {10.0}, 0.0, 0.0, {1, 0});
  const auto c = cross(g, {{-5.0, 5.0}, {20.0, 5.0}});
  REQUIRE(c.active.size() == 1);
  CHECK(c.active[0].length == Approx(10.0));
  CHECK(c.outside_length == Approx(5.0));
  CHECK(c.inactive_length == Approx(10.0));
  CHECK(c.total_length == Approx(25.0));
}

TEST_CASE("a line along an interior edge belongs to the cell south of it", "[polyline]") {
  // Convention of RectilinearGrid::locate: a point on an interior edge belongs to the cell
  // east or south of it.
  const RectilinearGrid g({10.0}, {10.0, 10.0}, 0.0, 0.0);
  const auto c = cross(g, {{0.0, 10.0}, {10.0, 10.0}});
  REQUIRE(c.active.size() == 1);
  CHECK(g.row_col(c.active[0].cell) == RowCol{1, 0});
  CHECK(c.active[0].length == Approx(10.0));
}
