// Reading a field value for a band of rows (ReaderContext::band, what a rank of the
// distributed engine holds): for every form of a field value (number, text array file,
// zones, ESRI ASCII raster) the band read keeps exactly the whole read's values of the
// band's rows, indexed by grid cell, and a bad file read for a band names the same file,
// line and key as the whole read. The reference is the whole read of the same input (the
// reader's own result, checked against the files by the other reader tests), compared bit
// for bit: a band read only copies values, so nothing may differ.
#include <toml++/toml.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <filesystem>
#include <fstream>

#include "io/model_file/field_value.hpp"
#include "io/model_file/model_reader.hpp"
#include "tests/io/small_model.hpp"

using namespace aquiledger;

namespace {

constexpr int n_rows = 5;
constexpr int n_cols = 3;

/// A scratch folder holding the array files of one test, removed when the test program exits.
std::filesystem::path scratch(const std::string& name) {
  return aquiledger::testing::scratch_folder("bands-" + name);
}

void write(const std::filesystem::path& file, const std::string& text) {
  std::ofstream(file) << text;
}

/// A context for a 5 x 3 grid of 10 m cells at the origin, with or without a band.
ReaderContext context(const std::filesystem::path& dir, std::optional<RowBand> band) {
  ReaderContext ctx;
  ctx.model_file = dir / "scenario.toml";
  ctx.base_dir = dir;
  ctx.shape = GridShape{
      n_rows, n_cols, std::vector<double>(n_cols, 10.0), std::vector<double>(n_rows, 10.0),
      0.0,    0.0};
  ctx.band = band;
  return ctx;
}

/// Reads the value of key `k` in the TOML text, as the field `[aquifer].k`.
std::optional<CellField> read_k(ReaderContext& ctx, const std::string& toml_text) {
  const toml::table root = toml::parse(toml_text, ctx.model_file.string());
  return read_field(ctx, *root.get("k"), "[aquifer].k");
}

bool same_bits(double a, double b) { return (std::isnan(a) && std::isnan(b)) || a == b; }

/// The band read of the text holds the whole read's values of the band's rows, by grid cell.
void check_band_matches_whole(const std::filesystem::path& dir, const std::string& toml_text) {
  ReaderContext whole_ctx = context(dir, std::nullopt);
  const auto whole = read_k(whole_ctx, toml_text);
  REQUIRE(whole);
  REQUIRE_FALSE(whole_ctx.diagnostics.has_errors());
  REQUIRE(whole->first == 0);
  REQUIRE(whole->values.size() == std::size_t(n_rows * n_cols));
  for (RowBand band : {RowBand{0, 2}, RowBand{2, 2}, RowBand{4, 1}, RowBand{0, n_rows}}) {
    INFO("rows " << band.first << " to " << band.end() - 1);
    ReaderContext ctx = context(dir, band);
    const auto part = read_k(ctx, toml_text);
    REQUIRE(part);
    REQUIRE_FALSE(ctx.diagnostics.has_errors());
    CHECK(part->first == band.first * n_cols);
    REQUIRE(part->values.size() == std::size_t(band.count * n_cols));
    const auto cells = part->cells();
    for (int c = band.first * n_cols; c < band.end() * n_cols; ++c)
      CHECK(same_bits(cells[std::size_t(c)], whole->values[std::size_t(c)]));
    CHECK(part->row_line == whole->row_line);  // line of every row, for messages
    if (!whole->zone.empty()) {
      REQUIRE(part->zone.size() == part->values.size());
      for (std::size_t i = 0; i < part->zone.size(); ++i)
        CHECK(part->zone[i] == whole->zone[i + std::size_t(part->first)]);
    }
  }
}

const std::string text_array =
    "# conductivity, northern row first\n"
    "1.5 2.5 3.5\n"
    "4.25, 5.25, 6.25\n"
    "\n"
    "7 8 9  # comment\n"
    "10 11 12\n"
    "13.125 14.125 15.125\n";

}  // namespace

