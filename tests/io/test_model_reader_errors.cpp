// Bad inputs: each must be refused with a message naming the key and the problem (and the
// line where the TOML parser gives one). The rules come from the format contract
// (/work/shared/model-format.md) and docs/model-format.md, cited per group.
#include "tests/io/reader_test_support.hpp"

using namespace reader_test;

namespace {
void expect_rejected(const std::string& text, const std::string& key,
                     std::initializer_list<std::string> fragments, int line = 0) {
  const auto r = read(text);
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK_FALSE(r.model.has_value());
  CHECK(has_error(r, key, fragments, line));
}
const std::string base = base_model();
}  // namespace

TEST_CASE("reader accepts the small base model", "[reader][errors]") {
  const auto r = read(base);
  INFO(all_messages(r));
  REQUIRE(r.ok());
}

// --- TOML syntax, keys and types (contract: "reject everything else with a clear message") ---
TEST_CASE("bad 01: TOML syntax error gives line and column", "[reader][errors]") {
  const std::string text = edit(base, "[aquifer]", "[aquifer");
  const auto r = read(text);
  INFO(all_messages(r));
  REQUIRE(r.diagnostics.size() == 1);
  CHECK(r.diagnostics[0].message.find("TOML syntax") != std::string::npos);
  CHECK(r.diagnostics[0].line == line_of(text, "[aquifer"));
}
TEST_CASE("bad 02: unknown top-level section with a suggestion", "[reader][errors]") {
  const std::string text = base + "\n[solvr]\nthreads = 1\n";
  expect_rejected(text, "(top level).solvr", {"unknown key", "did you mean 'solver'"},
                  line_of(text, "[solvr]"));
}
TEST_CASE("bad 03: misspelt aquifer key with a suggestion", "[reader][errors]") {
  const std::string text = edit(base, "specific_yield = 0.2", "specific_yeild = 0.2");
  expect_rejected(text, "[aquifer].specific_yeild", {"did you mean 'specific_yield'"},
                  line_of(text, "specific_yeild"));
}
TEST_CASE("bad 04: misspelt well key with a suggestion", "[reader][errors]") {
  const std::string text =
      base + "\n[[well]]\nname = \"w\"\nx = 15.0\ny = 15.0\npumping_rat = 1.0\n";
  expect_rejected(text, "[[well]] \"w\".pumping_rat", {"did you mean 'pumping_rate'"},
                  line_of(text, "pumping_rat"));
}
TEST_CASE("bad 05: wrong type, a string for k", "[reader][errors]") {
  const std::string text = edit(base, "k = 5.0", "k = \"high\"");
  expect_rejected(text, "[aquifer].k", {"expected a field value", "string", "\"high\""},
                  line_of(text, "k = \"high\""));
}
TEST_CASE("bad 06: wrong type, a fraction for nrow", "[reader][errors]") {
  const std::string text = edit(base, "nrow = 3", "nrow = 3.5");
  expect_rejected(text, "[grid].nrow", {"expected an integer", "3.5"}, line_of(text, "nrow = 3.5"));
}
TEST_CASE("bad 07: missing required key bottom", "[reader][errors]") {
  expect_rejected(edit(base, "bottom = 0.0\n", ""), "[aquifer].bottom", {"missing required key"});
}
TEST_CASE("bad 08: missing [grid] section", "[reader][errors]") {
  std::string text = base;
  text.erase(text.find("[grid]"), text.find("[aquifer]") - text.find("[grid]"));
  expect_rejected(text, "[grid]", {"missing required section"});
}
TEST_CASE("bad 09: no [[period]]", "[reader][errors]") {
  std::string text = base.substr(0, base.find("[[period]]"));
  expect_rejected(text, "[[period]]", {"at least one [[period]]"});
}
TEST_CASE("bad 10: [[well]] written as a plain table", "[reader][errors]") {
  const std::string text = base + "\n[well]\nx = 15.0\ny = 15.0\npumping_rate = 1.0\n";
  expect_rejected(text, "[[well]]", {"array of tables", "double brackets"});
}

