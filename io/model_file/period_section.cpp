// [[period]]: stress periods with their lengths, steps, step growth and steady flag.
#include <algorithm>
#include <cmath>
#include <fstream>
#include <string_view>

#include "io/files/calendar.hpp"
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

/// Calendar steps of a run of periods (`every`).
const std::initializer_list<std::string_view> calendar_steps = {"day", "week", "month", "year"};

/// Calendar time `k` steps of `every` after `anchor` (seconds).
double calendar_step(double anchor, const std::string& every, int k) {
  if (every == "day") return anchor + 86400.0 * k;
  if (every == "week") return anchor + 7.0 * 86400.0 * k;
  if (every == "month") return add_calendar_months(anchor, k);
  return add_calendar_months(anchor, 12 * k);
}

/// A key that only works with [model].start_date, reported when there is none.
bool needs_clock(ReaderContext& ctx, const toml::table& t, const std::string& path,
                 std::string_view key) {
  if (ctx.clock) return true;
  ctx.error(*t.get(key), key_path(path, key),
            "dates need a calendar: give [model].start_date (the date of model time 0)");
  return false;
}

/// The lengths (model time) of the periods one [[period]] table stands for, starting at model
/// time `now`: one period of `length` or up to the date `end`; `count` equal periods of
/// `length`; or calendar periods `every` day, week, month or year, `count` of them or until
/// the date `until` (the last one ends at `until`). Empty after an error.
std::vector<double> period_lengths(ReaderContext& ctx, const toml::table& t,
                                   const std::string& path, double now) {
  const std::string T = ctx.time_unit;
  const bool has_length = t.contains("length"), has_end = t.contains("end"),
             has_every = t.contains("every"), has_until = t.contains("until"),
             has_count = t.contains("count");
  auto refuse = [&](std::string_view key, const std::string& why) {
    ctx.error(*t.get(key), key_path(path, key), why);
    return std::vector<double>{};
  };
  long long count = 1;
  if (has_count) {
    auto c = read_integer(ctx, t, "count", path, false);
    if (!c) return {};
    if (*c < 1 || *c > max_periods)
      return refuse("count", "value " + std::to_string(*c) + "; expected an integer from 1 to " +
                                 std::to_string(max_periods) + " (periods in the run)");
    count = *c;
  }
  if (has_every) {
    if (has_length) return refuse("length", "give either length or every, not both");
    if (has_end) return refuse("end", "give either end or every (with until or count), not both");
    if (has_until == has_count)
      return refuse("every", has_until ? "give either until or count with every, not both"
                                       : "every needs until (the date the run ends) or count "
                                         "(how many periods)");
    auto every = read_choice(ctx, t, "every", path, calendar_steps);
    if (!every || !needs_clock(ctx, t, path, "every")) return {};
    const double anchor = ctx.clock->calendar_time(now);
    double until = 0.0;
    if (has_until) {
      auto u = read_calendar_time(ctx, t, "until", path, true);
      if (!u) return {};
      if (!(*u > anchor))
        return refuse("until", "date " + format_calendar_time(*u) +
                                   " is not after the run's start " + format_calendar_time(anchor));
      until = *u;
      count = max_periods + 1;
    }
    std::vector<double> lengths;
    double start = anchor;
    for (long long k = 1; k <= count && (!has_until || start < until); ++k) {
      double end = calendar_step(anchor, *every, static_cast<int>(k));
      if (has_until) end = std::min(end, until);
      lengths.push_back(ctx.clock->model_time(end) - ctx.clock->model_time(start));
      start = end;
      if (static_cast<long long>(lengths.size()) > max_periods) break;
    }
    return lengths;
  }
  if (has_until) return refuse("until", "until goes with every (a run of calendar periods)");
  if (has_end) {
    if (has_length) return refuse("end", "give either length or end, not both");
    if (has_count) return refuse("count", "count goes with length or every, not with end");
    if (!needs_clock(ctx, t, path, "end")) return {};
    auto end = read_calendar_time(ctx, t, "end", path, true);
    if (!end) return {};
    const double length = ctx.clock->model_time(*end) - now;
    if (!(length > 0.0))
      return refuse("end", "date " + format_calendar_time(*end) +
                               " is not after the period's start " + ctx.clock->date_of(now));
    return {length};
  }
  auto length = read_number(ctx, t, "length", path, false);
  if (!length) {
    if (!has_length)
      ctx.error(t, key_path(path, "length"),
                "missing required key (expected the period's length in " + T +
                    ", or end = a date, or every = a calendar step)");
    return {};
  }
  if (!(*length > 0.0))
    return refuse("length", "value " + show_number(*length) + "; expected > 0 " + T);
  return std::vector<double>(static_cast<std::size_t>(count), *length);
}

