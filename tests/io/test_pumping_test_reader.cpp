// The pumping-test file reader: a good file is read whole (inline series, water levels, a CSV
// series); each bad input is refused with the file, the line and the key path.
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <string>

#include "io/model_file/pumping_test_reader.hpp"

using namespace aquiledger;

namespace {

const std::string good = R"([test]
title = "invented test"
length_unit = "m"
time_unit = "min"

[[pumping]]
time = 0.0
rate = 2.5

[[pumping]]
time = 100.0
rate = 0.0

[[well]]
name = "east piezometer"
distance = 12.0
times = [1.0, 2.0, 5.0, 10.0, 120.0]
drawdowns = [0.1, 0.2, 0.3, 0.4, 0.1]

[[well]]
name = "west piezometer"
distance = 30.0
radius = 0.05
static_level = 10.0
times = [1.0, 2.0, 5.0, 10.0]
water_levels = [9.95, 9.9, 9.8, 9.7]
)";

std::string replace(std::string text, const std::string& from, const std::string& to) {
  const auto at = text.find(from);
  REQUIRE(at != std::string::npos);
  return text.replace(at, from.size(), to);
}

int line_of(const std::string& text, const std::string& fragment) {
  const auto at = text.find(fragment);
  return 1 + static_cast<int>(std::count(text.begin(), text.begin() + static_cast<long>(at), '\n'));
}

/// The read refuses the text with an error at `line` whose key is `key`, naming the file.
void expect_error(const std::string& text, const std::string& key, int line,
                  const std::string& fragment) {
  const PumpingTestReadResult r = read_pumping_test_text(text, "/invented/test.toml");
  CHECK_FALSE(r.test.has_value());
  bool found = false;
  std::string all;
  for (const Diagnostic& d : r.diagnostics) {
    all += d.to_string() + "\n";
    if (d.severity == Severity::error && d.key == key && d.line == line &&
        d.message.find(fragment) != std::string::npos &&
        d.to_string().find("/invented/test.toml:" + std::to_string(line)) == 0)
      found = true;
  }
  INFO(all);
  CHECK(found);
}

/// `base` with `from` replaced by `to` is refused with an error at `key`, on the line that holds
/// `at` in the replaced text, whose message holds `fragment`.
void expect_replaced_error(const std::string& base, const std::string& from, const std::string& to,
                           const std::string& key, const std::string& at,
                           const std::string& fragment) {
  const std::string t = replace(base, from, to);
  expect_error(t, key, line_of(t, at), fragment);
}

}  // namespace

TEST_CASE("a good test file is read whole", "[pumping_test_reader]") {
  const PumpingTestReadResult r = read_pumping_test_text(good, "/invented/test.toml");
  REQUIRE(r.test.has_value());
  const PumpingTest& t = *r.test;
  CHECK(t.title == "invented test");
  CHECK(t.time_unit == "min");
  REQUIRE(t.schedule.size() == 2);
  CHECK(t.schedule[1].start == 100.0);
  CHECK(t.schedule[1].rate == 0.0);
  REQUIRE(t.wells.size() == 2);
  CHECK(t.wells[0].drawdowns[3] == 0.4);
  CHECK(t.wells[1].radius == 0.05);
  // Water levels become drawdowns below the static level.
  CHECK(t.wells[1].drawdowns[3] == Approx(0.3));
}