// --- aquifer values (contract [aquifer]; physical ranges) ---
TEST_CASE("bad 11: k = 0", "[reader][errors]") {
  const std::string text = edit(base, "k = 5.0", "k = 0.0");
  expect_rejected(text, "[aquifer].k", {"value 0", "> 0 m/d"}, line_of(text, "k = 0.0"));
}
TEST_CASE("bad 12: negative k in an array file names the file line", "[reader][errors]") {
  const auto r = read(edit(base, "k = 5.0", "k = { file = \"k_negative.txt\" }"));
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  bool found = false;
  for (const auto& d : r.diagnostics)
    found = found || (d.key == "[aquifer].k" && d.file.filename() == "k_negative.txt" &&
                      d.line == 2 && d.message.find("-7") != std::string::npos &&
                      d.message.find("row 2, column 3") != std::string::npos);
  CHECK(found);
}
TEST_CASE("bad 13: top not above bottom", "[reader][errors]") {
  expect_rejected(edit(base, "top = 10.0", "top = -1.0"), "[aquifer].top",
                  {"top above bottom", "-1"});
}
TEST_CASE("bad 14: specific yield above 1", "[reader][errors]") {
  expect_rejected(edit(base, "specific_yield = 0.2", "specific_yield = 1.2"),
                  "[aquifer].specific_yield", {"1.2", "(0, 1)"});
}
TEST_CASE("bad 15: specific yield of zero", "[reader][errors]") {
  expect_rejected(edit(base, "specific_yield = 0.2", "specific_yield = 0"),
                  "[aquifer].specific_yield", {"value 0", "(0, 1)"});
}
TEST_CASE("bad 16: negative specific storage", "[reader][errors]") {
  expect_rejected(edit(base, "specific_storage = 1.0e-5", "specific_storage = -1.0e-5"),
                  "[aquifer].specific_storage", {"-1e-05", ">= 0 1/m"});
}
TEST_CASE("bad 17: negative storativity", "[reader][errors]") {
  expect_rejected(edit(base, "specific_storage = 1.0e-5", "storativity = -1.0e-4"),
                  "[aquifer].storativity", {"-1e-04", ">= 0"});
}
TEST_CASE("bad 18: two storage inputs at once", "[reader][errors]") {
  expect_rejected(
      edit(base, "specific_storage = 1.0e-5", "specific_storage = 1.0e-5\nstorativity = 1.0e-4"),
      "[aquifer].storativity", {"one storage input", "specific_storage and storativity"});
}
TEST_CASE("bad 19: specific yield missing for a switching aquifer", "[reader][errors]") {
  expect_rejected(edit(base, "specific_yield = 0.2\n", ""), "[aquifer].specific_yield",
                  {"missing required key"});
}
TEST_CASE("bad 20: top missing for a confined aquifer", "[reader][errors]") {
  std::string text =
      edit(edit(base, "top = 10.0\n", ""), "condition = \"switching\"", "condition = \"confined\"");
  expect_rejected(text, "[aquifer].top", {"missing required key"});
}
TEST_CASE("bad 21: unknown condition lists the allowed values", "[reader][errors]") {
  const std::string text = edit(base, "condition = \"switching\"", "condition = \"switch\"");
  expect_rejected(text, "[aquifer].condition",
                  {"\"switch\"", "confined, water_table, switching", "did you mean \"switching\""},
                  line_of(text, "condition ="));
}
TEST_CASE("bad 22: transient confined model without storage", "[reader][errors]") {
  std::string text = edit(edit(base, "specific_storage = 1.0e-5\n", ""),
                          "condition = \"switching\"", "condition = \"confined\"");
  expect_rejected(text, "[aquifer].specific_storage", {"missing storage input", "storativity"});
}
TEST_CASE("bad 23: compressibility porosity out of range", "[reader][errors]") {
  expect_rejected(edit(base, "specific_storage = 1.0e-5",
                       "compressibility = { skeleton = 1.0e-8, porosity = 1.5 }"),
                  "[aquifer].compressibility.porosity", {"1.5", "(0, 1)"});
}
TEST_CASE("bad 24: compressibility key misspelt", "[reader][errors]") {
  expect_rejected(edit(base, "specific_storage = 1.0e-5",
                       "compressibility = { skeletn = 1.0e-8, porosity = 0.3 }"),
                  "[aquifer].compressibility.skeletn", {"did you mean 'skeleton'"});
}

// --- initial state ---
TEST_CASE("bad 25: initial head missing and not steady", "[reader][errors]") {
  expect_rejected(edit(base, "head = 9.0", "# no head"), "[initial].head",
                  {"missing required key"});
}
TEST_CASE("bad 26: initial head and steady together", "[reader][errors]") {
  expect_rejected(edit(base, "head = 9.0", "head = 9.0\nsteady = true"), "[initial].head",
                  {"either head or steady"});
}

