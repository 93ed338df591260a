// A raster carried onto a rectilinear grid (mesh/raster_resampling.hpp). Cell averages keep
// the area integral of the property exactly (the defining property of a conservative
// remap: each pixel's value times its overlap area is counted once, in the cell that holds
// the overlap); the centre rule takes the pixel holding each cell's centre.
#include <catch2/catch.hpp>
#include <cmath>
#include <numeric>
#include <vector>

#include "mesh/raster_resampling.hpp"

using namespace aquiledger;

namespace {
/// Edges from a start and widths (increasing), or from a start and heights (decreasing).
std::vector<double> edges(double start, const std::vector<double>& widths, double sign) {
  std::vector<double> e{start};
  for (double w : widths) e.push_back(e.back() + sign * w);
  return e;
}
}  // namespace

TEST_CASE("raster: cell averages keep the area integral on a refined, uneven grid", "[raster]") {
  // 7 x 5 pixels of 30 x 20 m from (1000, 2100) north-west; values not representable in few
  // digits so that any lost or double-counted overlap shows.
  RasterGeometry r{7, 5, 1000.0, 2100.0, 30.0, 20.0};
  std::vector<double> pixels(35);
  for (std::size_t k = 0; k < pixels.size(); ++k) pixels[k] = 1.0 / (3.0 + k) + std::sqrt(k);
  // An uneven grid over exactly the same 210 x 100 m: column edges cutting pixels anywhere.
  const std::vector<double> dx = {7.0, 23.0, 41.5, 3.25, 60.0, 75.25};  // 210
  const std::vector<double> dy = {13.0, 2.0, 35.0, 49.5, 0.5};          // 100, north first
  const auto x = edges(1000.0, dx, 1.0), y = edges(2100.0, dy, -1.0);
  const Resampled on_grid = cell_averages(r, pixels, x, y);
  double grid_integral = 0.0, raster_integral = 0.0;
  for (std::size_t row = 0; row < dy.size(); ++row)
    for (std::size_t col = 0; col < dx.size(); ++col) {
      const std::size_t c = row * dx.size() + col;
      CHECK(on_grid.covered[c] == Approx(1.0).epsilon(1e-14));
      grid_integral += on_grid.values[c] * dx[col] * dy[row];
    }
  for (double v : pixels) raster_integral += v * 30.0 * 20.0;
  CHECK(grid_integral == Approx(raster_integral).epsilon(1e-13));
  // Column 3 (x 1071.5..1074.75) lies in pixel column 2 (1060..1090). Row 1 (y 2087..2085)
  // lies in pixel row 0 (2100..2080): that pixel's value. Row 2 (y 2085..2050) overlaps pixel
  // rows 0, 1 and 2 by 5, 20 and 10 m: their mean with those weights (by hand).
  CHECK(on_grid.values[1 * 6 + 3] == Approx(pixels[0 * 7 + 2]).epsilon(1e-15));
  CHECK(
      on_grid.values[2 * 6 + 3] ==
      Approx((pixels[0 * 7 + 2] * 5.0 + pixels[1 * 7 + 2] * 20.0 + pixels[2 * 7 + 2] * 10.0) / 35.0)
          .epsilon(1e-14));
}

TEST_CASE("raster: no-data pixels are left out and the weights renormalised", "[raster]") {
  RasterGeometry r{2, 1, 0.0, 10.0, 10.0, 10.0};
  const std::vector<double> pixels = {4.0, std::nan("")};
  // One cell over both pixels, one half over the first, one outside the raster.
  const std::vector<double> x = {0.0, 20.0, 25.0}, y = {10.0, 0.0};
  const std::vector<double> x2 = {-5.0, 5.0, 30.0};
  const Resampled a = cell_averages(r, pixels, x, y);
  CHECK(a.values[0] == 4.0);
  CHECK(a.covered[0] == 0.5);
  CHECK(std::isnan(a.values[1]));  // only the no-data pixel and nothing
  CHECK(a.covered[1] == 0.0);
  const Resampled b = cell_averages(r, pixels, x2, y);
  CHECK(b.values[0] == 4.0);
  CHECK(b.covered[0] == 0.5);  // half of it outside the raster
}

TEST_CASE("raster: the centre rule takes the pixel holding each cell's centre", "[raster]") {
  RasterGeometry r{3, 2, 0.0, 20.0, 10.0, 10.0};
  const std::vector<double> zones = {1, 2, 3, 4, 5, 6};
  const std::vector<double> x = {0.0, 4.0, 16.0, 29.0, 40.0}, y = {20.0, 12.0, 0.0};
  const Resampled z = cell_centre_pixels(r, zones, x, y);
  // Centres x 2, 10, 22.5, 34.5 (the last outside); y 16, 6.
  const std::vector<double> expected = {1, 2, 3, NAN, 4, 5, 6, NAN};
  for (std::size_t c = 0; c < 8; ++c) {
    INFO("cell " << c);
    if (std::isnan(expected[c]))
      CHECK(std::isnan(z.values[c]));
    else
      CHECK(z.values[c] == expected[c]);
  }
}
