#include "io/results/summary_json.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <iterator>
#include <numeric>
#include <string_view>

#include "io/files/atomic_file.hpp"
#include "io/files/text_encoding.hpp"

namespace aquiledger {
namespace {

/// Builds an object one "key": value line at a time.
class JsonObject {
 public:
  void raw(std::string_view key, std::string_view value) {
    text_ += first_ ? "\n" : ",\n";
    first_ = false;
    fmt::format_to(std::back_inserter(text_), "  {}: {}", json_string(key), value);
  }
  void text(std::string_view key, std::string_view value) { raw(key, json_string(value)); }
  void number(std::string_view key, double value) { raw(key, json_number(value)); }
  void integer(std::string_view key, long long value) { raw(key, fmt::format("{}", value)); }
  void boolean(std::string_view key, bool value) { raw(key, value ? "true" : "false"); }
  std::string finish() { return "{" + text_ + "\n}\n"; }

 private:
  std::string text_;
  bool first_ = true;
};

std::string iteration_stats(const std::vector<int>& its) {
  if (its.empty()) return R"({"min": null, "max": null, "mean": null})";
  const auto [lo, hi] = std::minmax_element(its.begin(), its.end());
  const double mean =
      std::accumulate(its.begin(), its.end(), 0.0) / static_cast<double>(its.size());
  return fmt::format(R"({{"min": {}, "max": {}, "mean": {}}})", *lo, *hi, json_number(mean));
}

}  // namespace

std::string summary_json(const RunSummary& s) {
  long newton_total = 0;
  for (int n : s.newton_iterations_per_step) newton_total += n;
  JsonObject o;
  o.text("program", "aquiledger");
  o.text("program_version", s.version);
  o.text("model_title", s.title);
  o.text("model_file", s.model_file);
  o.text("length_unit", s.length_unit);
  o.text("time_unit", s.time_unit);
  if (!s.start_date.empty()) o.text("start_date", s.start_date);
  o.text("volume_unit", s.length_unit + "3");
  o.text("rate_unit", s.length_unit + "3/" + s.time_unit);
  o.integer("cells", s.cells);
  o.integer("active_cells", s.active_cells);
  o.integer("unknowns", s.unknowns);
  o.integer("periods", s.periods);
  o.integer("steps", s.steps);
  o.number("wall_time_seconds", s.wall_seconds);
  o.number("output_time_seconds", s.output_seconds);
  o.raw("iterations_per_step", fmt::format("[{}]", fmt::join(s.newton_iterations_per_step, ", ")));
  o.raw("iterations_per_step_stats", iteration_stats(s.newton_iterations_per_step));
  o.integer("newton_iterations", newton_total);
  o.integer("linear_iterations", s.linear_iterations);
  o.integer("cutbacks", s.cutbacks);
  o.text("linear_solver", s.linear_solver);
  o.text("linear_solver_reason", s.linear_reason);
  o.number("largest_imbalance_percent", s.max_abs_imbalance_percent);
  o.number("well_shortfall_volume", s.well_shortfall_volume);
  o.boolean("converged", s.converged);
  o.raw("failure", s.converged && s.failure.empty() ? "null" : json_string(s.failure));
  std::string warnings = "[";
  for (std::size_t i = 0; i < s.warnings.size(); ++i)
    warnings += (i ? ", " : "") + json_string(s.warnings[i]);
  o.raw("warnings", warnings + "]");
  o.text("caution", s.caution);
  return o.finish();
}

void write_summary_json(const std::filesystem::path& path, const RunSummary& summary) {
  write_file_atomically(path, summary_json(summary));
}

}  // namespace aquiledger