// A steady state needs a set level somewhere: without one, the heads of a closed aquifer with
// recharge never settle, and without any stress every constant head is a solution (the
// Neumann problem of the flow equation fixes the head only up to a constant; a fact of the
// trade, e.g. Bear, Hydraulics of Groundwater, 1979, on boundary conditions, from memory).
TEST_CASE("bad 26a: a steady state in a model with no set level anywhere", "[reader][errors]") {
  const std::string steady_period = edit(base, "steps = 2", "steps = 1\nsteady = true");
  expect_rejected(steady_period, "[[period]] \"first\".steady",
                  {"a steady state needs somewhere water leaves or enters at a set level"},
                  line_of(steady_period, "steady = true"));
  const std::string steady_start = edit(base, "head = 9.0", "steady = true");
  expect_rejected(steady_start, "[initial].steady", {"[[fixed_head]]", "make the period transient"},
                  line_of(steady_start, "steady = true"));
  // One fixed-head edge is enough; so is a drain.
  for (const std::string feature :
       {"[[fixed_head]]\nname = \"lake\"\nedge = \"west\"\nhead = 8.0\n",
        "[[drain]]\nname = \"tiles\"\ncells = [[1, 1]]\nelevation = 8.0\nconductance = 5.0\n"}) {
    const auto r = read(steady_period + "\n" + feature);
    INFO(all_messages(r));
    CHECK(r.ok());
  }
}

// --- periods (contract [[period]]) ---
TEST_CASE("bad 27: steps below 1", "[reader][errors]") {
  const std::string text = edit(base, "steps = 2", "steps = 0");
  expect_rejected(text, "[[period]] \"first\".steps", {"value 0", "from 1"},
                  line_of(text, "steps = 0"));
}
TEST_CASE("bad 28: growth not positive", "[reader][errors]") {
  const std::string text = edit(base, "growth = 1.5", "growth = -1.5");
  expect_rejected(text, "[[period]] \"second\".growth", {"-1.5", "> 0"},
                  line_of(text, "growth = -1.5"));
}
TEST_CASE("bad 29: period length not positive", "[reader][errors]") {
  const std::string text = edit(base, "length = 10.0", "length = 0.0");
  expect_rejected(text, "[[period]] \"first\".length", {"value 0", "> 0 d"},
                  line_of(text, "length = 0.0"));
}
TEST_CASE("bad 30: absurd step count is refused", "[reader][errors]") {
  expect_rejected(edit(base, "steps = 4", "steps = 50000000"), "[[period]] \"second\".steps",
                  {"50000000", "1000000"});
}
TEST_CASE("bad 31: duplicate period names", "[reader][errors]") {
  expect_rejected(edit(base, "name = \"second\"", "name = \"first\""), "[[period]] \"first\".name",
                  {"duplicate name \"first\""});
}

// --- per-period values (contract "Time-varying values") ---
TEST_CASE("bad 32: per-period array of the wrong length", "[reader][errors]") {
  const std::string text =
      base + "\n[[well]]\nname = \"w\"\nx = 15.0\ny = 15.0\npumping_rate = [1.0, 2.0, 3.0]\n";
  expect_rejected(text, "[[well]] \"w\".pumping_rate", {"3 entries", "one per period (2 periods)"},
                  line_of(text, "pumping_rate"));
}

