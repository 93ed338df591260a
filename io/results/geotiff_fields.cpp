#include "io/results/geotiff_fields.hpp"

#include <cpl_error.h>
#include <gdal.h>
#include <ogr_srs_api.h>
#include <unistd.h>

#include <cmath>
#include <mutex>
#include <vector>

namespace aquiledger {

void write_geotiff(const std::filesystem::path& path, const Model& model,
                   std::span<const double> values, const std::string& description) {
  static std::once_flag once;
  std::call_once(once, [] { GDALAllRegister(); });
  const RectilinearGrid& g = model.grid;
  const int nx = g.n_cols(), ny = g.n_rows();
  if (values.size() != static_cast<std::size_t>(nx) * ny)
    throw OutputError("cannot write '" + path.string() + "': " + std::to_string(values.size()) +
                      " values for " + std::to_string(nx * ny) + " cells");
  GDALDriverH driver = GDALGetDriverByName("GTiff");
  const std::filesystem::path temporary =
      path.parent_path() / (".tmp-" + std::to_string(::getpid()) + "-" + path.filename().string());
  auto fail = [&](const std::string& what) {
    std::error_code ignored;
    std::filesystem::remove(temporary, ignored);
    return OutputError("cannot write '" + path.string() + "': " + what);
  };
  CPLErrorReset();
  GDALDatasetH ds =
      driver ? GDALCreate(driver, temporary.c_str(), nx, ny, 1, GDT_Float64, nullptr) : nullptr;
  if (!ds) throw fail(driver ? CPLGetLastErrorMsg() : "GDAL has no GeoTIFF driver");
  // North-up: the origin is the north-west corner, pixels of dx by -dy.
  const double dx = g.x_edges()[1] - g.x_edges()[0];
  const double dy = g.y_edges()[0] - g.y_edges()[1];  // row edges run north to south
  double transform[6] = {g.x_min(), dx, 0.0, g.y_max(), 0.0, -dy};
  bool ok = GDALSetGeoTransform(ds, transform) == CE_None;
  if (model.epsg) {
    OGRSpatialReferenceH srs = OSRNewSpatialReference(nullptr);
    ok = ok && OSRImportFromEPSG(srs, *model.epsg) == OGRERR_NONE &&
         GDALSetSpatialRef(ds, srs) == CE_None;
    OSRDestroySpatialReference(srs);
  }
  std::vector<double> pixels(values.begin(), values.end());
  for (double& v : pixels)
    if (!std::isfinite(v)) v = geotiff_no_value;
  GDALRasterBandH band = GDALGetRasterBand(ds, 1);
  ok = ok && GDALSetRasterNoDataValue(band, geotiff_no_value) == CE_None;
  GDALSetDescription(band, description.c_str());
  ok = ok && GDALRasterIO(band, GF_Write, 0, 0, nx, ny, pixels.data(), nx, ny, GDT_Float64, 0, 0) ==
                 CE_None;
  const std::string message = CPLGetLastErrorMsg();
  GDALClose(ds);  // flushes the file
  if (!ok || CPLGetLastErrorType() >= CE_Failure)
    throw fail(message.empty() ? CPLGetLastErrorMsg() : message);
  std::error_code error;
  std::filesystem::rename(temporary, path, error);
  if (error) throw fail(error.message());
}

}  // namespace aquiledger
