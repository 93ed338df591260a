// Inline inf and nan (valid TOML floats) are rejected wherever the model file gives a
// number, section by section, with the file, line and key; array files already reject
// them (test_model_reader_errors.cpp). No quantity of a groundwater model is infinite or
// undefined, and such a value used to pass validation and fail later in the linear solver.
#include <catch2/catch.hpp>

#include "tests/io/reader_test_support.hpp"

using namespace reader_test;

namespace {

struct Case {
  const char* section;
  std::string text;     ///< the model with one non-finite number
  const char* key;      ///< the key the error must name
  const char* line_of;  ///< text on the line the error must point at
};

const std::string base = base_model();

std::string with(const std::string& extra) { return base + extra; }

}  // namespace

TEST_CASE("inline inf and nan are rejected in every section with line and key",
          "[reader][errors][non_finite]") {
  const std::vector<Case> cases = {
      {"grid", edit(base, "dx = 10.0", "dx = inf"), "[grid].dx", "dx = inf"},
      {"grid origin", edit(base, "origin = [0.0, 0.0]", "origin = [nan, 0.0]"), "[grid].origin",
       "origin = [nan"},
      {"aquifer", edit(base, "k = 5.0", "k = inf"), "[aquifer].k", "k = inf"},
      {"aquifer zones",
       edit(base, "k = 5.0", "k = { zones = \"zones_3x4.txt\", values = { 1 = 5.0, 2 = nan } }"),
       "[aquifer].k.values.2", "k = { zones"},
      {"initial", edit(base, "head = 9.0", "head = -inf"), "[initial].head", "head = -inf"},
      {"period", edit(base, "length = 10.0", "length = inf"), "[[period]] \"first\".length",
       "length = inf"},
      {"well", with("\n[[well]]\nname = \"w\"\nx = 15.0\ny = 15.0\npumping_rate = [1.0, nan]\n"),
       "[[well]] \"w\".pumping_rate[2]", "pumping_rate = [1.0, nan]"},
      {"well position", with("\n[[well]]\nname = \"w\"\nx = inf\ny = 15.0\npumping_rate = 1.0\n"),
       "[[well]] \"w\".x", "x = inf"},
      {"fixed head", with("\n[[fixed_head]]\nname = \"f\"\nedge = \"west\"\nhead = nan\n"),
       "[[fixed_head]] \"f\".head", "head = nan"},
      {"recharge", with("\n[[recharge]]\nname = \"r\"\nrate = inf\n"), "[[recharge]] \"r\".rate",
       "rate = inf"},
      {"river",
       with("\n[[river]]\nname = \"v\"\npolyline = [[1.0, 5.0], [39.0, 5.0]]\nstage = 9.0\n"
            "bed_bottom = 8.0\nbed_conductance = inf\n"),
       "[[river]] \"v\".bed_conductance", "bed_conductance = inf"},
      {"river polyline",
       with("\n[[river]]\nname = \"v\"\npolyline = [[1.0, 5.0], [inf, 5.0]]\nstage = 9.0\n"
            "bed_bottom = 8.0\nbed_conductance = 1.0\n"),
       "[[river]] \"v\".polyline", "polyline = "},
      {"drain",
       with("\n[[drain]]\nname = \"d\"\nedge = \"east\"\nelevation = nan\nconductance = 1.0\n"),
       "[[drain]] \"d\".elevation", "elevation = nan"},
      {"external head",
       with("\n[[external_head]]\nname = \"e\"\nedge = \"east\"\nhead = 9.0\nconductance = inf\n"),
       "[[external_head]] \"e\".conductance", "conductance = inf"},
      {"evapotranspiration",
       with("\n[[evapotranspiration]]\nname = \"t\"\nedge = \"north\"\nsurface = 9.5\n"
            "max_rate = inf\nextinction_depth = 2.0\n"),
       "[[evapotranspiration]] \"t\".max_rate", "max_rate = inf"},
      {"leakage", with("\n[leakage]\nsource_head = 12.0\nleakance = nan\n"), "[leakage].leakance",
       "leakance = nan"},
      {"observation", with("\n[[observation]]\nname = \"o\"\nx = 15.0\ny = -inf\n"),
       "[[observation]] \"o\".y", "y = -inf"},
      {"solver", with("\n[solver]\nhead_tolerance = inf\n"), "[solver].head_tolerance",
       "head_tolerance = inf"},
  };
  for (const Case& c : cases) {
    SECTION(c.section) {
      const auto r = read(c.text);
      INFO(all_messages(r));
      CHECK_FALSE(r.ok());
      CHECK_FALSE(r.model.has_value());
      CHECK(has_error(r, c.key, {}, line_of(c.text, c.line_of)));
    }
  }
}