// --- array files (contract "Conventions" and "Field values") ---
TEST_CASE("bad 33: array file missing", "[reader][errors]") {
  expect_rejected(edit(base, "k = 5.0", "k = { file = \"no_such_file.txt\" }"), "[aquifer].k",
                  {"cannot open", "no_such_file.txt"});
}
TEST_CASE("bad 34: array file with a short line", "[reader][errors]") {
  const auto r = read(edit(base, "k = 5.0", "k = { file = \"short_line.txt\" }"));
  INFO(all_messages(r));
  CHECK(has_error(r, "[aquifer].k", {"3 values", "ncol = 4"}, 2));
}
TEST_CASE("bad 35: array file with too few rows", "[reader][errors]") {
  expect_rejected(edit(base, "k = 5.0", "k = { file = \"few_rows.txt\" }"), "[aquifer].k",
                  {"2 rows", "nrow = 3"});
}
TEST_CASE("bad 36: array file with NaN", "[reader][errors]") {
  const auto r = read(edit(base, "k = 5.0", "k = { file = \"nan.txt\" }"));
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, "[aquifer].k", {"'nan'", "not a finite number"}, 2));
}
TEST_CASE("bad 37: array file with text", "[reader][errors]") {
  const auto r = read(edit(base, "k = 5.0", "k = { file = \"text.txt\" }"));
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, "[aquifer].k", {"not a number", "'ten'"}, 3));
}
TEST_CASE("bad 38: zone with no value", "[reader][errors]") {
  expect_rejected(
      edit(base, "k = 5.0", "k = { zones = \"zones_3x4.txt\", values = { 1 = 5.0, 2 = 8.0 } }"),
      "[aquifer].k.values", {"zone 3", "4 active cell(s)", "no value"});
}
TEST_CASE("bad 39: zone key that is not a number", "[reader][errors]") {
  expect_rejected(
      edit(base, "k = 5.0",
           "k = { zones = \"zones_3x4.txt\", values = { 1 = 5.0, two = 8.0, 3 = 1.0 } }"),
      "[aquifer].k.values", {"'two'", "not an integer zone number"});
}
TEST_CASE("bad 40: raster with the wrong ncols", "[reader][errors]") {
  expect_rejected(edit(base, "k = 5.0", "k = { file = \"raster_bad_ncols.asc\" }"), "[aquifer].k",
                  {"raster header does not match", "ncols 5", "ncol 4"});
}
TEST_CASE("bad 41: raster at the wrong place", "[reader][errors]") {
  expect_rejected(edit(base, "k = 5.0", "k = { file = \"raster_offset.asc\" }"), "[aquifer].k",
                  {"raster header does not match", "lower-left corner (100, 0)", "origin (0, 0)"});
}
TEST_CASE("bad 42: raster on a grid of other cell sizes", "[reader][errors]") {
  expect_rejected(edit(edit(base, "k = 5.0", "k = { file = \"raster_3x4.asc\" }"), "dx = 10.0",
                       "dx = [10.0, 10.0, 10.0, 20.0]"),
                  "[aquifer].k", {"cellsize 10", "uniform grid"});
}
TEST_CASE("bad 43: raster NODATA in an active cell", "[reader][errors]") {
  expect_rejected(edit(base, "k = 5.0", "k = { file = \"raster_nodata_active.asc\" }"),
                  "[aquifer].k", {"NODATA", "row 2, column 2"});
}

// --- grid ---
TEST_CASE("bad 44: dx array of the wrong length", "[reader][errors]") {
  const std::string text = edit(base, "dx = 10.0", "dx = [10.0, 10.0]");
  expect_rejected(text, "[grid].dx", {"2 values", "ncol = 4"}, line_of(text, "dx = [10.0"));
}
TEST_CASE("bad 45: dy with a non-positive entry", "[reader][errors]") {
  expect_rejected(edit(base, "dy = 10.0", "dy = [10.0, 0.0, 10.0]"), "[grid].dy",
                  {"value 0", "entry 2", "> 0 m"});
}
TEST_CASE("bad 46: active mask value other than 0 or 1", "[reader][errors]") {
  expect_rejected(edit(base, "origin = [0.0, 0.0]", "active = { file = \"active_bad.txt\" }"),
                  "[grid].active", {"value 2", "row 1, column 4", "1 (active) or 0"});
}
TEST_CASE("bad 47: grid too large for this machine's memory", "[reader][errors]") {
  // 2e9 cells at ~1 KiB each are about 1.9 TiB, beyond any machine this runs on.
  const auto r = read(edit(edit(base, "nrow = 3", "nrow = 100000"), "ncol = 4", "ncol = 20000"));
  INFO(all_messages(r));
  CHECK(has_error(r, "[grid].nrow", {"2000000000 cells", "GiB", "memory is usable"}));
}
TEST_CASE("bad 48: unknown length unit", "[reader][errors]") {
  expect_rejected(edit(base, "length_unit = \"m\"", "length_unit = \"meters\""),
                  "[model].length_unit", {"\"meters\"", "m, ft"});
}
TEST_CASE("bad 49: unknown time unit", "[reader][errors]") {
  expect_rejected(edit(base, "time_unit = \"d\"", "time_unit = \"days\""), "[model].time_unit",
                  {"\"days\"", "s, min, h, d, yr"});
}

