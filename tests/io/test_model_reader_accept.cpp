// Good inputs: every example of the contract's Sections block is accepted, and the values
// land in the cells, periods and units they should.
#include <cmath>
#include <fstream>
#include <sstream>

#include "io/reports/check_report.hpp"
#include "tests/io/reader_test_support.hpp"

using namespace reader_test;
using namespace aquiledger;

namespace {
std::string contract_text() {
  std::ifstream in(data_dir + "/contract_example.toml");
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}
Model require_model(const ReadResult& r) {
  INFO(all_messages(r));
  REQUIRE(r.ok());
  return *r.model;
}
Model contract_variant(const std::string& from, const std::string& to) {
  return require_model(
      read_model_text(edit(contract_text(), from, to), data_dir + "/contract_example.toml"));
}
}  // namespace

TEST_CASE("the contract example is accepted and its values land where they should",
          "[reader][accept]") {
  const Model m = require_model(read_model_file(data_dir + "/contract_example.toml"));
  const RectilinearGrid& g = m.grid;
  CHECK(m.title == "North terrace aquifer, 20-year irrigation scenario");
  CHECK(g.n_rows() == 120);
  CHECK(g.n_cols() == 160);
  // Grid extent: 160 x 250 m and 120 x 250 m from the south-west origin (geometry).
  CHECK(g.x_max() == Approx(40000.0));
  CHECK(g.y_max() == Approx(30000.0));
  // active.txt blanks a 10 x 10 block: 19200 - 100 cells.
  CHECK(g.n_active() == 19100);
  CHECK(m.aquifer.condition == Condition::switching);
  CHECK(m.aquifer.specific_storage[0] == 2.0e-6);
  CHECK(m.aquifer.kx[0] == 12.5);
  CHECK(m.aquifer.ky[0] == 12.5);  // k_ratio = 1
  CHECK_FALSE(m.aquifer.elastic_split());
  REQUIRE(m.periods.size() == 2);
  CHECK(m.periods[0].steady);
  CHECK(m.periods[1].steps == 12);
  CHECK(m.periods[1].growth == 1.2);

  // Well at (18250, 9100): column floor(18250 / 250) + 1 = 74; row from the north edge
  // floor((30000 - 9100) / 250) + 1 = 84 (rows count from the north, contract Conventions).
  REQUIRE(m.wells.size() == 1);
  CHECK(g.row_col(m.wells[0].cell) == RowCol{83, 73});
  CHECK(m.wells[0].rate.at(0, 0) == 0.0);
  CHECK(m.wells[0].rate.at(1, 0) == 2400.0);

  // West edge: the first active cell of every row is in column 1.
  REQUIRE(m.fixed_heads.size() == 1);
  CHECK(m.fixed_heads[0].cells.size() == 120);
  for (CellIndex c : m.fixed_heads[0].cells) CHECK(g.row_col(c).col == 0);
  // East edge: rows 1-10 end at column 150 (the block 151-160 is inactive), the others at 160.
  REQUIRE(m.external_heads.size() == 1);
  CHECK(m.external_heads[0].cells.size() == 120);
  CHECK(g.row_col(m.external_heads[0].cells[0]).col == 149);
  CHECK(g.row_col(m.external_heads[0].cells[119]).col == 159);

  // Recharge without a mask covers every active cell.
  REQUIRE(m.recharges.size() == 1);
  CHECK(m.recharges[0].cells.size() == 19100);
  CHECK(m.recharges[0].rate.at(0, 0) == 0.0004);
  CHECK(m.recharges[0].rate.at(1, 0) == 0.0);

  // River (1000, 500) -> (9000, 7500): total length sqrt(8000^2 + 7000^2) (Pythagoras). The
  // segment crosses the 31 column edges x = 1250..8750 and the 27 row edges y = 750..7250;
  // it passes exactly through the corners (3000, 2250), (5000, 4250), (7000, 5750)
  // (solutions of 7 i - 8 j = 12 for x = 250 i, y = 250 j), so 1 + 31 + 27 - 3 = 56 cells.
  REQUIRE(m.rivers.size() == 1);
  const River& r = m.rivers[0];
  CHECK(r.cells.size() == 56);
  double total = 0.0, conductance = 0.0;
  for (std::size_t i = 0; i < r.cells.size(); ++i)
    total += r.length[i], conductance += r.conductance.at(0, i);
  CHECK(total == Approx(std::hypot(8000.0, 7000.0)).epsilon(1e-12));
  // Conductance per cell = 15 per unit length x length in the cell (contract [[river]]).
  CHECK(conductance == Approx(15.0 * std::hypot(8000.0, 7000.0)).epsilon(1e-12));
  // (1000, 500) is a cell corner (x = 4 x 250, y = 30000 - 118 x 250); heading north-east, the
  // first piece lies in the cell north-east of it: row 118, column 5 (1-based).
  CHECK(g.row_col(r.cells.front()) == RowCol{117, 4});
  CHECK(r.stage.at(0, 0) == 36.0);
  CHECK(r.bed_bottom.at(1, 5) == 34.5);

  REQUIRE(m.drains.size() == 1);
  CHECK(m.drains[0].cells.size() == 40);  // tiles.txt: rows 61-62, columns 41-60
  CHECK(g.row_col(m.drains[0].cells[0]) == RowCol{60, 40});
  REQUIRE(m.evapotranspiration.size() == 1);
  CHECK(m.evapotranspiration[0].cells.size() == 11);
  // Leakance = K' / b' (Hantush and Jacob, 1955): 1e-4 / 5.
  REQUIRE(m.leakage.has_value());
  CHECK(m.leakage->cells.size() == 19100);
  CHECK(m.leakage->leakance.at(0, 0) == Approx(2.0e-5).epsilon(1e-14));
  CHECK(m.leakage->source_head.at(0, 0) == 42.0);

  // Observation at (15500, 9000): column 63, row floor(21000 / 250) + 1 = 85.
  REQUIRE(m.observations.size() == 1);
  CHECK(g.row_col(m.observations[0].cell) == RowCol{84, 62});
  CHECK(m.observations[0].measured.size() == 3);
  CHECK(m.observations[0].measured[1].time == 400.0);
  CHECK(m.observations[0].measured[1].head == 37.5);

  CHECK(m.output.folder == std::filesystem::path(data_dir) / "results");
  CHECK(m.output.fields == FieldCadence::period_end);
  CHECK(m.solver.max_cutbacks == 5);
  CHECK(m.initial.head[0] == 38.0);
}