TEST_CASE("a band read of a number holds the number on the band's cells", "[io][bands]") {
  check_band_matches_whole(scratch("number"), "k = 12.5");
}

TEST_CASE("a band read of an array file holds the band's rows of the whole read", "[io][bands]") {
  const auto dir = scratch("file");
  write(dir / "k.txt", text_array);
  check_band_matches_whole(dir, "k = { file = \"k.txt\" }");
}

TEST_CASE("a band read of zones holds the band's rows of the whole read", "[io][bands]") {
  const auto dir = scratch("zones");
  write(dir / "zones.txt", "1 1 2\n1 2 2\n3 3 2\n3 1 1\n2 2 3\n");
  check_band_matches_whole(dir,
                           "k = { zones = \"zones.txt\", values = { 1 = 0.5, 2 = 7.25, 3 = 40 } }");
}

TEST_CASE("a band read of an ESRI ASCII raster holds the band's rows, NODATA included",
          "[io][bands]") {
  const auto dir = scratch("raster");
  write(dir / "k.asc",
        "ncols 3\nnrows 5\nxllcorner 0\nyllcorner 0\ncellsize 10\nNODATA_value -9999\n"
        "1 2 3\n4 -9999 6\n7 8 9\n10 11 -9999\n13 14 15\n");
  check_band_matches_whole(dir, "k = { file = \"k.asc\" }");
}

TEST_CASE("a bad array file read for a band names the same file, line and key", "[io][bands]") {
  const auto dir = scratch("errors");
  // Line 2 has a word for a number, line 6 one value too few: both outside the band of the
  // rank holding rows 3 and 4 (lines 4 and 5), which must still stop with the same errors.
  write(dir / "k.txt", "1 2 3\n4 x 6\n7 8 9\n10 11 12\n13 14\n");
  const std::string text = "k = { file = \"k.txt\" }";
  ReaderContext whole_ctx = context(dir, std::nullopt);
  CHECK_FALSE(read_k(whole_ctx, text));
  for (RowBand band : {RowBand{2, 2}, RowBand{0, 1}}) {
    ReaderContext ctx = context(dir, band);
    CHECK_FALSE(read_k(ctx, text));
    const auto& got = ctx.diagnostics.items();
    const auto& want = whole_ctx.diagnostics.items();
    REQUIRE(got.size() == want.size());
    REQUIRE(got.size() == 2);
    for (std::size_t i = 0; i < got.size(); ++i) {
      CHECK(got[i].file == dir / "k.txt");
      CHECK(got[i].line == want[i].line);
      CHECK(got[i].key == "[aquifer].k");
      CHECK(got[i].message == want[i].message);
    }
    CHECK(got[0].line == 2);
    CHECK(got[1].line == 5);
  }
}

TEST_CASE("a value check on a band names the grid cell and the line of its row", "[io][bands]") {
  const auto dir = scratch("check");
  write(dir / "k.txt", text_array);
  ReaderContext ctx = context(dir, RowBand{3, 2});
  const auto field = read_k(ctx, "k = { file = \"k.txt\" }");
  REQUIRE(field);
  // Rows 4 and 5 (1-based) hold 10..15.125; the first value not below 12 is row 4, column 3
  // (12 is not < 12), written on line 6 of the file.
  CHECK_FALSE(check_field(
      ctx, *field, "[aquifer].k", [](double v) { return v < 12.0; }, "< 12"));
  REQUIRE(ctx.diagnostics.items().size() == 1);
  const Diagnostic& d = ctx.diagnostics.items()[0];
  CHECK(d.line == 6);
  CHECK(d.file == dir / "k.txt");
  CHECK(d.message.find("row 4, column 3") != std::string::npos);
  CHECK(d.message.find("4 active cells fail") != std::string::npos);
}

// The whole model read for a band (read_model_text's band_of, as a distributed rank reads
// it): the aquifer, interbed and initial-head arrays hold the window's rows from its first
// cell, equal bit for bit to the whole read's; the features are read whole; the same file
// and the same model with a bad value outside the band read cleanly, inside it not.