// --- placements (contract [[well]], [[fixed_head]], [[river]], [[observation]]) ---
const std::string well = "\n[[well]]\nname = \"w\"\nx = 15.0\ny = 15.0\npumping_rate = 1.0\n";
TEST_CASE("bad 50: well outside the grid", "[reader][errors]") {
  const std::string text = base + edit(well, "x = 15.0", "x = 55.0");
  expect_rejected(text, "[[well]] \"w\".x", {"(55, 15)", "outside the grid", "x 0..40"},
                  line_of(text, "x = 55.0"));
}
TEST_CASE("bad 51: well in an inactive cell", "[reader][errors]") {
  const std::string text =
      edit(base, "origin = [0.0, 0.0]", "active = { file = \"active_3x4.txt\" }") +
      edit(edit(well, "x = 15.0", "x = 35.0"), "y = 15.0", "y = 25.0");
  expect_rejected(text, "[[well]] \"w\".x", {"inactive cell", "row 1, column 4"});
}
TEST_CASE("bad 52: observation outside the grid", "[reader][errors]") {
  expect_rejected(base + "\n[[observation]]\nname = \"o\"\nx = 5.0\ny = -3.0\n",
                  "[[observation]] \"o\".x", {"outside the grid"});
}
TEST_CASE("bad 53: observation in an inactive cell", "[reader][errors]") {
  expect_rejected(edit(base, "origin = [0.0, 0.0]", "active = { file = \"active_3x4.txt\" }") +
                      "\n[[observation]]\nname = \"o\"\nx = 39.0\ny = 29.0\n",
                  "[[observation]] \"o\".x", {"inactive cell"});
}
const std::string river =
    "\n[[river]]\nname = \"r\"\npolyline = [[5.0, 5.0], [35.0, 25.0]]\nstage = 9.5\nbed_bottom = "
    "8.0\nbed_conductance = 2.0\n";
TEST_CASE("bad 54: polyline that crosses no active cell", "[reader][errors]") {
  expect_rejected(base + edit(river, "[[5.0, 5.0], [35.0, 25.0]]", "[[50.0, 5.0], [80.0, 25.0]]"),
                  "[[river]] \"r\".polyline", {"crosses no active cell"});
}
TEST_CASE("bad 55: feature whose mask has no cells", "[reader][errors]") {
  expect_rejected(base +
                      "\n[[drain]]\nname = \"d\"\nmask = { file = \"mask_empty.txt\" }\nelevation "
                      "= 8.0\nconductance = 1.0\n",
                  "[[drain]] \"d\".mask", {"names no active cell"});
}
TEST_CASE("bad 56: duplicate well names", "[reader][errors]") {
  expect_rejected(base + well + well, "[[well]] \"w\".name", {"duplicate name \"w\""});
}
TEST_CASE("bad 57: cell outside the grid in a cells list", "[reader][errors]") {
  expect_rejected(base + "\n[[fixed_head]]\nname = \"f\"\ncells = [[1, 1], [4, 1]]\nhead = 9.0\n",
                  "[[fixed_head]] \"f\".cells", {"[4, 1]", "outside the grid", "rows 1..3"});
}
TEST_CASE("bad 58: inactive cell in a cells list", "[reader][errors]") {
  expect_rejected(edit(base, "origin = [0.0, 0.0]", "active = { file = \"active_3x4.txt\" }") +
                      "\n[[fixed_head]]\nname = \"f\"\ncells = [[1, 4]]\nhead = 9.0\n",
                  "[[fixed_head]] \"f\".cells", {"[1, 4]", "inactive"});
}
TEST_CASE("bad 59: two placements at once", "[reader][errors]") {
  expect_rejected(
      base + "\n[[fixed_head]]\nname = \"f\"\nedge = \"west\"\ncells = [[1, 1]]\nhead = 9.0\n",
      "[[fixed_head]] \"f\"", {"one placement", "edge, cells"});
}
TEST_CASE("bad 60: unknown edge name", "[reader][errors]") {
  expect_rejected(base + "\n[[fixed_head]]\nname = \"f\"\nedge = \"left\"\nhead = 9.0\n",
                  "[[fixed_head]] \"f\".edge", {"\"left\"", "north, south, east, west"});
}
TEST_CASE("bad 61: a cell held by two fixed heads", "[reader][errors]") {
  expect_rejected(base +
                      "\n[[fixed_head]]\nname = \"f\"\nedge = \"west\"\nhead = "
                      "9.0\n[[fixed_head]]\nname = \"g\"\ncells = [[2, 1]]\nhead = 8.0\n",
                  "[[fixed_head]] \"g\"", {"row 2, column 1", "already held"});
}
TEST_CASE("bad 62: river without bed conductance", "[reader][errors]") {
  expect_rejected(base + edit(river, "bed_conductance = 2.0\n", ""),
                  "[[river]] \"r\".bed_conductance",
                  {"missing required key", "bed = { k, thickness, width }"});
}
TEST_CASE("bad 63: drain with negative conductance", "[reader][errors]") {
  expect_rejected(
      base + "\n[[drain]]\nname = \"d\"\ncells = [[2, 2]]\nelevation = 8.0\nconductance = -1.0\n",
      "[[drain]] \"d\".conductance", {"value -1", ">= 0 m2/d"});
}
TEST_CASE("bad 64: evapotranspiration with zero extinction depth", "[reader][errors]") {
  expect_rejected(base +
                      "\n[[evapotranspiration]]\nname = \"e\"\nsurface = 9.5\nmax_rate = "
                      "0.001\nextinction_depth = 0.0\n",
                  "[[evapotranspiration]] \"e\".extinction_depth", {"value 0", "> 0 m"});
}
TEST_CASE("bad 65: leakage in a model without a top", "[reader][errors]") {
  std::string text = edit(edit(base, "top = 10.0\n", ""), "condition = \"switching\"",
                          "condition = \"water_table\"");
  expect_rejected(text + "\n[leakage]\nsource_head = 12.0\nleakance = 1.0e-4\n", "[leakage]",
                  {"needs [aquifer].top"});
}
TEST_CASE("bad 66: measured-head file with a bad line", "[reader][errors]") {
  const auto r =
      read(base +
           "\n[[observation]]\nname = \"o\"\nx = 5.0\ny = 5.0\nmeasured = \"measured_bad.csv\"\n");
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, "[[observation]] \"o\".measured", {"two numbers time,head", "5.0,high"}, 3));
}
TEST_CASE("bad 67: measured-head file missing", "[reader][errors]") {
  expect_rejected(
      base + "\n[[observation]]\nname = \"o\"\nx = 5.0\ny = 5.0\nmeasured = \"nowhere.csv\"\n",
      "[[observation]] \"o\".measured", {"cannot open", "nowhere.csv"});
}

