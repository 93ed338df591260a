#include <catch2/catch.hpp>

#include "mesh/rectilinear_grid.hpp"

using namespace aquiledger;

TEST_CASE("variable spacing gives true edges, centres and areas", "[mesh]") {
  RectilinearGrid g({10.0, 20.0, 30.0}, {5.0, 15.0}, 100.0, 200.0);
  REQUIRE(g.n_rows() == 2);
  REQUIRE(g.n_cols() == 3);
  CHECK(g.x_edges()[3] == Approx(160.0));
  CHECK(g.y_max() == Approx(220.0));
  CHECK(g.y_min() == Approx(200.0));
  CHECK(g.x_center(1) == Approx(120.0));
  CHECK(g.y_center(0) == Approx(217.5));  // northern row
  CHECK(g.area(g.cell(1, 2)) == Approx(450.0));
}

TEST_CASE("locate follows the raster convention", "[mesh]") {
  RectilinearGrid g({10.0, 10.0}, {10.0, 10.0}, 0.0, 0.0);
  CHECK(g.locate(5.0, 15.0) == g.cell(0, 0));   // north-west
  CHECK(g.locate(15.0, 5.0) == g.cell(1, 1));   // south-east
  CHECK(g.locate(10.0, 10.0) == g.cell(1, 1));  // interior corner goes east and south
  CHECK(g.locate(0.0, 20.0) == g.cell(0, 0));   // outer corner is inside
  CHECK(g.locate(20.0, 0.0) == g.cell(1, 1));
  CHECK_FALSE(g.locate(-0.1, 5.0).has_value());
  CHECK_FALSE(g.locate(5.0, 20.1).has_value());
}

TEST_CASE("active mask counts and neighbours", "[mesh]") {
  RectilinearGrid g({1.0, 1.0, 1.0}, {1.0, 1.0}, 0.0, 0.0, {1, 0, 1, 1, 1, 1});
  CHECK(g.n_active() == 5);
  CHECK_FALSE(g.is_active(g.cell(0, 1)));
  CHECK(g.east_of(g.cell(0, 2)) == std::nullopt);
  CHECK(g.south_of(g.cell(0, 2)) == g.cell(1, 2));
  CHECK(g.south_of(g.cell(1, 0)) == std::nullopt);
}
