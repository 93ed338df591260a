// Georeferenced rasters (docs/model-format.md, "Rasters"; docs/results.md, "GeoTIFF"): inputs
// made with GDAL itself, carried onto the grid; a GeoTIFF we write read back by GDAL's own
// command-line tool to the last bit; every misuse refused with the file, line and key.
#include <gdal.h>
#include <ogr_srs_api.h>

#include <cmath>
#include <cstdlib>
#include <cstring>
#include <fstream>

#include "io/results/geotiff_fields.hpp"
#include "tests/io/reader_test_support.hpp"
#include "tests/io/small_model.hpp"

using namespace reader_test;
using namespace aquiledger;

namespace {

/// A GeoTIFF made with GDAL: nx x ny Float64 pixels, geotransform gt, EPSG code (0: none).
void make_tiff(const std::filesystem::path& file, int nx, int ny, const double gt[6],
               const std::vector<double>& values, int epsg, double nodata = NAN) {
  GDALAllRegister();
  GDALDatasetH ds =
      GDALCreate(GDALGetDriverByName("GTiff"), file.c_str(), nx, ny, 1, GDT_Float64, nullptr);
  REQUIRE(ds != nullptr);
  double t[6];
  std::memcpy(t, gt, sizeof t);
  GDALSetGeoTransform(ds, t);
  if (epsg) {
    OGRSpatialReferenceH srs = OSRNewSpatialReference(nullptr);
    OSRImportFromEPSG(srs, epsg);
    GDALSetSpatialRef(ds, srs);
    OSRDestroySpatialReference(srs);
  }
  GDALRasterBandH band = GDALGetRasterBand(ds, 1);
  if (!std::isnan(nodata)) GDALSetRasterNoDataValue(band, nodata);
  std::vector<double> v = values;
  REQUIRE(GDALRasterIO(band, GF_Write, 0, 0, nx, ny, v.data(), nx, ny, GDT_Float64, 0, 0) ==
          CE_None);
  GDALClose(ds);
}

std::filesystem::path scratch(const std::string& name) {
  return aquiledger::testing::scratch_folder("rasters-" + name);
}

/// The base model (3 x 4 cells of 10 m, x 0..40, y 0..30) with k from `k` and extra [grid]
/// keys, read as if in dir.
ReadResult model_in(const std::filesystem::path& dir, const std::string& k,
                    const std::string& grid_keys = "") {
  std::string text = edit(base_model(), "k = 5.0", "k = " + k);
  if (!grid_keys.empty()) text = edit(text, "dy = 10.0", "dy = 10.0\n" + grid_keys);
  return read_model_text(text, dir / "model.toml");
}

// North-up, 20 x 15 m pixels from (0, 30): 2 columns x 2 rows over the 40 x 30 m grid.
const double north_up[6] = {0.0, 20.0, 0.0, 30.0, 0.0, -15.0};

}  // namespace

TEST_CASE("rasters: a GeoTIFF averaged onto the grid, the coordinate system checked",
          "[raster][reader]") {
  const auto dir = scratch("average");
  make_tiff(dir / "k.tif", 2, 2, north_up, {1.0, 2.0, 3.0, 4.0}, 32633);
  const auto r = model_in(dir, "{ raster = \"k.tif\" }", "epsg = 32633");
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& k = r.model->aquifer.kx;
  // Grid rows 1..3 (y 30..20, 20..10, 10..0) against pixel rows (30..15, 15..0): row 2 takes
  // half of each (by hand).
  CHECK(k[0] == 1.0);
  CHECK(k[3] == 2.0);
  CHECK(k[4] == Approx(2.0).epsilon(1e-15));  // (1 + 3) / 2
  CHECK(k[7] == Approx(3.0).epsilon(1e-15));  // (2 + 4) / 2
  CHECK(k[8] == 3.0);
  CHECK(r.model->epsg == 32633);
  CHECK(std::find(r.model->input_files.begin(), r.model->input_files.end(), dir / "k.tif") !=
        r.model->input_files.end());
}