TEST_CASE("the contract's commented alternatives are accepted", "[reader][accept]") {
  SECTION("fixed head by cells, 1-based [row, col]") {
    const Model m =
        contract_variant("edge = \"west\"            # north", "cells = [[1, 1], [2, 1]] # north");
    REQUIRE(m.fixed_heads[0].cells.size() == 2);
    CHECK(m.grid.row_col(m.fixed_heads[0].cells[1]) == RowCol{1, 0});
  }
  SECTION("fixed head by mask") {
    const Model m = contract_variant("edge = \"west\"            # north",
                                     "mask = { file = \"shore.txt\" } # north");
    CHECK(m.fixed_heads[0].cells.size() == 20);
  }
  SECTION("recharge mask") {
    const Model m = contract_variant("# mask = { file = \"irrigated.txt\" }",
                                     "mask = { file = \"irrigated.txt\" }");
    CHECK(m.recharges[0].cells.size() == 600);  // a 20 x 30 block
  }
  SECTION("storativity: Ss = S / (top - bottom)") {
    // S = Ss b (definition of storativity): 8e-5 / 40 m.
    const Model m =
        contract_variant("specific_storage = 2.0e-6            # 1/L", "storativity = 8.0e-5");
    CHECK(m.aquifer.specific_storage[0] == Approx(2.0e-6).epsilon(1e-14));
  }
  SECTION("compressibility with the water defaults") {
    const Model m = contract_variant("specific_storage = 2.0e-6            # 1/L",
                                     "compressibility = { skeleton = 5.0e-9, porosity = 0.25 }");
    // Ss = rho g (alpha + n beta) (Jacob, 1940) with the contract's defaults.
    const double ss = 998.2 * 9.80665 * (5.0e-9 + 0.25 * 4.6e-10);
    CHECK(m.aquifer.specific_storage[0] == Approx(ss).epsilon(1e-14));
    CHECK(m.aquifer.skeleton_share[0] == Approx(5.0e-9 / (5.0e-9 + 0.25 * 4.6e-10)).epsilon(1e-14));
    CHECK(m.aquifer.elastic_split());
    REQUIRE(m.aquifer.compressibility.has_value());
    CHECK(m.aquifer.compressibility->water == 4.6e-10);
  }
  SECTION("compressibility with every key") {
    const Model m = contract_variant("specific_storage = 2.0e-6            # 1/L",
                                     "compressibility = { skeleton = 5.0e-9, porosity = 0.25, "
                                     "water = 4.6e-10, density = 998.2, gravity = 9.80665 }");
    CHECK(m.aquifer.specific_storage[0] ==
          Approx(998.2 * 9.80665 * (5.0e-9 + 0.25 * 4.6e-10)).epsilon(1e-14));
  }
  SECTION("steady initial state") {
    const Model m =
        contract_variant("head = 38.0              # field value, or:", "steady = true");
    CHECK(m.initial.steady);
    CHECK(m.initial.head.empty());
  }
  SECTION("river bed from k, thickness and width") {
    const Model m = contract_variant("bed_conductance = 15.0",
                                     "bed = { k = 0.5, thickness = 1.0, width = 8.0 }");
    // Conductance per length = k w / thickness = 0.5 x 8 / 1 = 4 (Darcy's law across the bed).
    double c = 0.0;
    for (std::size_t i = 0; i < m.rivers[0].cells.size(); ++i)
      c += m.rivers[0].conductance.at(0, i);
    CHECK(c == Approx(4.0 * std::hypot(8000.0, 7000.0)).epsilon(1e-12));
  }
  SECTION("leakance given directly") {
    const Model m =
        contract_variant("aquitard = { k = 1.0e-4, thickness = 5.0 }", "leakance = 2.0e-5");
    CHECK(m.leakage->leakance.at(1, 7) == 2.0e-5);
  }
}

