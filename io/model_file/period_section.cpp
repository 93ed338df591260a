// [[period]]: stress periods with their lengths, steps, step growth and steady flag.
#include <algorithm>
#include <cmath>
#include <fstream>

#include "io/files/input_file_guard.hpp"
#include "io/model_file/array_source.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/memory_guard.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {
// Guards against counts no model needs, which would only exhaust memory or time.
constexpr long long max_periods = 100000;
constexpr long long max_steps_per_period = 1000000;
constexpr long long max_total_steps = 10000000;
}  // namespace

void read_periods(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::array* periods = section_tables(ctx, root, "period");
  if (!periods) {
    if (!root.contains("period"))
      ctx.error(ctx.file_spot(), "[[period]]", "missing required section: at least one [[period]]");
    return;
  }
  if (static_cast<long long>(periods->size()) > max_periods) {
    ctx.error(*periods, "[[period]]",
              std::to_string(periods->size()) + " periods; at most " + std::to_string(max_periods) +
                  " are supported");
    return;
  }
  std::vector<std::string> names;
  long long total_steps = 0;
  const int errors_before = ctx.diagnostics.n_errors();
  for (std::size_t i = 0; i < periods->size(); ++i) {
    const toml::table& t = *(*periods)[i].as_table();
    const std::string path = feature_path("period", t, i);
    check_keys(ctx, t, path, {"name", "length", "steps", "growth", "steady"});
    Period p;
    p.name = read_string(ctx, t, "name", path, false).value_or("period " + std::to_string(i + 1));
    check_unique_name(ctx, t, path, p.name, names);
    const std::string T = ctx.time_unit;
    if (auto length = read_number(ctx, t, "length", path, true)) {
      if (!(*length > 0.0))
        ctx.error(*t.get("length"), path + ".length",
                  "value " + show_number(*length) + "; expected > 0 " + T);
      p.length = *length;
    }
    if (auto steps = read_integer(ctx, t, "steps", path, false)) {
      if (*steps < 1 || *steps > max_steps_per_period)
        ctx.error(*t.get("steps"), path + ".steps",
                  "value " + std::to_string(*steps) + "; expected an integer from 1 to " +
                      std::to_string(max_steps_per_period));
      else
        p.steps = static_cast<int>(*steps);
    }
    if (auto growth = read_number(ctx, t, "growth", path, false)) {
      if (!(*growth > 0.0))
        ctx.error(
            *t.get("growth"), path + ".growth",
            "value " + show_number(*growth) + "; expected > 0 (ratio of consecutive step lengths)");
      p.growth = *growth;
    }
    p.steady = read_bool(ctx, t, "steady", path).value_or(false);
    if (p.steady && p.steps != 1)
      ctx.warning(ctx.spot(t), path + ".steps",
                  "a steady period is solved once; steps = " + std::to_string(p.steps) +
                      " only divides its time");
    // One backward-Euler step spreads the response over the whole period: a drawdown that
    // develops within the period is then not resolved (common practice: ten or more steps,
    // growing, in a period whose stresses change).
    if (!p.steady && p.steps == 1)
      ctx.warning(ctx.spot(t), path + ".steps",
                  "a transient period in a single time step: heads and budgets are resolved only "
                  "at its end; give steps (e.g. 10 with growth = 1.2) unless one step is meant");
    total_steps += p.steps;
    model.periods.push_back(p);
  }
  if (total_steps > max_total_steps)
    ctx.error(*periods, "[[period]]",
              std::to_string(total_steps) + " time steps in all; at most " +
                  std::to_string(max_total_steps) + " are supported");
  else if (ctx.grid)
    if (auto refusal = work_refusal(ctx.grid->n_active(), static_cast<double>(total_steps)))
      ctx.error(*periods, "[[period]]", *refusal);
  if (ctx.diagnostics.n_errors() == errors_before)
    ctx.n_periods = static_cast<int>(model.periods.size());
}

}  // namespace aquiledger
