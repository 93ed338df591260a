// The pumping-test file: [test], [[pumping]] rate rows, [[well]] observation wells.
#include "io/model_file/pumping_test_reader.hpp"

#include <cmath>
#include <numbers>
#include <sstream>

#include "io/files/calendar.hpp"
#include "io/files/csv_table.hpp"
#include "io/files/input_file_guard.hpp"
#include "io/files/read_error.hpp"
#include "io/model_file/input_file_text.hpp"
#include "io/model_file/reader_context.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"
#include "io/model_file/unit_system.hpp"

namespace aquiledger {
namespace {

constexpr std::uintmax_t max_test_file_bytes = 64u << 20;

/// A date and time: seconds since 1970-01-01T00:00 (UTC when it carries an offset).
using DateTime = ZonedCalendarTime;

/// An ISO 8601 date and time (io/files/calendar.hpp); a date alone is not a date-time here.
std::optional<DateTime> parse_iso_date_time(std::string_view text) {
  const auto b = text.find_first_not_of(" \t\r");
  if (b == std::string_view::npos || text.substr(b).size() <= 10) return std::nullopt;
  return parse_zoned_calendar_time(text);
}

/// A TOML date-time value (or an ISO string) as a DateTime; nullopt when the node is neither
/// (a TOML date or time alone is not a date-time).
std::optional<DateTime> date_time_of(const toml::node& node) {
  if (const auto* v = node.as_date_time()) {
    std::ostringstream text;  // TOML++ prints the ISO 8601 form, offset included
    text << v->get();
    return parse_zoned_calendar_time(text.str());
  }
  if (const auto* v = node.as_string()) return parse_iso_date_time(v->get());
  return std::nullopt;
}

/// Turns dates into times (in the test's time unit) since the stated start of pumping.
struct TestClock {
  std::optional<DateTime> start;  ///< [test].pumping_started
  double seconds_per_unit = 86400.0;

