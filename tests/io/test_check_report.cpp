// The check report: what `aquiledger check` prints about a model.
#include <catch2/catch.hpp>
#include <cmath>
#include <fstream>
#include <iterator>

#include "io/model_file/model_reader.hpp"
#include "io/reports/check_report.hpp"

using namespace aquiledger;

TEST_CASE("the report describes the contract example", "[check_report]") {
  const std::string dir = std::string(AQUILEDGER_TEST_DATA_DIR) + "/reader";
  auto r = read_model_file(dir + "/contract_example.toml");
  REQUIRE(r.ok());
  const std::string text = format_check_report(*r.model);
  INFO(text);
  CHECK(text.find("120 x 160 = 19200 cells, 19100 active") != std::string::npos);
  CHECK(text.find("0 .. 40000 m") != std::string::npos);
  CHECK(text.find("T = Kx (top - bottom)") != std::string::npos);
  CHECK(text.find("500 m2/d") != std::string::npos);  // 12.5 m/d x 40 m
  CHECK(text.find("row 84, column 74") != std::string::npos);
  CHECK(text.find("dry season") != std::string::npos);
  // hypot(8000, 7000) = 10630.1; the cells' row and column span comes before it.
  CHECK(text.find("56 cells (rows ") != std::string::npos);
  CHECK(text.find("; channel 10630 m") != std::string::npos);
  // An edge placement spans every row of its side.
  CHECK(text.find("120 cells (rows 1-120, column 1)") != std::string::npos);
}

TEST_CASE("the report shows the compressibility shares", "[check_report]") {
  const std::string dir = std::string(AQUILEDGER_TEST_DATA_DIR) + "/reader";
  std::ifstream in(dir + "/contract_example.toml");
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  const std::string from = "specific_storage = 2.0e-6            # 1/L";
  text.replace(text.find(from), from.size(),
               "compressibility = { skeleton = 5.0e-9, porosity = 0.25 }");
  auto r = read_model_text(text, dir + "/contract_example.toml");
  REQUIRE(r.ok());
  const std::string report = format_check_report(*r.model);
  INFO(report);
  // alpha / (alpha + n beta) = 5e-9 / (5e-9 + 0.25 x 4.6e-10) = 97.752 % (Jacob, 1940 split).
  CHECK(report.find("Jacob, 1940") != std::string::npos);
  CHECK(report.find("97.752 %") != std::string::npos);
  CHECK(report.find("2.2483 %") != std::string::npos);
}

TEST_CASE("the Marrow Basin demo is accepted and reported", "[check_report]") {
  auto r =
      read_model_file(std::string(AQUILEDGER_SOURCE_DIR) + "/cases/01-marrow-basin/model.toml");
  for (const auto& d : r.diagnostics) INFO(d.to_string());
  REQUIRE(r.ok());
  const Model& m = *r.model;
  CHECK(m.grid.n_rows() == 60);
  CHECK(m.grid.n_cols() == 80);
  CHECK(m.aquifer.elastic_split());
  CHECK(m.periods.front().steady);
  CHECK(m.wells.size() == 4);
  CHECK(m.observations[0].measured.size() == 11);
  const std::string report = format_check_report(m);
  CHECK(report.find("Jacob, 1940") != std::string::npos);
  CHECK(report.find("pre-development") != std::string::npos);
  CHECK(report.find("t = 365 d") != std::string::npos);  // [output].head_arrays
}
