#include <catch2/catch.hpp>
#include <cmath>

#include "postproc/observation_sampler.hpp"

using namespace aquiledger;

namespace {

Observation at(double x, double y) {
  Observation o;
  o.name = std::string(1, 'p');  // (assigning a literal trips a GCC 12 -Wrestrict false positive)
  o.x = x;
  o.y = y;
  return o;
}

/// A linear head field a + b x + c y sampled at the cell centres, NaN where inactive.
std::vector<double> linear_heads(const RectilinearGrid& g, double a, double b, double c) {
  std::vector<double> h(static_cast<std::size_t>(g.n_cells()));
  for (int i = 0; i < g.n_rows(); ++i)
    for (int j = 0; j < g.n_cols(); ++j) {
      const CellIndex k = g.cell(i, j);
      h[k.value] = g.is_active(k) ? a + b * g.x_center(j) + c * g.y_center(i) : NAN;
    }
  return h;
}

double linear(double x, double y) { return 30.0 + 0.02 * x - 0.05 * y; }

}  // namespace

// Bilinear interpolation on a rectangle reproduces every function a + b x + c y (and x y)
// exactly: it is the tensor product of two linear interpolants (e.g. Press et al., 2007,
// Numerical Recipes, 3rd ed., section 3.6). Tolerance: a few ulps of heads near 30.
TEST_CASE("bilinear sampling reproduces a linear head field on an uneven grid",
          "[postproc][observation]") {
  // Columns 10, 30, 20, 50 wide; rows 40, 10, 25 high (north first); origin (1000, 2000).
  RectilinearGrid g({10.0, 30.0, 20.0, 50.0}, {40.0, 10.0, 25.0}, 1000.0, 2000.0);
  const auto h = linear_heads(g, 30.0, 0.02, -0.05);
  const std::vector<Observation> obs = {at(1012.0, 2030.0), at(1041.5, 2050.0), at(1055.0, 2027.0),
                                        at(1080.0, 2046.0), at(1005.0, 2055.0)};
  const auto s = ObservationSampler(g, obs).sample(h);
  REQUIRE(s.size() == obs.size());
  for (std::size_t k = 0; k < obs.size(); ++k) {
    INFO("point " << k);
    CHECK(s[k] == Approx(linear(obs[k].x, obs[k].y)).epsilon(1e-14));
  }
}

// Beyond the outermost centres in x (the western half of column 0, x < 1005), the contract
// interpolates along y only; the head is then linear in y at the column's centre x.
TEST_CASE("edge half-cells interpolate along the other direction only", "[postproc][observation]") {
  RectilinearGrid g({10.0, 30.0, 20.0}, {40.0, 10.0, 25.0}, 1000.0, 2000.0);
  const auto h = linear_heads(g, 30.0, 0.02, -0.05);
  // West edge half-cell: x = 1002 < centre 1005, y between row centres 2055 and 2030.
  // East edge half-cell: x = 1058 > centre 1050.
  // South edge half-cell: y = 2005 < the southern centre 2012.5, x between 1005 and 1025.
  const std::vector<Observation> obs = {at(1002.0, 2040.0), at(1058.0, 2020.0), at(1015.0, 2005.0)};
  const auto s = ObservationSampler(g, obs).sample(h);
  CHECK(s[0] == Approx(linear(1005.0, 2040.0)).epsilon(1e-14));
  CHECK(s[1] == Approx(linear(1050.0, 2020.0)).epsilon(1e-14));
  CHECK(s[2] == Approx(linear(1015.0, 2012.5)).epsilon(1e-14));

  // A single row: every point lies beyond the row centres, so only x is interpolated.
  RectilinearGrid row({10.0, 30.0}, {8.0}, 0.0, 0.0);
  const auto hr = linear_heads(row, 30.0, 0.02, -0.05);
  const auto sr = ObservationSampler(row, {at(12.0, 1.0)}).sample(hr);
  CHECK(sr[0] == Approx(linear(12.0, 4.0)).epsilon(1e-14));
}

// Contract rule: beyond the outermost centres in both directions (a corner quarter-cell),
// or when any surrounding centre is inactive, the head of the containing cell.
TEST_CASE("corner quarter-cells and inactive neighbours take the containing cell's head",
          "[postproc][observation]") {
  // 3 x 3, 10 m cells, origin (0, 0); the centre cell (row 1, col 1) inactive.
  RectilinearGrid g({10.0, 10.0, 10.0}, {10.0, 10.0, 10.0}, 0.0, 0.0, {1, 1, 1, 1, 0, 1, 1, 1, 1});
  std::vector<double> h(9);
  for (int c = 0; c < 9; ++c) h[c] = 10.0 + c;
  h[4] = NAN;
  const std::vector<Observation> obs = {
      at(2.0, 28.0),   // north-west corner quarter-cell -> cell (0, 0)
      at(12.0, 22.0),  // between (0,0),(0,1),(1,0),(1,1); (1,1) inactive -> cell (0, 1)
      at(9.0, 18.0),   // same square, containing cell (1, 0)
      at(20.0, 27.0),  // north edge half-cell, between (0,1) and (0,2): both active
      at(12.0, 12.0),  // inside the inactive cell -> its head, NaN
      at(-1.0, 5.0)};  // outside the grid -> NaN
  const auto s = ObservationSampler(g, obs).sample(h);
  CHECK(s[0] == 10.0);
  CHECK(s[1] == 11.0);
  CHECK(s[2] == 13.0);
  // x = 20 lies 1/2 of the way from centre 15 to 25: 11 + 0.5 (12 - 11), hand arithmetic.
  CHECK(s[3] == Approx(11.5).epsilon(1e-15));
  CHECK(std::isnan(s[4]));
  CHECK(std::isnan(s[5]));
}