  /// A time from a number (already since the start) or a date; nullopt with an error naming
  /// the key otherwise.
  std::optional<double> time_of(ReaderContext& ctx, const toml::node& node,
                                const std::string& key) const {
    if (auto v = number_of(node)) return v;
    if (auto dt = date_time_of(node)) return since_start(ctx, node, key, *dt);
    ctx.error(node, key,
              "expected a time in " + ctx.time_unit +
                  " or a date and time (2026-05-12T08:30:00), found " + show(node));
    return std::nullopt;
  }
  std::optional<double> since_start(ReaderContext& ctx, const toml::node& node,
                                    const std::string& key, const DateTime& dt) const {
    if (!start) {
      ctx.error(node, key,
                "a date needs the start of pumping: give [test].pumping_started = "
                "2026-05-12T08:00:00");
      return std::nullopt;
    }
    if (dt.has_offset != start->has_offset) {
      ctx.error(node, key,
                std::string("this date ") + (dt.has_offset ? "has" : "has no") +
                    " UTC offset and [test].pumping_started " +
                    (start->has_offset ? "has one" : "has none") +
                    ": give every date with an offset or none");
      return std::nullopt;
    }
    return (dt.seconds - start->seconds) / seconds_per_unit;
  }
};

/// A numeric array at key (every entry a finite number, or with a clock a date), or nullopt
/// with an error.
std::optional<std::vector<double>> read_numbers(ReaderContext& ctx, const toml::node& node,
                                                const std::string& key,
                                                const TestClock* clock = nullptr) {
  if (!clock) return read_number_array(ctx, node, key);
  return read_array_entries(
      ctx, node, key, [clock](ReaderContext& c, const toml::node& element, const std::string& at) {
        return clock->time_of(c, element, at);
      });
}

void read_test_section(ReaderContext& ctx, const toml::table& root, PumpingTest& test,
                       PumpingTestReadResult& result, TestClock& clock) {
  const toml::table* t = optional_table(ctx, root, "test");
  if (!t) {
    if (!root.get("test")) ctx.error(ctx.file_spot(), "[test]", "missing the [test] section");
    return;
  }
  check_keys(ctx, *t, "[test]", {"title", "length_unit", "time_unit", "model", "pumping_started"});
  test.title = read_string(ctx, *t, "title", "[test]", false).value_or("");
  test.length_unit = read_choice(ctx, *t, "length_unit", "[test]", {"m", "ft"}).value_or("m");
  test.time_unit =
      read_choice(ctx, *t, "time_unit", "[test]", {"s", "min", "h", "d", "yr"}).value_or("d");
  ctx.length_unit = test.length_unit;
  ctx.time_unit = test.time_unit;
  clock.seconds_per_unit = 86400.0 * days_per_time_unit(test.time_unit);
  if (const toml::node* start = t->get("pumping_started")) {
    clock.start = date_time_of(*start);
    if (!clock.start)
      ctx.error(*start, "[test].pumping_started",
                "expected a date and time (2026-05-12T08:00:00, optionally with Z or an offset "
                "+hh:mm), found " +
                    show(*start));
  }
  if (const toml::node* m = t->get("model")) {
    auto name = m->value<std::string>();
    if (!name || (*name != "auto" && !well_test_model_from_name(*name))) {
      std::string list;
      for (const std::string& n : pumping_test_model_names())
        list += (list.empty() ? "" : ", ") + n;
      ctx.error(*m, "[test].model", "expected one of " + list + ", found " + show(*m));
    } else {
      result.model = *name;
    }
  }
}

/// A well's screen (screen_top and screen_bottom, elevations) or, with `tip_allowed`, a
/// piezometer's tip (piezometer_tip): within the aquifer of [aquifer] (read before), the top
/// above the bottom. nullopt (after an error when something was given wrongly) otherwise.
std::optional<WellScreen> read_screen(ReaderContext& ctx, const toml::table& t,
                                      const std::string& path, const PumpingTest& test,
                                      bool tip_allowed) {
  const auto top = read_number(ctx, t, "screen_top", path, false);
  const auto bottom = read_number(ctx, t, "screen_bottom", path, false);
  std::optional<double> tip;
  if (tip_allowed) tip = read_number(ctx, t, "piezometer_tip", path, false);
  if (!top && !bottom && !tip) return std::nullopt;
  const std::string& lu = ctx.length_unit;
  if (tip && (top || bottom)) {
    ctx.error(*t.get("piezometer_tip"), path + ".piezometer_tip",
              "give a screen (screen_top and screen_bottom) or a piezometer_tip, not both");
    return std::nullopt;
  }
  if (!tip && (!top || !bottom)) {
    const char* given = top ? "screen_top" : "screen_bottom";
    ctx.error(*t.get(given), path + "." + given,
              "a screen needs both screen_top and screen_bottom (elevations, " + lu + ")");
    return std::nullopt;
  }
  const char* key = tip ? "piezometer_tip" : "screen_top";
  if (!test.aquifer) {
    ctx.error(*t.get(key), path + "." + key,
              "screen data need the aquifer's thickness: give [aquifer] bottom, static_level "
              "and top (elevations, the datum of the screens)");
    return std::nullopt;
  }
  const double aquifer_top = test.aquifer->bottom + test.aquifer->thickness();
  const double aquifer_bottom = test.aquifer->bottom;
  const std::string range = "within the aquifer, from its bottom " + show_number(aquifer_bottom) +
                            " to its top " + show_number(aquifer_top) + " " + lu;
  if (tip) {
    if (!(*tip >= aquifer_bottom && *tip <= aquifer_top)) {
      ctx.error(*t.get(key), path + "." + key,
                "expected a tip " + range + ", found " + show_number(*tip));
      return std::nullopt;
    }
    return WellScreen{*tip, *tip};
  }
  if (!(*top > *bottom)) {
    ctx.error(*t.get("screen_bottom"), path + ".screen_bottom",
              "expected a bottom below screen_top (" + show_number(*top) + " " + lu + "), found " +
                  show_number(*bottom));
    return std::nullopt;
  }
  for (const char* k : {"screen_top", "screen_bottom"}) {
    const double v = std::string(k) == "screen_top" ? *top : *bottom;
    if (!(v >= aquifer_bottom && v <= aquifer_top)) {
      ctx.error(*t.get(k), path + "." + k,
                std::string("expected a level ") + range + ", found " + show_number(v));
      return std::nullopt;
    }
  }
  return WellScreen{*top, *bottom};
}

/// [pumped_well]: radius (r_w) and casing_radius (r_c, default r_w), for the large-diameter
/// model of Papadopulos and Cooper (1967); screen_top and screen_bottom for Hantush (1961).
void read_pumped_well(ReaderContext& ctx, const toml::table& root, PumpingTest& test) {
  const toml::table* t = optional_table(ctx, root, "pumped_well");
  if (!t) return;
  check_keys(ctx, *t, "[pumped_well]", {"radius", "casing_radius", "screen_top", "screen_bottom"});
  test.pumped_screen = read_screen(ctx, *t, "[pumped_well]", test, false);
  // The radius is needed unless the section gives only the screen.
  const bool radius_needed =
      t->contains("casing_radius") || (!t->contains("screen_top") && !t->contains("screen_bottom"));
  for (const char* key : {"radius", "casing_radius"}) {
    const bool required = std::string(key) == "radius" && radius_needed;
    auto v = read_number(ctx, *t, key, "[pumped_well]", required);
    if (!v) continue;
    if (!(*v > 0.0)) {
      ctx.error(*t->get(key), std::string("[pumped_well].") + key,
                "expected a radius > 0 " + ctx.length_unit + ", found " + show_number(*v));
      continue;
    }
    (std::string(key) == "radius" ? test.pumped_well.well : test.pumped_well.casing) = *v;
  }
  if (test.pumped_well.casing == 0.0) test.pumped_well.casing = test.pumped_well.well;
}

/// [aquifer].leakance: "fit" or a leakance K' / b' > 0 (1/T) held fixed.
void read_test_leakance(ReaderContext& ctx, const toml::table& t, PumpingTest& test) {
  const toml::node* node = t.get("leakance");
  if (!node) return;
  if (const auto word = node->value_exact<std::string>(); word && *word == "fit") {
    test.leakance = TestLeakance{true, 0.0};
    return;
  }
  const auto v = node->value<double>();
  if (!v || !node->is_number() || !(*v > 0.0) || !std::isfinite(*v)) {
    ctx.error(
        *node, "[aquifer].leakance",
        "expected \"fit\" or a leakance K'/b' > 0 1/" + ctx.time_unit + ", found " + show(*node));
    return;
  }
  test.leakance = TestLeakance{false, *v};
}

/// [aquifer].anisotropy_ratio: "fit" (the default) or K_z / K_r > 0 held, for Hantush (1961).
void read_anisotropy_ratio(ReaderContext& ctx, const toml::table& t, PumpingTest& test) {
  const toml::node* node = t.get("anisotropy_ratio");
  if (!node) return;
  if (const auto word = node->value_exact<std::string>(); word && *word == "fit") return;
  const auto v = node->value<double>();
  if (!v || !node->is_number() || !(*v > 0.0) || !std::isfinite(*v)) {
    ctx.error(*node, "[aquifer].anisotropy_ratio",
              "expected \"fit\" or a ratio K_z/K_r > 0 of the vertical to the horizontal "
              "hydraulic conductivity, found " +
                  show(*node));
    return;
  }
  test.anisotropy_ratio = *v;
}

/// [aquifer]: the aquifer's geometry for the numerical model (docs/pumping-tests.md): bottom
/// and static_level (the head before pumping) required, top optional (a confining top).
void read_test_aquifer(ReaderContext& ctx, const toml::table& root, PumpingTest& test) {
  const toml::table* t = optional_table(ctx, root, "aquifer");
  if (!t) return;
  check_keys(ctx, *t, "[aquifer]",
             {"top", "bottom", "static_level", "leakance", "anisotropy_ratio"});
  read_test_leakance(ctx, *t, test);
  read_anisotropy_ratio(ctx, *t, test);
  // Without bottom and static_level (leakance alone) the aquifer stays the confined one of
  // unit thickness; with either, both are needed.
  const bool geometry = t->contains("bottom") || t->contains("static_level") || t->contains("top");
  if (!geometry) return;
  const auto top = read_number(ctx, *t, "top", "[aquifer]", false);
  const auto bottom = read_number(ctx, *t, "bottom", "[aquifer]", true);
  const auto level = read_number(ctx, *t, "static_level", "[aquifer]", true);
  if (!bottom || !level) return;
  if (!(*level > *bottom)) {
    ctx.error(*t->get("static_level"), "[aquifer].static_level",
              "expected a level above the aquifer's bottom (" + show_number(*bottom) + " " +
                  ctx.length_unit + "), found " + show_number(*level));
    return;
  }
  if (top && !(*top > *bottom)) {
    ctx.error(*t->get("top"), "[aquifer].top",
              "expected a top above the aquifer's bottom (" + show_number(*bottom) + " " +
                  ctx.length_unit + "), found " + show_number(*top));
    return;
  }
  if (test.leakance && !(top && *top < *level)) {
    ctx.error(*t->get("leakance"), "[aquifer].leakance",
              "a leaky confining bed needs a confined aquifer: a top below static_level, or "
              "no bottom and static_level (a confined aquifer of unknown thickness)");
    return;
  }
  TestAquiferGeometry g;
  g.has_top = top.has_value();
  g.top = top.value_or(0.0);
  g.bottom = *bottom;
  g.static_level = *level;
  test.aquifer = g;
}

void read_schedule(ReaderContext& ctx, const toml::table& root, PumpingTest& test,
                   const TestClock& clock) {
  const toml::array* arr = section_tables(ctx, root, "pumping");
  if (!arr || arr->empty()) {
    if (!root.get("pumping"))
      ctx.error(ctx.file_spot(), "[[pumping]]",
                "missing the rate schedule: give [[pumping]] rows with time and rate");
    return;
  }
  for (std::size_t i = 0; i < arr->size(); ++i) {
    const toml::table& row = *(*arr)[i].as_table();
    const std::string path = "[[pumping]] #" + std::to_string(i + 1);
    check_keys(ctx, row, path, {"time", "rate"});
    std::optional<double> time;
    if (const toml::node* at = row.get("time"))
      time = clock.time_of(ctx, *at, path + ".time");
    else
      read_number(ctx, row, "time", path, true);  // reports the missing key
    auto rate = read_number(ctx, row, "rate", path, true);
    if (!time || !rate) continue;
    if (*rate < 0.0) {
      ctx.error(*row.get("rate"), path + ".rate",
                "expected a rate >= 0 " + ctx.flow_unit() +
                    " (positive = withdrawal, 0 = recovery), found " + show_number(*rate));
      continue;
    }
    if (!test.schedule.empty() && *time <= test.schedule.back().start) {
      ctx.error(*row.get("time"), path + ".time",
                "expected a time after the previous row's " +
                    show_number(test.schedule.back().start) + " " + ctx.time_unit + ", found " +
                    show_number(*time));
      continue;
    }
    test.schedule.push_back({*time, *rate});
  }
  if (!test.schedule.empty() && test.schedule.front().rate <= 0.0)
    ctx.error(*(*arr)[0].as_table()->get("rate"), "[[pumping]] #1.rate",
              "the first row must pump (rate > 0)");
}

/// The series of one well from `series = { file = "x.csv" }`: columns time and drawdown, or
/// time and water_level.
bool read_series_file(ReaderContext& ctx, const toml::node& node, const std::string& path,
                      const TestClock& clock, std::vector<double>& times,
                      std::vector<double>& values, bool& levels) {
  const toml::table* t = node.as_table();
  const std::string key = path + ".series";
  if (!t) {
    ctx.error(node, key, "expected { file = \"series.csv\" }, found " + type_name(node));
    return false;
  }
  check_keys(ctx, *t, key, {"file"});
  auto file = read_string(ctx, *t, "file", key, true);
  if (!file) return false;
  const std::filesystem::path where = ctx.resolve(*file);
  CsvTable table;
  try {
    if (auto refusal = input_file_refusal(where, max_test_file_bytes))
      throw ReadError(where.string() + ": " + *refusal);
    table = read_csv_file(where);
  } catch (const ReadError& e) {
    ctx.error(*t->get("file"), key + ".file", e.what());
    return false;
  }
  if (!table.column("time") || !(table.column("drawdown") || table.column("water_level"))) {
    ctx.error(*t->get("file"), key + ".file",
              where.string() + ": expected the columns time and drawdown (or water_level)");
    return false;
  }
  levels = !table.column("drawdown");
  times = table.numbers("time");
  values = table.numbers(levels ? "water_level" : "drawdown");
  // A time that is not a number may be a date and time since [test].pumping_started.
  const std::vector<std::string> texts = table.texts("time");
  for (std::size_t i = 0; i < times.size() && i < texts.size(); ++i) {
    if (std::isfinite(times[i])) continue;
    const auto dt = parse_iso_date_time(texts[i]);
    if (!dt) continue;
    const auto since = clock.since_start(ctx, *t->get("file"), key + ".file", *dt);
    if (!since) return false;
    times[i] = *since;
  }
  for (std::size_t i = 0; i < times.size(); ++i)
    if (!std::isfinite(times[i]) || !std::isfinite(values[i])) {
      ctx.error(*t->get("file"), key + ".file",
                where.string() + ":" + std::to_string(i + 2) + ": expected two numbers");
      return false;
    }
  return true;
}

void read_wells(ReaderContext& ctx, const toml::table& root, PumpingTest& test,
                const TestClock& clock) {
  const toml::array* arr = section_tables(ctx, root, "well");
  if (!arr || arr->empty()) {
    if (!root.get("well"))
      ctx.error(ctx.file_spot(), "[[well]]", "missing the observation wells ([[well]])");
    return;
  }
  NameSet names;
  for (std::size_t i = 0; i < arr->size(); ++i) {
    const toml::table& t = *(*arr)[i].as_table();
    const std::string path = feature_path("well", t, i);
    check_keys(ctx, t, path,
               {"name", "distance", "radius", "times", "drawdowns", "water_levels", "static_level",
                "series", "boundary", "image_distance", "bearing", "screen_top", "screen_bottom",
                "piezometer_tip"});
    ObservationSeries w;
    w.screen = read_screen(ctx, t, path, test, true);
    w.name = read_string(ctx, t, "name", path, false).value_or("well " + std::to_string(i + 1));
    check_unique_name(ctx, t, path, w.name, names);
    auto distance = read_number(ctx, t, "distance", path, true);
    if (distance && !(*distance > 0.0))
      ctx.error(*t.get("distance"), path + ".distance",
                "expected a distance > 0 " + ctx.length_unit +
                    " from the pumped well (for the "
                    "pumped well itself, its radius), found " +
                    show_number(*distance));
    w.distance = distance.value_or(0.0);
    if (auto radius = read_number(ctx, t, "radius", path, false)) {
      if (!(*radius > 0.0))
        ctx.error(*t.get("radius"), path + ".radius",
                  "expected a radius > 0 " + ctx.length_unit + ", found " + show_number(*radius));
      w.radius = *radius;
    }
    if (auto bearing = read_number(ctx, t, "bearing", path, false)) {
      if (!(*bearing >= 0.0 && *bearing < 360.0))
        ctx.error(*t.get("bearing"), path + ".bearing",
                  "expected degrees clockwise from north, 0 <= bearing < 360, found " +
                      show_number(*bearing));
      else
        w.bearing = *bearing;
    }
    if (auto kind = read_choice(ctx, t, "boundary", path, {"barrier", "recharge"})) {
      auto image = read_number(ctx, t, "image_distance", path, true);
      if (image && !(*image > w.distance))
        ctx.error(*t.get("image_distance"), path + ".image_distance",
                  "expected the distance to the image well, > the well's distance, found " +
                      show_number(*image));
      else if (image)
        w.images.push_back({*image, *kind == "recharge"});
    } else if (t.get("image_distance") && !t.get("boundary")) {
      ctx.error(*t.get("image_distance"), path + ".image_distance",
                "give boundary = \"barrier\" or \"recharge\" with image_distance");
    }
    // The series: inline arrays or a file, as drawdowns or as water levels.
    std::vector<double> values;
    bool levels = false, ok = false;
    const toml::node* series = t.get("series");
    const bool inline_form = t.get("times") || t.get("drawdowns") || t.get("water_levels");
    if (series && inline_form) {
      ctx.error(*series, path + ".series",
                "give either series = { file } or the arrays times and drawdowns, not both");
      continue;
    }
    if (series) {
      ok = read_series_file(ctx, *series, path, clock, w.times, values, levels);
    } else {
      if (!t.get("times") || !(t.get("drawdowns") || t.get("water_levels"))) {
        ctx.error(t, path,
                  "missing the series: give times and drawdowns (or water_levels), or "
                  "series = { file = \"x.csv\" }");
        continue;
      }
      if (t.get("drawdowns") && t.get("water_levels")) {
        ctx.error(*t.get("water_levels"), path + ".water_levels",
                  "give drawdowns or water_levels, not both");
        continue;
      }
      levels = !t.get("drawdowns");
      auto times = read_numbers(ctx, *t.get("times"), path + ".times", &clock);
      const std::string vkey = levels ? "water_levels" : "drawdowns";
      auto vals = read_numbers(ctx, *t.get(vkey), path + "." + vkey);
      if (times && vals) {
        if (times->size() != vals->size())
          ctx.error(*t.get(vkey), path + "." + vkey,
                    "expected as many values as times (" + std::to_string(times->size()) +
                        "), found " + std::to_string(vals->size()));
        else {
          w.times = std::move(*times);
          values = std::move(*vals);
          ok = true;
        }
      }
    }
    if (!ok) continue;
    const toml::node* at = series ? series : t.get("times");
    const std::string times_key = path + (series ? ".series" : ".times");
    for (std::size_t k = 1; k < w.times.size(); ++k)
      if (!(w.times[k] > w.times[k - 1])) {
        ctx.error(*at, times_key,
                  "times must increase; entry " + std::to_string(k) + " (" +
                      show_number(w.times[k]) + ") is not after the one before");
        ok = false;
        break;
      }
    if (w.times.size() < 4) {
      ctx.error(*at, times_key, "expected at least 4 measurements");
      ok = false;
    }
    auto static_level = read_number(ctx, t, "static_level", path, levels);
    if (static_level && !levels)
      ctx.warning(ctx.spot(*t.get("static_level")), path + ".static_level",
                  "ignored: the series are drawdowns");
    if (!ok || (levels && !static_level)) continue;
    w.drawdowns = levels ? values : std::move(values);
    if (levels)
      for (double& v : w.drawdowns) v = *static_level - v;
    test.wells.push_back(std::move(w));
  }
}

/// [[boundary]]: straight lines in the aquifer for the numerical model (docs/pumping-tests.md,
/// "Straight lines and zones"): kind, distance and bearing of the perpendicular from the
/// pumped well. Lines parallel or perpendicular to each other, one zone line at most, one
/// barrier or recharge line per direction.
void read_test_lines(ReaderContext& ctx, const toml::table& root, PumpingTest& test) {
  const toml::array* arr = section_tables(ctx, root, "boundary");
  if (!arr) return;
  bool zone_seen = false;
  for (std::size_t i = 0; i < arr->size(); ++i) {
    const toml::table& t = *(*arr)[i].as_table();
    const std::string path = "[[boundary]] #" + std::to_string(i + 1);
    check_keys(ctx, t, path, {"kind", "distance", "bearing"});
    const auto kind = read_choice(ctx, t, "kind", path, {"barrier", "recharge", "zone"});
    if (!kind && !t.get("kind"))
      ctx.error(t, path + ".kind", "missing: give kind = \"barrier\", \"recharge\" or \"zone\"");
    const auto distance = read_number(ctx, t, "distance", path, true);
    const auto bearing = read_number(ctx, t, "bearing", path, true);
    if (distance && !(*distance > 0.0)) {
      ctx.error(*t.get("distance"), path + ".distance",
                "expected the distance > 0 " + ctx.length_unit +
                    " from the pumped well to the line, found " + show_number(*distance));
      continue;
    }
    if (bearing && !(*bearing >= 0.0 && *bearing < 360.0)) {
      ctx.error(*t.get("bearing"), path + ".bearing",
                "expected degrees clockwise from north of the perpendicular from the pumped "
                "well to the line, 0 <= bearing < 360, found " +
                    show_number(*bearing));
      continue;
    }
    if (!kind || !distance || !bearing) continue;
    TestLine line;
    line.kind = *kind == "barrier"    ? TestLineKind::barrier
                : *kind == "recharge" ? TestLineKind::recharge
                                      : TestLineKind::zone;
    line.distance = *distance;
    line.bearing = *bearing;
    if (line.kind == TestLineKind::zone && zone_seen) {
      ctx.error(*t.get("kind"), path + ".kind", "only one zone line is represented");
      continue;
    }
    if (!test.lines.empty()) {
      const double turns = (line.bearing - test.lines.front().bearing) / 90.0;
      if (std::abs(turns - std::round(turns)) > 1e-9) {
        ctx.error(*t.get("bearing"), path + ".bearing",
                  "expected a line parallel or perpendicular to the first [[boundary]] "
                  "(bearings differing by a multiple of 90 degrees), found " +
                      show_number(line.bearing));
        continue;
      }
    }
    bool taken = false;
    for (const TestLine& other : test.lines)
      taken |= line.kind != TestLineKind::zone && other.kind != TestLineKind::zone &&
               other.bearing == line.bearing;
    if (taken) {
      ctx.error(*t.get("bearing"), path + ".bearing",
                "a barrier or recharge line lies already in this direction; give the nearest "
                "one only");
      continue;
    }
    zone_seen |= line.kind == TestLineKind::zone;
    test.lines.push_back(line);
  }
}

/// With [[boundary]] lines every well needs its bearing and must lie on the pumped well's side
/// of each barrier and recharge line.
void check_wells_within_lines(ReaderContext& ctx, const toml::table& root,
                              const PumpingTest& test) {
  const toml::array* arr = root.get_as<toml::array>("well");
  if (test.lines.empty() || !arr) return;
  for (std::size_t i = 0; i < arr->size() && i < test.wells.size(); ++i) {
    const toml::table* t = (*arr)[i].as_table();
    if (!t) continue;
    const ObservationSeries& w = test.wells[i];
    const std::string path = feature_path("well", *t, i);
    if (!w.bearing) {
      if (!t->get("bearing"))
        ctx.error(*t, path + ".bearing",
                  "missing: with [[boundary]] lines give each well's bearing (degrees "
                  "clockwise from north, seen from the pumped well)");
      continue;
    }
    for (const TestLine& line : test.lines) {
      if (line.kind == TestLineKind::zone) continue;
      const double along =
          w.distance * std::cos((*w.bearing - line.bearing) * std::numbers::pi / 180.0);
      if (along >= line.distance)
        ctx.error(*t->get("bearing"), path + ".bearing",
                  "the well lies " + show_number(along) + " " + ctx.length_unit +
                      " toward the line at " + show_number(line.distance) + " " + ctx.length_unit +
                      " (bearing " + show_number(line.bearing) +
                      "): on or beyond it; wells must lie on the pumped well's side");
    }
  }
}

}  // namespace

std::vector<std::string> pumping_test_model_names() {
  return {"auto",
          "theis",
          "cooper-jacob",
          "hantush-jacob",
          "neuman",
          "papadopulos-cooper",
          "hantush-aquitard-storage",
          "hantush-partial-penetration",
          "numerical"};
}

std::optional<WellTestModel> well_test_model_from_name(std::string_view name) {
  for (WellTestModel m :
       {WellTestModel::theis, WellTestModel::cooper_jacob, WellTestModel::hantush_jacob,
        WellTestModel::neuman, WellTestModel::papadopulos_cooper,
        WellTestModel::hantush_aquitard_storage, WellTestModel::hantush_partial_penetration,
        WellTestModel::numerical})
    if (model_name(m) == name) return m;
  return std::nullopt;
}

namespace {

/// [aquifer].anisotropy_ratio serves only the screens' model (Hantush, 1961).
void check_anisotropy_has_screens(ReaderContext& ctx, const toml::table& root,
                                  const PumpingTest& test) {
  const toml::table* a = root.get_as<toml::table>("aquifer");
  const toml::node* node = a ? a->get("anisotropy_ratio") : nullptr;
  if (node && !test.has_screens())
    ctx.error(*node, "[aquifer].anisotropy_ratio",
              "K_z/K_r is used with screen data only: give the wells' screen_top and "
              "screen_bottom (or piezometer_tip), or leave it out");
}

}  // namespace

PumpingTestReadResult read_pumping_test_text(std::string_view toml_text,
                                             const std::filesystem::path& as_if_path) {
  ReaderContext ctx;
  ctx.model_file = as_if_path;
  ctx.base_dir = as_if_path.parent_path();
  if (ctx.base_dir.empty()) ctx.base_dir = ".";
  PumpingTestReadResult result;
  try {
    const toml::table root = toml::parse(toml_text, as_if_path.string());
    check_keys(ctx, root, "(top level)",
               {"test", "pumped_well", "aquifer", "pumping", "well", "boundary"});
    PumpingTest test;
    TestClock clock;
    read_test_section(ctx, root, test, result, clock);
    read_test_aquifer(ctx, root, test);  // before the screens, which lie within it
    read_pumped_well(ctx, root, test);
    read_schedule(ctx, root, test, clock);
    read_wells(ctx, root, test, clock);
    read_test_lines(ctx, root, test);
    check_wells_within_lines(ctx, root, test);
    check_anisotropy_has_screens(ctx, root, test);
    if (!ctx.diagnostics.has_errors()) result.test = std::move(test);
  } catch (const toml::parse_error& e) {
    ctx.error(ctx.spot(e.source()), "", "TOML syntax: " + std::string(e.description()));
  }
  result.diagnostics = ctx.diagnostics.take();
  return result;
}

PumpingTestReadResult read_pumping_test_file(const std::filesystem::path& path) {
  InputFileText input = read_input_file_text(path, max_test_file_bytes, "test file");
  if (input.error) {
    PumpingTestReadResult result;
    result.diagnostics.push_back(std::move(*input.error));
    return result;
  }
  return read_pumping_test_text(input.text, std::filesystem::absolute(path).lexically_normal());
}

}  // namespace aquiledger