TEST_CASE("rasters: a south-up raster reads the same; zones by the centre pixel",
          "[raster][reader]") {
  const auto dir = scratch("south");
  const double south_up[6] = {0.0, 20.0, 0.0, 0.0, 0.0, 15.0};
  make_tiff(dir / "k.tif", 2, 2, south_up, {3.0, 4.0, 1.0, 2.0}, 0);
  make_tiff(dir / "zones.tif", 2, 2, north_up, {1.0, 2.0, 2.0, 1.0}, 0);
  const auto r = model_in(dir,
                          "{ raster = \"k.tif\" }\nk_ratio = { zones = \"zones.tif\", "
                          "values = { 1 = 1.0, 2 = 0.5 } }");
  INFO(all_messages(r));
  REQUIRE(r.ok());
  CHECK(r.model->aquifer.kx[0] == 1.0);
  CHECK(r.model->aquifer.kx[11] == 4.0);
  // Row 2's centre (y 15) is on the pixel edge: it takes the pixel below (y 15..0).
  CHECK(r.model->aquifer.ky[0] == 1.0);
  CHECK(r.model->aquifer.ky[3] == 0.5 * r.model->aquifer.kx[3]);
  CHECK(r.model->aquifer.ky[4] == 0.5 * r.model->aquifer.kx[4]);
}

TEST_CASE("rasters: a GeoTIFF written by us reads back through GDAL's own tool, bit for bit",
          "[raster][geotiff]") {
  // gdal_translate (GDAL's command-line tool) turns our GeoTIFF into ENVI raw Float64: its
  // bytes must be those of our values, and gdalinfo must report the model's system.
  Model m = aquiledger::testing::small_model();  // 2 x 3 cells, uneven: made uniform below
  m.grid = RectilinearGrid({25.0, 25.0, 25.0}, {10.0, 10.0}, 500.0, 800.0, {1, 1, 0, 1, 1, 1});
  m.epsg = 32633;
  const std::vector<double> values = {1.0 / 3.0, std::sqrt(2.0), NAN, -7.25e-12, 1e300 / 7.0, M_PI};
  const auto dir = scratch("geotiff");
  write_geotiff(dir / "head.tif", m, values, "head (m)");
  const std::string translate = "gdal_translate -q -of ENVI '" + (dir / "head.tif").string() +
                                "' '" + (dir / "head.bin").string() + "'";
  REQUIRE(std::system(translate.c_str()) == 0);
  std::ifstream in(dir / "head.bin", std::ios::binary);
  std::vector<double> back(6);
  in.read(reinterpret_cast<char*>(back.data()), 6 * sizeof(double));
  REQUIRE(in.gcount() == 6 * static_cast<std::streamsize>(sizeof(double)));
  for (std::size_t c = 0; c < 6; ++c) {
    INFO("cell " << c);
    const double expected = std::isnan(values[c]) ? geotiff_no_value : values[c];
    CHECK(std::memcmp(&back[c], &expected, sizeof(double)) == 0);
  }
  const std::string info =
      "gdalinfo '" + (dir / "head.tif").string() + "' > '" + (dir / "info.txt").string() + "'";
  REQUIRE(std::system(info.c_str()) == 0);
  std::ifstream text(dir / "info.txt");
  const std::string all((std::istreambuf_iterator<char>(text)), {});
  CHECK(all.find("ID[\"EPSG\",32633]]") != std::string::npos);
  CHECK(all.find("Origin = (500.000000000000000,820.000000000000000)") != std::string::npos);
  CHECK(all.find("Pixel Size = (25.000000000000000,-10.000000000000000)") != std::string::npos);
  CHECK(all.find("NoData Value=-9999") != std::string::npos);
  CHECK(all.find("Description = head (m)") != std::string::npos);
}

