#pragma once
// A north-up raster (equal pixels, rows from the north) carried onto a rectilinear grid of
// any spacing: cell averages weighted by exact overlap areas (properties), or the pixel at
// each cell's centre (zones, masks). Pure geometry, no files: io/ reads rasters with GDAL.
#include <span>
#include <vector>

namespace aquiledger {

/// Pixel (column i from the west, row j from the north) covers x in
/// [x_west + i pixel_width, x_west + (i + 1) pixel_width] and y in
/// [y_north - (j + 1) pixel_height, y_north - j pixel_height].
struct RasterGeometry {
  int n_cols = 0;
  int n_rows = 0;
  double x_west = 0.0;
  double y_north = 0.0;
  double pixel_width = 1.0;   ///< > 0
  double pixel_height = 1.0;  ///< > 0
};

/// Cells of a grid given by its column edges (west to east, increasing) and row edges (north
/// to south, decreasing), values in raster order (row 0 north).
struct Resampled {
  std::vector<double> values;  ///< NaN where no pixel with a value overlaps the cell
  /// Share of each cell's area covered by pixels with a value (0 .. 1).
  std::vector<double> covered;
};

/// The mean of the pixels overlapping each cell, each weighted by its overlap area; NaN
/// pixels (no data) are left out and the weights renormalised over the rest. Exact in this
/// sense: sum(value x covered area) over the cells equals sum(pixel x overlap area) over the
/// pixels, so the area integral of a property is kept.
Resampled cell_averages(const RasterGeometry& raster, std::span<const double> pixels,
                        std::span<const double> x_edges, std::span<const double> y_edges);

/// The pixel containing each cell's centre (NaN outside the raster or where it has no data;
/// covered is 1 or 0).
Resampled cell_centre_pixels(const RasterGeometry& raster, std::span<const double> pixels,
                             std::span<const double> x_edges, std::span<const double> y_edges);

}  // namespace aquiledger
