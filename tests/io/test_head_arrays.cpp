// Head arrays (io/results/head_arrays.hpp): written heads read back through `[initial] head = {
// file = ... }` unchanged, as text array and as ESRI ASCII grid. The reference is the value
// written: numbers are the shortest text that reads back to the same double (Steele and
// White, 1990; fmt's "{}"), so the read-back must be bit for bit.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstring>

#include "io/files/atomic_file.hpp"
#include "io/results/head_arrays.hpp"
#include "reader_test_support.hpp"
#include "small_model.hpp"

using namespace aquiledger;
using reader_test::base_model;
using reader_test::edit;

namespace {

/// Heads that are not short decimals, one per cell of a 3 x 4 grid.
std::vector<double> odd_heads() {
  std::vector<double> h;
  for (int c = 0; c < 12; ++c) h.push_back(9.0 - c / 7.0 + std::sqrt(c + 0.3) * 1e-9);
  return h;
}

ReadResult read_from(const std::filesystem::path& folder, const std::string& text) {
  return read_model_text(text, folder / "scenario.toml");
}

}  // namespace

TEST_CASE("a head array reads back bit for bit as the initial head", "[io][head_arrays]") {
  const auto folder = aquiledger::testing::scratch_folder("head-arrays");
  ReadResult first = read_from(folder, base_model());
  REQUIRE(first.ok());
  const Model& m = *first.model;
  const std::vector<double> h = odd_heads();
  const HeadArrayFiles files = write_head_arrays(folder, m, h, 12.5);
  CHECK(files.text == "head_at_12.5.txt");
  CHECK(files.grid == "head_at_12.5.asc");  // 10 m cells both ways: a uniform grid

  for (const std::string& name : {files.text, files.grid}) {
    INFO(name);
    const ReadResult r =
        read_from(folder, edit(base_model(), "head = 9.0", "head = { file = \"" + name + "\" }"));
    for (const auto& d : r.diagnostics) INFO(d.to_string());
    REQUIRE(r.ok());
    REQUIRE(r.model->initial.head.size() == h.size());
    CHECK(std::memcmp(r.model->initial.head.values().data(), h.data(), h.size() * sizeof(double)) ==
          0);
  }
  // The raster header is the grid's (ESRI ASCII grid: ncols, nrows, lower-left corner,
  // cellsize, NODATA_value).
  const std::string asc = *head_ascii_grid(m, h);
  CHECK(asc.rfind("ncols 4\nnrows 3\nxllcorner 0\nyllcorner 0\ncellsize 10\nNODATA_value -9999\n",
                  0) == 0);
  std::filesystem::remove_all(folder);
}

TEST_CASE("a cell inactive where the heads were written has no head to start from",
          "[io][head_arrays]") {
  const auto folder = aquiledger::testing::scratch_folder("head-arrays-inactive");
  std::string text = base_model();
  ReadResult writer = read_from(folder, text);
  REQUIRE(writer.ok());
  Model m = std::move(*writer.model);
  // The writing run had cell (row 1, column 2) inactive.
  m.grid = RectilinearGrid({10.0, 10.0, 10.0, 10.0}, {10.0, 10.0, 10.0}, 0.0, 0.0,
                           {1, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1});
  std::vector<double> h = odd_heads();
  h[1] = std::nan("");
  write_head_arrays(folder, m, h, 0.0);
  // Text array: -9999 in that cell, refused as a head where the cell is active.
  const ReadResult t =
      read_from(folder, edit(text, "head = 9.0", "head = { file = \"head_at_0.txt\" }"));
  CHECK_FALSE(t.ok());
  CHECK(reader_test::has_error(t, "[initial].head", {"-9999", "inactive", "row 1, column 2"}));
  // ESRI grid: NODATA in that cell, refused as no value.
  const ReadResult a =
      read_from(folder, edit(text, "head = 9.0", "head = { file = \"head_at_0.asc\" }"));
  CHECK_FALSE(a.ok());
  CHECK(reader_test::has_error(a, "[initial].head", {"no value (NODATA)"}));
  std::filesystem::remove_all(folder);
}

TEST_CASE("a grid of unequal spacing gets the text array only", "[io][head_arrays]") {
  const Model m = aquiledger::testing::small_model();  // dx 10, 20, 40
  const std::vector<double> h(static_cast<std::size_t>(m.grid.n_cells()), 1.5);
  CHECK_FALSE(head_ascii_grid(m, h).has_value());
  const auto folder = aquiledger::testing::scratch_folder("head-arrays-nonuniform");
  const HeadArrayFiles files = write_head_arrays(folder, m, h, 3.0);
  CHECK(files.grid.empty());
  CHECK(aquiledger::testing::file_names(folder) == std::vector<std::string>{"head_at_3.txt"});
  // The text array: comment lines, then one line per row; the inactive north-east cell
  // (row 1, column 3) holds the no-value number.
  const std::string text = head_text_array(m, h, 3.0);
  CHECK(text.find("\n1.5 1.5 -9999\n1.5 1.5 1.5\n") != std::string::npos);
  std::filesystem::remove_all(folder);
}
