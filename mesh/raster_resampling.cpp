#include "mesh/raster_resampling.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

namespace aquiledger {

namespace {

/// Pixel indices [first, end) whose span along one axis overlaps (lo, hi), where pixel k spans
/// origin + k size .. origin + (k + 1) size.
std::pair<int, int> pixel_range(double lo, double hi, double origin, double size, int count) {
  const int first = std::max(0, static_cast<int>(std::floor((lo - origin) / size)));
  const int end = std::min(count, static_cast<int>(std::ceil((hi - origin) / size)));
  return {first, std::max(first, end)};
}

double overlap(double a0, double a1, double b0, double b1) {
  return std::max(0.0, std::min(a1, b1) - std::max(a0, b0));
}

}  // namespace

Resampled cell_averages(const RasterGeometry& r, std::span<const double> pixels,
                        std::span<const double> x_edges, std::span<const double> y_edges) {
  const std::size_t n_cols = x_edges.size() - 1, n_rows = y_edges.size() - 1;
  Resampled out;
  out.values.assign(n_cols * n_rows, std::numeric_limits<double>::quiet_NaN());
  out.covered.assign(n_cols * n_rows, 0.0);
  for (std::size_t row = 0; row < n_rows; ++row) {
    const double y_top = y_edges[row], y_bottom = y_edges[row + 1];
    // Rows counted from the north: pixel row j spans depth j h .. (j + 1) h below y_north.
    const auto [j0, j1] =
        pixel_range(r.y_north - y_top, r.y_north - y_bottom, 0.0, r.pixel_height, r.n_rows);
    for (std::size_t col = 0; col < n_cols; ++col) {
      const double x0 = x_edges[col], x1 = x_edges[col + 1];
      const auto [i0, i1] = pixel_range(x0, x1, r.x_west, r.pixel_width, r.n_cols);
      double sum = 0.0, area = 0.0;
      for (int j = j0; j < j1; ++j) {
        const double py1 = r.y_north - j * r.pixel_height, py0 = py1 - r.pixel_height;
        const double h = overlap(y_bottom, y_top, py0, py1);
        if (h <= 0.0) continue;
        for (int i = i0; i < i1; ++i) {
          const double v = pixels[static_cast<std::size_t>(j) * r.n_cols + i];
          if (std::isnan(v)) continue;
          const double px0 = r.x_west + i * r.pixel_width;
          const double a = h * overlap(x0, x1, px0, px0 + r.pixel_width);
          sum += v * a;
          area += a;
        }
      }
      const std::size_t c = row * n_cols + col;
      if (area > 0.0) out.values[c] = sum / area;
      out.covered[c] = area / ((x1 - x0) * (y_top - y_bottom));
    }
  }
  return out;
}

Resampled cell_centre_pixels(const RasterGeometry& r, std::span<const double> pixels,
                             std::span<const double> x_edges, std::span<const double> y_edges) {
  const std::size_t n_cols = x_edges.size() - 1, n_rows = y_edges.size() - 1;
  Resampled out;
  out.values.assign(n_cols * n_rows, std::numeric_limits<double>::quiet_NaN());
  out.covered.assign(n_cols * n_rows, 0.0);
  for (std::size_t row = 0; row < n_rows; ++row) {
    const double y = 0.5 * (y_edges[row] + y_edges[row + 1]);
    const double j = std::floor((r.y_north - y) / r.pixel_height);
    for (std::size_t col = 0; col < n_cols; ++col) {
      const double x = 0.5 * (x_edges[col] + x_edges[col + 1]);
      const double i = std::floor((x - r.x_west) / r.pixel_width);
      if (i < 0 || j < 0 || i >= r.n_cols || j >= r.n_rows) continue;
      const double v = pixels[static_cast<std::size_t>(j) * r.n_cols + static_cast<std::size_t>(i)];
      if (std::isnan(v)) continue;
      out.values[row * n_cols + col] = v;
      out.covered[row * n_cols + col] = 1.0;
    }
  }
  return out;
}

}  // namespace aquiledger
