#include "io/model_file/raster_file.hpp"

#include <cpl_error.h>
#include <gdal.h>
#include <ogr_srs_api.h>

#include <algorithm>
#include <cmath>
#include <mutex>

#include "io/model_file/toml_access.hpp"
#include "mesh/raster_resampling.hpp"

namespace aquiledger {

namespace {

void register_gdal() {
  static std::once_flag once;
  std::call_once(once, [] {
    GDALAllRegister();
    // Messages go through our diagnostics (CPLGetLastErrorMsg), not to stderr.
    CPLSetErrorHandler(CPLQuietErrorHandler);
  });
}

/// A raster's name for its coordinate system: "EPSG:32633" when it has an authority code,
/// else its name.
std::string crs_name(OGRSpatialReferenceH srs) {
  const char* code = OSRGetAuthorityCode(srs, nullptr);
  const char* authority = OSRGetAuthorityName(srs, nullptr);
  if (code && authority) return std::string(authority) + ":" + code;
  const char* name = OSRGetName(srs);
  return name ? name : "unnamed";
}

/// At most this many pixels are read: beyond the memory any model needs from one raster.
constexpr double max_pixels = 4.0e8;

}  // namespace

bool known_epsg(int code) {
  register_gdal();
  OGRSpatialReferenceH srs = OSRNewSpatialReference(nullptr);
  const bool ok = OSRImportFromEPSG(srs, code) == OGRERR_NONE;
  OSRDestroySpatialReference(srs);
  return ok;
}

bool looks_like_gdal_raster(const std::filesystem::path& file) {
  std::string ext = file.extension().string();
  std::transform(ext.begin(), ext.end(), ext.begin(),
                 [](unsigned char c) { return std::tolower(c); });
  return ext == ".tif" || ext == ".tiff" || ext == ".img" || ext == ".vrt";
}

std::optional<CellField> read_raster_field(ReaderContext& ctx, const std::filesystem::path& file,
                                           int band, RasterMethod method, const SourceSpot& at,
                                           const std::string& key) {
  if (!ctx.shape) return std::nullopt;
  register_gdal();
  ctx.other_inputs.push_back(file);
  std::string name = "'";  // (built in steps: GCC 12 warns falsely on "'" + string&&)
  name += file.string();
  name += '\'';
  GDALDatasetH ds = GDALOpen(file.c_str(), GA_ReadOnly);
  if (!ds) {
    ctx.error(at, key,
              "cannot open raster " + name + ": " + CPLGetLastErrorMsg() +
                  " (relative paths start in the model file's folder)");
    return std::nullopt;
  }
  struct Closer {
    GDALDatasetH ds;
    ~Closer() { GDALClose(ds); }
  } closer{ds};
  if (band < 1 || band > GDALGetRasterCount(ds)) {
    ctx.error(at, key,
              "raster " + name + " has " + std::to_string(GDALGetRasterCount(ds)) +
                  " band(s); band " + std::to_string(band) + " asked for");
    return std::nullopt;
  }
  double gt[6];
  if (GDALGetGeoTransform(ds, gt) != CE_None) {
    ctx.error(at, key, "raster " + name + " is not georeferenced (no geotransform)");
    return std::nullopt;
  }
  if (gt[2] != 0.0 || gt[4] != 0.0 || !(gt[1] > 0.0) || gt[5] == 0.0) {
    ctx.error(at, key,
              "raster " + name +
                  " is rotated or sheared; give a north-up raster (warp it first, e.g. with "
                  "gdalwarp)");
    return std::nullopt;
  }
  RasterGeometry g;
  g.n_cols = GDALGetRasterXSize(ds);
  g.n_rows = GDALGetRasterYSize(ds);
  g.pixel_width = gt[1];
  g.pixel_height = std::abs(gt[5]);
  g.x_west = gt[0];
  // A south-up raster (positive pixel height) is read and then flipped row for row.
  const bool south_up = gt[5] > 0.0;
  g.y_north = south_up ? gt[3] + g.n_rows * gt[5] : gt[3];
  if (static_cast<double>(g.n_cols) * g.n_rows > max_pixels) {
    ctx.error(at, key,
              "raster " + name + " has " + std::to_string(g.n_cols) + " x " +
                  std::to_string(g.n_rows) + " pixels; at most " + show_number(max_pixels) +
                  " are read (cut it to the model area first, e.g. with gdal_translate -projwin)");
    return std::nullopt;
  }
  if (ctx.epsg) {
    OGRSpatialReferenceH model_srs = OSRNewSpatialReference(nullptr);
    OSRImportFromEPSG(model_srs, *ctx.epsg);
    OGRSpatialReferenceH srs = GDALGetSpatialRef(ds);
    const bool same = srs && OSRIsSame(srs, model_srs);
    OSRDestroySpatialReference(model_srs);
    if (!srs) {
      ctx.warning(at, key,
                  "raster " + name +
                      " names no coordinate system; it is taken to be the model's "
                      "EPSG:" +
                      std::to_string(*ctx.epsg));
    } else if (!same) {
      ctx.error(at, key,
                "raster " + name + " is in " + crs_name(srs) +
                    ", the model in EPSG:" + std::to_string(*ctx.epsg) +
                    "; reproject it (e.g. gdalwarp -t_srs EPSG:" + std::to_string(*ctx.epsg) + ")");
      return std::nullopt;
    }
  }
  GDALRasterBandH rb = GDALGetRasterBand(ds, band);
  std::vector<double> pixels(static_cast<std::size_t>(g.n_cols) * g.n_rows);
  if (GDALRasterIO(rb, GF_Read, 0, 0, g.n_cols, g.n_rows, pixels.data(), g.n_cols, g.n_rows,
                   GDT_Float64, 0, 0) != CE_None) {
    ctx.error(at, key, "cannot read raster " + name + ": " + CPLGetLastErrorMsg());
    return std::nullopt;
  }
  int has_nodata = 0;
  const double nodata = GDALGetRasterNoDataValue(rb, &has_nodata);
  for (double& v : pixels)
    if ((has_nodata && (v == nodata || (std::isnan(nodata) && std::isnan(v)))) || !std::isfinite(v))
      v = std::nan("");
  if (south_up)
    for (int j = 0; j < g.n_rows / 2; ++j)
      std::swap_ranges(pixels.begin() + std::ptrdiff_t(j) * g.n_cols,
                       pixels.begin() + std::ptrdiff_t(j + 1) * g.n_cols,
                       pixels.begin() + std::ptrdiff_t(g.n_rows - 1 - j) * g.n_cols);

  const GridShape& shape = *ctx.shape;
  // Column edges west to east; row edges from the north edge southwards (dy is north first).
  std::vector<double> x_edges{shape.x0};
  for (double w : shape.dx) x_edges.push_back(x_edges.back() + w);
  double y_north = shape.y0;
  for (double h : shape.dy) y_north += h;
  std::vector<double> y_edges{y_north};
  for (double h : shape.dy) y_edges.push_back(y_edges.back() - h);
  Resampled on_grid = method == RasterMethod::average
                          ? cell_averages(g, pixels, x_edges, y_edges)
                          : cell_centre_pixels(g, pixels, x_edges, y_edges);
  // Cells the raster covers only in part take the mean of what it has: say where.
  int thin = 0, first_thin = -1;
  for (std::size_t c = 0; c < on_grid.covered.size(); ++c) {
    const bool active = !ctx.grid || ctx.grid->is_active(CellIndex{static_cast<std::int32_t>(c)});
    if (active && on_grid.covered[c] > 0.0 && on_grid.covered[c] < 0.5 && thin++ == 0)
      first_thin = static_cast<int>(c);
  }
  if (thin > 0)
    ctx.warning(at, key,
                std::to_string(thin) + " cell(s) are less than half covered by values of raster " +
                    name + " (first at " + describe_cell(shape.ncol, first_thin) +
                    "); each takes the mean of the part covered");
  CellField field;
  field.at = at;
  field.file = file;
  const RowBand rows = ctx.band ? *ctx.band : RowBand{0, shape.nrow};
  field.first = rows.first * shape.ncol;
  field.values.assign(on_grid.values.begin() + field.first,
                      on_grid.values.begin() + std::ptrdiff_t(rows.end()) * shape.ncol);
  return field;
}

std::optional<CellField> read_raster_table(ReaderContext& ctx, const toml::table& t,
                                           const std::string& key, RasterMethod fallback) {
  check_keys(ctx, t, key, {"raster", "band", "method"});
  auto file = read_string(ctx, t, "raster", key, true);
  auto band = read_integer(ctx, t, "band", key, false);
  auto method = read_choice(ctx, t, "method", key, {"average", "nearest"});
  if (!file || (t.contains("band") && !band) || (t.contains("method") && !method))
    return std::nullopt;
  const RasterMethod m =
      method ? (*method == "nearest" ? RasterMethod::nearest : RasterMethod::average) : fallback;
  return read_raster_field(ctx, ctx.resolve(*file), static_cast<int>(band.value_or(1)), m,
                           ctx.spot(*t.get("raster")), key + ".raster");
}

}  // namespace aquiledger