TEST_CASE("bad raster 01: a raster in another coordinate system", "[raster][errors]") {
  const auto dir = scratch("bad01");
  make_tiff(dir / "k.tif", 2, 2, north_up, {1.0, 2.0, 3.0, 4.0}, 4326);
  const auto r = model_in(dir, "{ raster = \"k.tif\" }", "epsg = 32633");
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, "[aquifer].k.raster", {"is in EPSG:4326, the model in EPSG:32633"},
                  line_of(edit(base_model(), "k = 5.0", "k = x"), "k = x") + 1));
}
TEST_CASE("bad raster 02: a raster that does not exist", "[raster][errors]") {
  const auto dir = scratch("bad02");
  const auto r = model_in(dir, "{ raster = \"none.tif\" }");
  INFO(all_messages(r));
  CHECK(has_error(r, "[aquifer].k.raster", {"cannot open raster", "none.tif"}));
}
TEST_CASE("bad raster 03: a band the raster does not have", "[raster][errors]") {
  const auto dir = scratch("bad03");
  make_tiff(dir / "k.tif", 2, 2, north_up, {1.0, 2.0, 3.0, 4.0}, 0);
  const auto r = model_in(dir, "{ raster = \"k.tif\", band = 2 }");
  INFO(all_messages(r));
  CHECK(has_error(r, "[aquifer].k.raster", {"has 1 band(s); band 2 asked for"}));
}
TEST_CASE("bad raster 04: a rotated raster", "[raster][errors]") {
  const auto dir = scratch("bad04");
  const double rotated[6] = {0.0, 20.0, 2.0, 30.0, 1.0, -15.0};
  make_tiff(dir / "k.tif", 2, 2, rotated, {1.0, 2.0, 3.0, 4.0}, 0);
  const auto r = model_in(dir, "{ raster = \"k.tif\" }");
  INFO(all_messages(r));
  CHECK(has_error(r, "[aquifer].k.raster", {"rotated or sheared"}));
}
TEST_CASE("bad raster 05: no data over active cells", "[raster][errors]") {
  const auto dir = scratch("bad05");
  make_tiff(dir / "k.tif", 2, 2, north_up, {1.0, -1.0, 3.0, -1.0}, 0, -1.0);
  const auto r = model_in(dir, "{ raster = \"k.tif\" }");
  INFO(all_messages(r));
  CHECK(has_error(r, "[aquifer].k",
                  {"no value (NODATA) at row 1, column 3", "(6 active cells fail)"}));
}
TEST_CASE("bad raster 06: an EPSG code no one knows", "[raster][errors]") {
  const auto dir = scratch("bad06");
  const auto r = model_in(dir, "5.0", "epsg = 999999");
  INFO(all_messages(r));
  CHECK(has_error(r, "[grid].epsg", {"EPSG:999999 is not a coordinate system"}));
}
TEST_CASE("bad raster 07: an aggregation method that does not exist", "[raster][errors]") {
  const auto dir = scratch("bad07");
  make_tiff(dir / "k.tif", 2, 2, north_up, {1.0, 2.0, 3.0, 4.0}, 0);
  const auto r = model_in(dir, "{ raster = \"k.tif\", method = \"bilinear\" }");
  INFO(all_messages(r));
  CHECK(has_error(r, "[aquifer].k.method", {"bilinear", "average"}));
}
TEST_CASE("rasters: a raster without a coordinate system in a model with one warns",
          "[raster][reader]") {
  const auto dir = scratch("warn");
  make_tiff(dir / "k.tif", 2, 2, north_up, {1.0, 2.0, 3.0, 4.0}, 0);
  const auto r = model_in(dir, "{ raster = \"k.tif\" }", "epsg = 32633");
  INFO(all_messages(r));
  REQUIRE(r.ok());
  CHECK(has_warning(r, "[aquifer].k.raster", "names no coordinate system"));
}
TEST_CASE("bad geotiff 01: GeoTIFF output of an uneven grid", "[raster][errors]") {
  const std::string text = edit(base_model(), "dx = 10.0", "dx = [10.0, 10.0, 5.0, 15.0]") +
                           "\n[output]\ngeotiff = true\n";
  const auto r = read(text);
  INFO(all_messages(r));
  CHECK(has_error(r, "[output].geotiff", {"equal column widths"}, line_of(text, "geotiff")));
}
TEST_CASE("bad geotiff 02: GeoTIFF output without field output", "[raster][errors]") {
  const std::string text = base_model() + "\n[output]\nfields = \"none\"\ngeotiff = true\n";
  const auto r = read(text);
  INFO(all_messages(r));
  CHECK(has_error(r, "[output].geotiff", {"fields = \"none\" has none"}, line_of(text, "geotiff")));
}