TEST_CASE("compressibility route in feet converts Ss to 1/ft", "[reader][accept]") {
  const std::string text =
      edit(edit(base_model(), "length_unit = \"m\"", "length_unit = \"ft\""),
           "specific_storage = 1.0e-5", "compressibility = { skeleton = 1.0e-8, porosity = 0.3 }");
  const Model m = require_model(read(text));
  // Contract: Ss [1/ft] = rho g (alpha + n beta) [1/m] x 0.3048 (1 ft = 0.3048 m exactly).
  CHECK(m.aquifer.specific_storage[5] ==
        Approx(998.2 * 9.80665 * (1.0e-8 + 0.3 * 4.6e-10) * 0.3048).epsilon(1e-14));
}

TEST_CASE("array files read north row first", "[reader][accept]") {
  // Contract Conventions: array files list the northern row first; row 1 is the north edge.
  for (const char* file : {"k_3x4.txt", "raster_3x4.asc"}) {
    INFO(file);
    const Model m = require_model(
        read(edit(base_model(), "k = 5.0", std::string("k = { file = \"") + file + "\" }")));
    CHECK(m.aquifer.kx[m.grid.cell(0, 0).value] == 1.0);
    CHECK(m.aquifer.kx[m.grid.cell(0, 3).value] == 4.0);
    CHECK(m.aquifer.kx[m.grid.cell(2, 0).value] == 9.0);
    // (5, 25) lies in the north-west cell (y runs 0..30 northward): the first value of the file.
    CHECK(m.aquifer.kx[m.grid.locate(5.0, 25.0)->value] == 1.0);
  }
}

TEST_CASE("zones give each cell its zone's value", "[reader][accept]") {
  const Model m = require_model(
      read(edit(base_model(), "k = 5.0",
                "k = { zones = \"zones_3x4.txt\", values = { 1 = 5.0, 2 = 8.0, 3 = 0.5 } }")));
  CHECK(m.aquifer.kx[m.grid.cell(0, 0).value] == 5.0);
  CHECK(m.aquifer.kx[m.grid.cell(1, 3).value] == 8.0);
  CHECK(m.aquifer.kx[m.grid.cell(2, 2).value] == 0.5);
  // The check report breaks the range down zone by zone; zones_3x4.txt has 4, 4 and 4 cells.
  REQUIRE(m.zone_maps.size() == 1);
  CHECK(m.zone_maps[0].zone[m.grid.cell(1, 3).value] == 2);
  const std::string text = format_check_report(m);
  INFO(text);
  CHECK(text.find("k zone 1                             4 cells; Kx 5 m/d") != std::string::npos);
  CHECK(text.find("k zone 3                             4 cells; Kx 0.5 m/d") != std::string::npos);
}

TEST_CASE("variable dx and dy from an array and a file", "[reader][accept]") {
  const Model m =
      require_model(read(edit(edit(base_model(), "dx = 10.0", "dx = [1.0, 2.0, 3.0, 4.0]"),
                              "dy = 10.0", "dy = { file = \"dy_3.txt\" }")));
  CHECK(m.grid.x_max() == 10.0);  // 1 + 2 + 3 + 4
  CHECK(m.grid.y_max() == 35.0);  // 5 + 10 + 20
  CHECK(m.grid.dy(0) == 5.0);     // the north row first
}

TEST_CASE("per-period values: numbers, arrays and a list of field values", "[reader][accept]") {
  const Model m = require_model(
      read(base_model() + "\n[[recharge]]\nrate = [0.001, { file = \"k_3x4.txt\" }]\n"));
  const Recharge& r = m.recharges[0];
  CHECK(r.cells.size() == 12);
  CHECK(r.rate.at(0, 7) == 0.001);
  CHECK(r.rate.at(1, 0) == 1.0);
  CHECK(r.rate.at(1, 11) == 12.0);
}