/// The name suffix of the k-th period of a run: its start date for calendar runs (2021-03 for
/// months, 2021 for years), else its number from 1.
std::string run_label(const ReaderContext& ctx, const toml::table& t, double run_start,
                      std::size_t k) {
  const toml::node* every = t.get("every");
  if (!every || !every->as_string() || !ctx.clock) return std::to_string(k + 1);
  const std::string step = every->as_string()->get();
  const double start =
      calendar_step(ctx.clock->calendar_time(run_start), step, static_cast<int>(k));
  const std::string date = format_calendar_time(start);
  if (step == "month") return date.substr(0, 7);
  if (step == "year") return date.substr(0, 4);
  return date.substr(0, 10);
}
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
  NameSet names;
  long long total_steps = 0;
  double now = 0.0;  // model time at the start of the next period
  const int errors_before = ctx.diagnostics.n_errors();
  for (std::size_t i = 0; i < periods->size(); ++i) {
    const toml::table& t = *(*periods)[i].as_table();
    const std::string path = feature_path("period", t, i);
    check_keys(ctx, t, path,
               {"name", "length", "end", "every", "until", "count", "steps", "growth", "steady"});
    Period p;
    p.name = read_string(ctx, t, "name", path, false).value_or("period " + std::to_string(i + 1));
    const std::string T = ctx.time_unit;
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
    const double run_start = now;
    const std::vector<double> lengths = period_lengths(ctx, t, path, run_start);
    for (std::size_t k = 0; k < lengths.size(); ++k) {
      Period one = p;
      one.length = lengths[k];
      if (lengths.size() > 1) one.name = p.name + " " + run_label(ctx, t, run_start, k);
      check_unique_name(ctx, t, path, one.name, names);
      total_steps += one.steps;
      now += one.length;
      model.periods.push_back(std::move(one));
      if (static_cast<long long>(model.periods.size()) > max_periods) break;
    }
    if (static_cast<long long>(model.periods.size()) > max_periods) {
      ctx.error(t, path,
                "more than " + std::to_string(max_periods) +
                    " periods in all; at most that many are supported");
      return;
    }
  }
  if (total_steps > max_total_steps)
    ctx.error(*periods, "[[period]]",
              std::to_string(total_steps) + " time steps in all; at most " +
                  std::to_string(max_total_steps) + " are supported");
  else if (ctx.grid)
    if (auto refusal = work_refusal(ctx.grid->n_active(), static_cast<double>(total_steps)))
      ctx.error(*periods, "[[period]]", *refusal);
  if (ctx.diagnostics.n_errors() == errors_before) {
    ctx.n_periods = static_cast<int>(model.periods.size());
    ctx.period_bounds = {0.0};
    for (const Period& p : model.periods)
      ctx.period_bounds.push_back(ctx.period_bounds.back() + p.length);
  }
}

void check_steady_has_set_level(ReaderContext& ctx, const toml::table& root, const Model& model) {
  // Where the steady flag is, to point at it: [initial].steady, else the first steady period.
  const toml::node* at = nullptr;
  std::string key;
  if (const toml::table* initial = root["initial"].as_table(); initial && model.initial.steady) {
    at = initial->get("steady");
    key = "[initial].steady";
  }
  if (const toml::array* periods = root["period"].as_array(); periods && !at)
    for (std::size_t i = 0; i < periods->size() && !at; ++i)
      if (const toml::table* t = (*periods)[i].as_table())
        if (const auto steady = (*t)["steady"].value<bool>(); steady && *steady) {
          at = t->get("steady");
          key = feature_path("period", *t, i) + ".steady";
        }
  if (!at) return;
  // Every stress that ties a cell's flow to a level: with none, a steady state either does not
  // exist (recharge or pumping with no way out) or is any constant head (nothing at all).
  bool any_set_level = model.leakage && !model.leakage->cells.empty();
  for (const auto& f : model.fixed_heads) any_set_level |= !f.cells.empty();
  for (const auto& f : model.rivers) any_set_level |= !f.cells.empty();
  for (const auto& f : model.drains) any_set_level |= !f.cells.empty();
  for (const auto& f : model.external_heads) any_set_level |= !f.cells.empty();
  for (const auto& f : model.evapotranspiration) any_set_level |= !f.cells.empty();
  if (!any_set_level)
    ctx.error(*at, key,
              "a steady state needs somewhere water leaves or enters at a set level, and the "
              "model has none: add a [[fixed_head]], [[river]], [[drain]], [[external_head]], "
              "[[evapotranspiration]] or [leakage], or make the period transient");
}

}  // namespace aquiledger
