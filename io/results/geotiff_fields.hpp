#pragma once
// Fields as GeoTIFF for a GIS ([output].geotiff): one single-band Float64 file per quantity
// and output time (head_NNNN.tif, drawdown_NNNN.tif, compaction_NNNN.tif, the NNNN of
// fields_NNNN.vtr), north-up, with the model's coordinate system ([grid].epsg) when it gives
// one. Only grids of equal column widths and equal row heights (the reader checks).
#include <filesystem>
#include <span>
#include <string>

#include "io/files/output_error.hpp"
#include "solver/model.hpp"

namespace aquiledger {

/// Pixels where a cell has no value (inactive, NaN).
inline constexpr double geotiff_no_value = -9999.0;

/// Writes values (one per grid cell, raster order, row 0 north) as a GeoTIFF at path,
/// atomically (a temporary file in the same folder, then renamed); `description` names the
/// band. Throws OutputError naming the path on failure.
void write_geotiff(const std::filesystem::path& path, const Model& model,
                   std::span<const double> values, const std::string& description);

}  // namespace aquiledger