// --- settings ---
TEST_CASE("bad 68: unknown field cadence", "[reader][errors]") {
  expect_rejected(base + "\n[output]\nfields = \"sometimes\"\n", "[output].fields",
                  {"\"sometimes\"", "every_step, period_end, none"});
}
TEST_CASE("bad 69: unknown linear solver", "[reader][errors]") {
  expect_rejected(base + "\n[solver]\nlinear = \"gmres\"\n", "[solver].linear",
                  {"\"gmres\"", "auto, direct, pcg, bicgstab"});
}
TEST_CASE("bad 70: non-positive head tolerance", "[reader][errors]") {
  expect_rejected(base + "\n[solver]\nhead_tolerance = 0.0\n", "[solver].head_tolerance",
                  {"value 0", "> 0 m"});
}

TEST_CASE("bad 70a: unknown face thickness scheme", "[reader][errors]") {
  expect_rejected(base + "\n[solver]\nface_thickness = \"harmonic\"\n", "[solver].face_thickness",
                  {"\"harmonic\"", "mean, upstream"});
}
TEST_CASE("face thickness: mean by default, upstream on request", "[reader][accept]") {
  const auto plain = read(base);
  REQUIRE(plain.model.has_value());
  CHECK(plain.model->solver.face_thickness == aquiledger::FaceThickness::mean);
  const auto upstream = read(base + "\n[solver]\nface_thickness = \"upstream\"\n");
  INFO(all_messages(upstream));
  REQUIRE(upstream.model.has_value());
  CHECK(upstream.model->solver.face_thickness == aquiledger::FaceThickness::upstream);
}

// --- all errors together: a user fixes a file in one pass, not one error per run ---
TEST_CASE("bad 71: every error of a file is reported in one read", "[reader][errors]") {
  std::string text = edit(edit(edit(base, "k = 5.0", "k = -5.0"), "steps = 2", "steps = 0"),
                          "specific_yield = 0.2", "specific_yield = 2.0");
  const auto r = read(text + "\n[solver]\nlinear = \"gmres\"\n");
  INFO(all_messages(r));
  CHECK(has_error(r, "[aquifer].k", {"-5"}));
  CHECK(has_error(r, "[[period]] \"first\".steps", {"value 0"}));
  CHECK(has_error(r, "[aquifer].specific_yield", {"value 2"}));
  CHECK(has_error(r, "[solver].linear", {"gmres"}));
}