TEST_CASE("edges follow an irregular active mask", "[reader][accept]") {
  const std::string text =
      edit(base_model(), "origin = [0.0, 0.0]", "active = { file = \"active_3x4.txt\" }") +
      "\n[[fixed_head]]\nname = \"e\"\nedge = \"east\"\nhead = 9.0\n"
      "[[external_head]]\nname = \"n\"\nedge = \"north\"\nhead = 9.0\nconductance = 1.0\n";
  const Model m = require_model(read(text));
  // Row 1 ends at column 3 (column 4 is inactive), rows 2 and 3 at column 4.
  REQUIRE(m.fixed_heads[0].cells.size() == 3);
  CHECK(m.grid.row_col(m.fixed_heads[0].cells[0]) == RowCol{0, 2});
  CHECK(m.grid.row_col(m.fixed_heads[0].cells[1]) == RowCol{1, 3});
  // Column 4 starts in row 2 from the north.
  CHECK(m.grid.row_col(m.external_heads[0].cells[3]) == RowCol{1, 3});
}

TEST_CASE("a river placed by cells takes bed_conductance per cell", "[reader][accept]") {
  const Model m =
      require_model(read(base_model() + "\n[[river]]\ncells = [[2, 2], [2, 3]]\nstage = "
                                        "9.0\nbed_bottom = 8.0\nbed_conductance = 3.0\n"));
  CHECK(m.rivers[0].length == std::vector<double>{1.0, 1.0});
  CHECK(m.rivers[0].conductance.at(0, 1) == 3.0);
}

TEST_CASE("warnings never stop a read and reach Model::warnings", "[reader][accept]") {
  SECTION("stress on fixed-head cells") {
    const auto r = read(
        base_model() +
        "\n[[fixed_head]]\nname = \"f\"\nedge = \"west\"\nhead = 9.0\n"
        "[[drain]]\nname = \"d\"\ncells = [[1, 1], [1, 2]]\nelevation = 8.0\nconductance = 1.0\n");
    const Model m = require_model(r);
    CHECK(has_warning(r, "[[drain]] \"d\"", "1 of its 2 cell(s) are fixed-head cells"));
    CHECK_FALSE(m.warnings.empty());
  }
  SECTION("river polyline partly outside the active cells") {
    // (-10, 15) -> (20, 15): 10 m west of the grid, 20 m inside.
    const auto r = read(base_model() +
                        "\n[[river]]\nname = \"r\"\npolyline = [[-10.0, 15.0], [20.0, 15.0]]\n"
                        "stage = 9.0\nbed_bottom = 8.0\nbed_conductance = 1.0\n");
    const Model m = require_model(r);
    CHECK(
        has_warning(r, "[[river]] \"r\"", "10 m of the polyline's 30 m lie outside active cells"));
    double total = 0.0;
    for (double l : m.rivers[0].length) total += l;
    CHECK(total == Approx(20.0));
  }
  SECTION("implausible K, specific yield and storativity (common practice ranges)") {
    const auto r = read(edit(edit(edit(base_model(), "k = 5.0", "k = 1.0e5"),
                                  "specific_yield = 0.2", "specific_yield = 0.5"),
                             "specific_storage = 1.0e-5", "specific_storage = 1.0e-3"));
    const Model m = require_model(r);
    CHECK(has_warning(r, "[aquifer].k", "common practice"));
    CHECK(has_warning(r, "[aquifer].specific_yield", "0.01..0.35"));
    CHECK(has_warning(r, "[aquifer]", "storativity"));  // S = 1e-3 x 10 = 1e-2
    CHECK(m.warnings.size() == 3);
  }
  SECTION("K range converted to the model's units") {
    // 1e-3 ft/s = 1e-3 x 0.3048 x 86400 m/d = 26.3 m/d: plausible; 1 ft/s = 26334 m/d: not.
    const std::string feet = edit(edit(base_model(), "length_unit = \"m\"", "length_unit = \"ft\""),
                                  "time_unit = \"d\"", "time_unit = \"s\"");
    CHECK(require_model(read(edit(feet, "k = 5.0", "k = 1.0e-3"))).warnings.empty());
    CHECK(has_warning(read(edit(feet, "k = 5.0", "k = 1.0")), "[aquifer].k", "ft/s"));
  }
}

TEST_CASE("diagnostic text layout", "[reader][accept]") {
  Diagnostic d{Severity::error, "a/model.toml", 12, 5, "[aquifer].k", "value -1; expected > 0 m/d"};
  CHECK(d.to_string() == "a/model.toml:12:5: error: [aquifer].k: value -1; expected > 0 m/d");
  d.line = 0;
  d.severity = Severity::warning;
  CHECK(d.to_string() == "a/model.toml: warning: [aquifer].k: value -1; expected > 0 m/d");
}
