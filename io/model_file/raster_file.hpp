#pragma once
// Georeferenced rasters read through GDAL (GeoTIFF, ESRI ASCII and every other format GDAL
// reads) and carried onto the model grid (mesh/raster_resampling.hpp) (io-internal header).
#include <filesystem>
#include <optional>
#include <string>

#include "io/model_file/field_value.hpp"

namespace aquiledger {

/// How a raster becomes cell values: the area-weighted mean of the pixels in each cell
/// (properties), or the pixel at the cell's centre (zones, masks).
enum class RasterMethod { average, nearest };

/// Band `band` (1-based) of the raster at `file` on the grid of ctx.shape (NaN where it has no
/// value); with ctx.band, the band's rows only. The raster must be north-up (no rotation). Its
/// coordinate system is checked against [grid].epsg when the model gives one. Errors name
/// `at` and `key`; nullopt after an error.
std::optional<CellField> read_raster_field(ReaderContext& ctx, const std::filesystem::path& file,
                                           int band, RasterMethod method, const SourceSpot& at,
                                           const std::string& key);

/// `{ raster = "k.tif", band = 1, method = "average" | "nearest" }` (the field-value form).
std::optional<CellField> read_raster_table(ReaderContext& ctx, const toml::table& t,
                                           const std::string& key, RasterMethod fallback);

/// True when GDAL knows the EPSG code as a coordinate system.
bool known_epsg(int code);

/// True for file names GDAL rasters usually have (.tif, .tiff, .img, .vrt): a zones file so
/// named is read through GDAL.
bool looks_like_gdal_raster(const std::filesystem::path& file);

}  // namespace aquiledger