TEST_CASE("a model read for a band holds the window's rows of the per-cell inputs", "[bands]") {
  const auto dir = scratch("model");
  write(dir / "k.txt", "1 2 3\n4 5 6\n7 8 9\n10 11 12\n13 14 15\n");
  write(dir / "h.txt", "20 21 22\n23 24 25\n26 27 28\n29 30 31\n32 33 34\n");
  const std::string text = R"(
[grid]
nrow = 5
ncol = 3
dx = 10.0
dy = 10.0
[aquifer]
top = 50.0
bottom = { file = "k.txt" }
k = { file = "k.txt" }
condition = "switching"
specific_yield = 0.1
specific_storage = 1.0e-5
[interbeds]
thickness = 0.5
elastic_storage = 1.0e-5
inelastic_storage = 1.0e-3
preconsolidation_below_initial = 1.0
[initial]
head = { file = "h.txt" }
[[period]]
length = 1.0
[[fixed_head]]
name = "side"
head = { file = "h.txt" }
edge = "west"
)";
  const ReadResult whole = read_model_text(text, dir / "scenario.toml");
  REQUIRE(whole.ok());
  // Rank 1 of 2 in row_split's manner: rows 3-4 (0-based) owned, rows 2-4 held.
  const GridPart part{n_cols, {3, 2}, {2, 3}};
  const ReadResult band =
      read_model_text(text, dir / "scenario.toml", [&](int, int) { return part; });
  REQUIRE(band.ok());
  const Model& b = *band.model;
  REQUIRE(b.band);
  CHECK(b.band->owned.first == 3);
  CHECK(b.band->window.first == 2);
  const Aquifer& wa = whole.model->aquifer;
  using Member = CellArray<double> Aquifer::*;
  for (const Member member : {&Aquifer::kx, &Aquifer::ky, &Aquifer::top, &Aquifer::bottom,
                              &Aquifer::specific_yield, &Aquifer::specific_storage}) {
    const CellArray<double>& held = b.aquifer.*member;
    CHECK(held.first() == 2 * n_cols);
    CHECK(held.size() == 3u * n_cols);
    for (std::size_t c = 6; c < 15; ++c) CHECK(same_bits(held[c], (wa.*member)[c]));
  }
  REQUIRE(b.aquifer.interbeds);
  CHECK(b.aquifer.interbeds->thickness.first() == 2 * n_cols);
  CHECK(b.initial.head.first() == 2 * n_cols);
  for (std::size_t c = 6; c < 15; ++c) CHECK(b.initial.head[c] == whole.model->initial.head[c]);
  // The fixed head (a feature, shared by every rank) is read whole from the same file.
  REQUIRE(b.fixed_heads.size() == 1);
  CHECK(b.fixed_heads[0].cells.size() == whole.model->fixed_heads[0].cells.size());
  CHECK(b.fixed_heads[0].head.at(0, 0) == 20.0);

  // A conductivity of 0 in row 1 (rank 0's rows): this band reads cleanly, the whole read not.
  write(dir / "k.txt", "1 2 3\n4 0 6\n7 8 9\n10 11 12\n13 14 15\n");
  CHECK_FALSE(read_model_text(text, dir / "scenario.toml").ok());
  CHECK(read_model_text(text, dir / "scenario.toml", [&](int, int) { return part; }).ok());
  // In row 4 (this band's): both fail, naming the same file, line and key.
  write(dir / "k.txt", "1 2 3\n4 5 6\n7 8 9\n10 11 12\n13 0 15\n");
  const ReadResult bad_whole = read_model_text(text, dir / "scenario.toml");
  const ReadResult bad_band =
      read_model_text(text, dir / "scenario.toml", [&](int, int) { return part; });
  REQUIRE_FALSE(bad_band.ok());
  REQUIRE(bad_whole.diagnostics.size() >= 1);
  CHECK(bad_band.diagnostics.front().to_string() == bad_whole.diagnostics.front().to_string());
}