TEST_CASE("the pumped well's radii for the large-diameter model", "[pumping_test_reader]") {
  {
    const std::string t =
        replace(good, "[[pumping]]", "[pumped_well]\nradius = 0.6\n\n[[pumping]]");
    const PumpingTestReadResult r = read_pumping_test_text(t, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    CHECK(r.test->pumped_well.well == 0.6);
    CHECK(r.test->pumped_well.casing == 0.6);  // the casing radius defaults to the well's
  }
  {
    const std::string t = replace(
        good, "[[pumping]]", "[pumped_well]\nradius = 0.6\ncasing_radius = 0.4\n\n[[pumping]]");
    const PumpingTestReadResult r = read_pumping_test_text(t, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    CHECK(r.test->pumped_well.casing == 0.4);
  }
  expect_replaced_error(good, "[[pumping]]",
                        "[pumped_well]\nradius = 0.6\ncasing_radius = 0.0\n\n[[pumping]]",
                        "[pumped_well].casing_radius", "casing_radius", "radius > 0");
  expect_replaced_error(good, "[[pumping]]", "[pumped_well]\ncasing_radius = 0.4\n\n[[pumping]]",
                        "[pumped_well].radius", "[pumped_well]", "missing");
}

TEST_CASE("the aquifer's geometry for the numerical model", "[pumping_test_reader]") {
  {
    const std::string t =
        replace(good, "[[pumping]]",
                "[aquifer]\ntop = -5.0\nbottom = -40.0\nstatic_level = 2.5\n\n[[pumping]]");
    const PumpingTestReadResult r = read_pumping_test_text(t, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    REQUIRE(r.test->aquifer.has_value());
    CHECK(r.test->aquifer->has_top);
    CHECK(r.test->aquifer->top == -5.0);
    CHECK(r.test->aquifer->bottom == -40.0);
    CHECK(r.test->aquifer->static_level == 2.5);
    CHECK(r.test->aquifer->starts_confined());
    CHECK(r.test->aquifer->thickness() == 35.0);
  }
  {
    const std::string t = replace(good, "[[pumping]]",
                                  "[aquifer]\nbottom = -40.0\nstatic_level = 2.5\n\n[[pumping]]");
    const PumpingTestReadResult r = read_pumping_test_text(t, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    CHECK_FALSE(r.test->aquifer->has_top);
    CHECK_FALSE(r.test->aquifer->starts_confined());
    CHECK(r.test->aquifer->thickness() == 42.5);  // water table: static level - bottom
  }
  expect_replaced_error(good, "[[pumping]]",
                        "[aquifer]\nbottom = 4.0\nstatic_level = 2.5\n\n[[pumping]]",
                        "[aquifer].static_level", "static_level = 2.5", "above the");
  expect_replaced_error(good, "[[pumping]]",
                        "[aquifer]\ntop = -50.0\nbottom = -40.0\nstatic_level = 2.5\n\n[[pumping]]",
                        "[aquifer].top", "top = -50.0", "above the");
  expect_replaced_error(good, "[[pumping]]", "[aquifer]\nstatic_level = 2.5\n\n[[pumping]]",
                        "[aquifer].bottom", "[aquifer]", "missing");
  {
    const std::string t =
        replace(good, "[[pumping]]",
                "[aquifer]\nbottom = 0.0\nstatic_level = 2.5\nthickness = 3.0\n\n[[pumping]]");
    const PumpingTestReadResult r = read_pumping_test_text(t, "/invented/test.toml");
    CHECK_FALSE(r.test.has_value());
  }
}

TEST_CASE("a series read from a CSV file", "[pumping_test_reader]") {
  const auto folder = std::filesystem::temp_directory_path() / "aquiledger-pumping-reader";
  std::filesystem::create_directories(folder);
  std::ofstream(folder / "ow.csv") << "time,water_level\n1,4.9\n2,4.8\n4,4.7\n8,4.6\n";
  std::string text = good.substr(0, good.find("[[well]]"));
  text +=
      "[[well]]\nname = \"ow\"\ndistance = 5.0\nstatic_level = 5.0\n"
      "series = { file = \"ow.csv\" }\n";
  const PumpingTestReadResult r = read_pumping_test_text(text, folder / "test.toml");
  REQUIRE(r.test.has_value());
  REQUIRE(r.test->wells[0].drawdowns.size() == 4);
  CHECK(r.test->wells[0].drawdowns[3] == Approx(0.4));
  std::filesystem::remove_all(folder);
}

TEST_CASE("bad test files give file, line and key", "[pumping_test_reader]") {
  expect_replaced_error(good, "distance = 12.0", "distance = -12.0",
                        "[[well]] \"east piezometer\".distance", "distance = -12.0",
                        "distance > 0");
  expect_replaced_error(good, "time = 100.0", "time = -1.0", "[[pumping]] #2.time", "time = -1.0",
                        "after the previous");
  expect_replaced_error(
      good, "drawdowns = [0.1, 0.2, 0.3, 0.4, 0.1]", "drawdowns = [0.1, 0.2, 0.3, 0.4]",
      "[[well]] \"east piezometer\".drawdowns", "drawdowns = [0.1", "as many values as times");
  expect_replaced_error(good, "radius = 0.05", "radios = 0.05",
                        "[[well]] \"west piezometer\".radios", "radios", "did you mean 'radius'");
  expect_replaced_error(good, "time_unit = \"min\"", "time_unit = \"min\"\nmodel = \"thies\"",
                        "[test].model", "model =", "expected one of");
  expect_replaced_error(good, "static_level = 10.0\n", "",
                        "[[well]] \"west piezometer\".static_level", "[[well]]\nname = \"west",
                        "missing");
}

TEST_CASE("times as dates since the stated start of pumping", "[pumping_test_reader]") {
  // Calendar facts: 2028 is a leap year (divisible by 4, not by 100), so 2028-02-28T12:00 to
  // 2028-03-01T12:00 is 2 days; 08:00+02:00 is 06:00 UTC (ISO 8601).
  const std::string dated = R"([test]
time_unit = "min"
pumping_started = 2028-02-28T12:00:00

[[pumping]]
time = 2028-02-28T12:00:00
rate = 2.5

[[pumping]]
time = "2028-03-01T12:00"
rate = 0.0

[[well]]
name = "east piezometer"
distance = 12.0
times = [2028-02-28T12:01:00, "2028-02-28 12:02:30", 5.0, 2028-03-01T12:00:00.5]
drawdowns = [0.1, 0.2, 0.3, 0.4]
)";
  {
    const PumpingTestReadResult r = read_pumping_test_text(dated, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    CHECK(r.test->schedule[0].start == 0.0);
    CHECK(r.test->schedule[1].start == Approx(2.0 * 1440.0));
    const std::vector<double>& t = r.test->wells[0].times;
    CHECK(t[0] == Approx(1.0));
    CHECK(t[1] == Approx(2.5));
    CHECK(t[2] == 5.0);  // a number is a time since the start already
    CHECK(t[3] == Approx(2.0 * 1440.0 + 0.5 / 60.0));
  }
  {
    // Offsets: 06:30Z is 30 minutes after 08:00+02:00.
    std::string t = replace(dated, "pumping_started = 2028-02-28T12:00:00",
                            "pumping_started = 2028-02-28T08:00:00+02:00");
    t = replace(t, "time = 2028-02-28T12:00:00", "time = 2028-02-28T06:30:00Z");
    t = replace(t, "time = \"2028-03-01T12:00\"", "time = 2028-02-28T07:00:00Z");
    t = replace(t,
                "times = [2028-02-28T12:01:00, \"2028-02-28 12:02:30\", 5.0, "
                "2028-03-01T12:00:00.5]",
                "times = [31.0, 32.0, 33.0, 34.0]");
    const PumpingTestReadResult r = read_pumping_test_text(t, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    CHECK(r.test->schedule[0].start == Approx(30.0));
    CHECK(r.test->schedule[1].start == Approx(60.0));
  }
  expect_replaced_error(dated, "pumping_started = 2028-02-28T12:00:00\n", "", "[[pumping]] #1.time",
                        "time = 2028-02-28T12:00:00", "pumping_started");
  expect_replaced_error(dated, "time = \"2028-03-01T12:00\"", "time = \"2028-03-01T12:00Z\"",
                        "[[pumping]] #2.time", "time = \"2028-03-01T12:00Z\"", "UTC offset");
  expect_replaced_error(dated, "\"2028-02-28 12:02:30\"", "\"28/02/2028 12:02\"",
                        "[[well]] \"east piezometer\".times[1]", "times = [", "a date and time");
}

TEST_CASE("a CSV series with dates", "[pumping_test_reader]") {
  const auto folder = std::filesystem::temp_directory_path() / "aquiledger-pumping-dates";
  std::filesystem::create_directories(folder);
  std::ofstream(folder / "ow.csv") << "time,drawdown\n2026-05-12T08:01:00,0.1\n"
                                      "2026-05-12T08:02:00,0.2\n2026-05-12T08:04:00,0.3\n"
                                      "2026-05-12T09:00:00,0.4\n";
  std::string text = good.substr(0, good.find("[[well]]"));
  text = replace(text, "time_unit = \"min\"",
                 "time_unit = \"h\"\npumping_started = 2026-05-12T08:00:00");
  text = replace(text, "time = 100.0", "time = 100.0");
  text += "[[well]]\nname = \"ow\"\ndistance = 5.0\nseries = { file = \"ow.csv\" }\n";
  const PumpingTestReadResult r = read_pumping_test_text(text, folder / "test.toml");
  REQUIRE(r.test.has_value());
  const std::vector<double>& t = r.test->wells[0].times;
  REQUIRE(t.size() == 4);
  CHECK(t[0] == Approx(1.0 / 60.0));
  CHECK(t[3] == Approx(1.0));
  std::filesystem::remove_all(folder);
}

TEST_CASE("the leakance of a leaky confining bed for the numerical model",
          "[pumping_test_reader]") {
  {
    const std::string t =
        replace(good, "[[pumping]]", "[aquifer]\nleakance = \"fit\"\n\n[[pumping]]");
    const PumpingTestReadResult r = read_pumping_test_text(t, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    CHECK_FALSE(r.test->aquifer.has_value());  // confined, of unknown thickness
    REQUIRE(r.test->leakance.has_value());
    CHECK(r.test->leakance->fitted);
  }
  {
    const std::string t = replace(good, "[[pumping]]",
                                  "[aquifer]\ntop = -5.0\nbottom = -40.0\nstatic_level = 2.5\n"
                                  "leakance = 3e-4\n\n[[pumping]]");
    const PumpingTestReadResult r = read_pumping_test_text(t, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    REQUIRE(r.test->leakance.has_value());
    CHECK_FALSE(r.test->leakance->fitted);
    CHECK(r.test->leakance->value == 3e-4);
  }
  expect_replaced_error(good, "[[pumping]]", "[aquifer]\nleakance = -1.0\n\n[[pumping]]",
                        "[aquifer].leakance", "leakance = -1.0", "\"fit\" or a leakance");
  // a water-table aquifer has no confining bed
  expect_replaced_error(
      good, "[[pumping]]",
      "[aquifer]\nbottom = -40.0\nstatic_level = 2.5\nleakance = \"fit\"\n\n[[pumping]]",
      "[aquifer].leakance", "leakance = \"fit\"", "confined aquifer");
}

TEST_CASE("straight lines ([[boundary]]) and well bearings for the numerical model",
          "[pumping_test_reader]") {
  const std::string bearings =
      replace(replace(good, "distance = 12.0", "distance = 12.0\nbearing = 90.0"),
              "distance = 30.0", "distance = 30.0\nbearing = 315");
  const std::string lines = bearings +
                            "\n[[boundary]]\nkind = \"barrier\"\ndistance = 40.0\nbearing = 90.0\n"
                            "\n[[boundary]]\nkind = \"recharge\"\ndistance = 55.0\nbearing = 0.0\n"
                            "\n[[boundary]]\nkind = \"zone\"\ndistance = 20.0\nbearing = 270.0\n";
  {
    const PumpingTestReadResult r = read_pumping_test_text(lines, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    REQUIRE(r.test->lines.size() == 3);
    CHECK(r.test->lines[0].kind == TestLineKind::barrier);
    CHECK(r.test->lines[1].kind == TestLineKind::recharge);
    CHECK(r.test->lines[2].kind == TestLineKind::zone);
    CHECK(r.test->lines[1].distance == 55.0);
    CHECK(r.test->lines[2].bearing == 270.0);
    CHECK(r.test->wells[0].bearing == 90.0);
    CHECK(r.test->wells[1].bearing == 315.0);
  }
  {  // the files without lines or bearings stay as they were
    const PumpingTestReadResult r = read_pumping_test_text(good, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    CHECK(r.test->lines.empty());
    CHECK_FALSE(r.test->wells[0].bearing.has_value());
  }
  expect_replaced_error(lines, "kind = \"barrier\"", "kind = \"wall\"", "[[boundary]] #1.kind",
                        "kind = \"wall\"", "allowed:");
  expect_replaced_error(lines, "distance = 40.0", "distance = 0.0", "[[boundary]] #1.distance",
                        "distance = 0.0", "distance > 0");
  expect_replaced_error(lines, "bearing = 0.0", "bearing = 30.0", "[[boundary]] #2.bearing",
                        "bearing = 30.0", "parallel or perpendicular");
  expect_replaced_error(lines, "bearing = 0.0", "bearing = 360.0", "[[boundary]] #2.bearing",
                        "bearing = 360.0", "0 <= bearing");
  expect_replaced_error(lines, "kind = \"recharge\"", "kind = \"zone\"", "[[boundary]] #3.kind",
                        "kind = \"zone\"\ndistance = 20.0", "only one zone line");
  {
    const std::string t =
        replace(lines, "distance = 55.0\nbearing = 0.0", "distance = 55.0\nbearing = 90.0");
    expect_error(t, "[[boundary]] #2.bearing", line_of(t, "distance = 55.0") + 1,
                 "already in this direction");
  }
  // a well beyond the barrier (12 m toward a line at 10 m)
  expect_replaced_error(lines, "distance = 40.0", "distance = 10.0",
                        "[[well]] \"east piezometer\".bearing", "bearing = 90.0",
                        "on or beyond it");
  expect_replaced_error(lines, "bearing = 315", "", "[[well]] \"west piezometer\".bearing",
                        "[[well]]\nname = \"west", "missing");
  expect_replaced_error(lines, "distance = 12.0\nbearing = 90.0",
                        "distance = 12.0\nbearing = -90.0", "[[well]] \"east piezometer\".bearing",
                        "bearing = -90.0", "0 <= bearing");
  expect_replaced_error(lines, "kind = \"zone\"", "kind = \"zone\"\nwidth = 3.0",
                        "[[boundary]] #3.width", "width = 3.0", "");
}

TEST_CASE("screens, piezometer tips and K_z / K_r for partial penetration",
          "[pumping_test_reader]") {
  const std::string aquifer =
      "[aquifer]\ntop = -5.0\nbottom = -35.0\nstatic_level = 2.5\nanisotropy_ratio = 0.2\n\n"
      "[pumped_well]\nscreen_top = -5.0\nscreen_bottom = -15.0\n\n[[pumping]]";
  const std::string screened =
      replace(replace(replace(good, "[[pumping]]", aquifer), "distance = 12.0",
                      "distance = 12.0\npiezometer_tip = -30.0"),
              "distance = 30.0", "distance = 30.0\nscreen_top = -20.0\nscreen_bottom = -26.0");
  {
    const PumpingTestReadResult r = read_pumping_test_text(screened, "/invented/test.toml");
    REQUIRE(r.test.has_value());
    const PumpingTest& test = *r.test;
    REQUIRE(test.pumped_screen.has_value());
    CHECK(test.pumped_screen->top == -5.0);
    CHECK(test.pumped_screen->bottom == -15.0);
    CHECK(test.pumped_well.well == 0.0);  // no radius: only the screen given
    REQUIRE(test.anisotropy_ratio.has_value());
    CHECK(*test.anisotropy_ratio == 0.2);
    REQUIRE(test.wells[0].screen.has_value());
    CHECK(test.wells[0].screen->top == -30.0);
    CHECK(test.wells[0].screen->bottom == -30.0);
    CHECK(test.wells[1].screen->top == -20.0);
    CHECK(test.has_partial_screens());
    // Depths below the aquifer's top (-5 m), for Hantush (1961): d, l, d', l'.
    const PartialPenetration p = partial_penetration_of(test, test.wells[1]);
    CHECK(p.thickness == 30.0);
    CHECK(p.pumped_top == 0.0);
    CHECK(p.pumped_bottom == 10.0);
    CHECK(p.observed_top == 15.0);
    CHECK(p.observed_bottom == 21.0);
    CHECK(p.anisotropy_ratio == 0.2);
  }
  {  // "fit": the ratio is fitted
    const PumpingTestReadResult r = read_pumping_test_text(
        replace(screened, "anisotropy_ratio = 0.2", "anisotropy_ratio = \"fit\""),
        "/invented/test.toml");
    REQUIRE(r.test.has_value());
    CHECK_FALSE(r.test->anisotropy_ratio.has_value());
  }
  expect_replaced_error(screened, "screen_bottom = -15.0", "screen_bottom = -45.0",
                        "[pumped_well].screen_bottom", "screen_bottom = -45.0",
                        "within the aquifer");
  expect_replaced_error(screened, "screen_bottom = -26.0", "screen_bottom = -19.0",
                        "[[well]] \"west piezometer\".screen_bottom", "screen_bottom = -19.0",
                        "below screen_top");
  expect_replaced_error(screened, "screen_bottom = -26.0\n", "",
                        "[[well]] \"west piezometer\".screen_top", "screen_top = -20.0",
                        "needs both");
  expect_replaced_error(screened, "piezometer_tip = -30.0", "piezometer_tip = 0.0",
                        "[[well]] \"east piezometer\".piezometer_tip", "piezometer_tip = 0.0",
                        "within the aquifer");
  expect_replaced_error(screened, "piezometer_tip = -30.0",
                        "piezometer_tip = -30.0\nscreen_top = -6.0\nscreen_bottom = -7.0",
                        "[[well]] \"east piezometer\".piezometer_tip", "piezometer_tip = -30.0",
                        "not both");
  expect_replaced_error(screened, "anisotropy_ratio = 0.2", "anisotropy_ratio = 0.0",
                        "[aquifer].anisotropy_ratio", "anisotropy_ratio = 0.0",
                        "\"fit\" or a ratio");
  // Screens need the aquifer's geometry; the ratio needs screens.
  expect_replaced_error(good, "[[pumping]]",
                        "[pumped_well]\nscreen_top = -5.0\nscreen_bottom = -15.0\n\n[[pumping]]",
                        "[pumped_well].screen_top", "screen_top = -5.0", "aquifer's thickness");
  expect_replaced_error(good, "[[pumping]]",
                        "[aquifer]\nbottom = -35.0\nstatic_level = 2.5\nanisotropy_ratio = 0.2\n\n"
                        "[[pumping]]",
                        "[aquifer].anisotropy_ratio", "anisotropy_ratio = 0.2", "screen data only");
}
