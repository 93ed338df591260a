#include "io/results/result_tables.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <iterator>
#include <stdexcept>
#include <string_view>

#include "io/files/atomic_file.hpp"
#include "io/files/text_encoding.hpp"
#include "postproc/calibration_statistics.hpp"

namespace aquiledger {
namespace {

/// fmt's "{}" for double is the shortest text that reads back to the same value.
void append_number(std::string& out, double value) {
  out += ',';
  fmt::format_to(std::back_inserter(out), "{}", value);
}

void append_in_out(std::string& out, const InOut& value) {
  append_number(out, value.in);
  append_number(out, value.out);
}

/// The component rows of one budget, then `total` (the sum of every component), each after
/// the row's leading text `lead` and followed by
/// the unit and `tail` (the dates, or nothing).
void append_components(std::string& out, const std::string& lead, const BudgetTableLayout& layout,
                       const WaterBudget& budget, const std::string& unit,
                       const std::string& tail) {
  for (BudgetComponent c : layout.components) {
    fmt::format_to(std::back_inserter(out), "{},{}", lead, component_label(c));
    append_in_out(out, budget[c]);
    out += ',' + csv_text(unit) + tail + '\n';
  }
  out += lead + ",total";
  append_in_out(out, {budget.total_in(), budget.total_out()});
  out += ',' + csv_text(unit) + tail + '\n';
}

/// ",YYYY-MM-DD" of a model time with a clock, else nothing.
std::string date_cell(const std::optional<CalendarClock>& clock, double time) {
  return clock ? ',' + clock->date_of(time) : std::string();
}

/// The header's date columns with a clock, else nothing.
std::string date_header(const std::optional<CalendarClock>& clock, const char* columns) {
  return clock ? std::string(",") + columns : std::string();
}

std::string step_lead(const BudgetStepRow& row) {
  std::string lead = fmt::format("{},{}", row.period, row.step);
  append_number(lead, row.time);
  append_number(lead, row.dt);
  return lead;
}

std::string period_lead(const BudgetPeriodRow& row) {
  std::string lead = fmt::format("{},{}", row.period, csv_text(row.name));
  append_number(lead, row.start);
  append_number(lead, row.end);
  return lead;
}

bool is_step(const BudgetStepRow& row) { return row.step > 0; }

}  // namespace

BudgetTableLayout budget_table_layout(const Model& model) {
  BudgetTableLayout layout;
  using C = BudgetComponent;
  if (model.aquifer.elastic_split())
    layout.components = {C::storage_skeleton, C::storage_water};
  else
    layout.components = {C::storage_elastic};
  if (model.aquifer.condition != Condition::confined)
    layout.components.push_back(C::storage_drainage);
  if (model.aquifer.interbeds) {
    layout.components.push_back(C::interbed_recoverable);
    layout.components.push_back(C::interbed_permanent);
    if (model.aquifer.interbeds->delay) {
      layout.components.push_back(C::delay_bed_recoverable);
      layout.components.push_back(C::delay_bed_permanent);
    }
  }
  std::vector<bool> present(n_budget_components, false);
  for (const FeatureRef& f : list_features(model))
    present[static_cast<std::size_t>(budget_component_of(f.kind))] = true;
  for (C c : {C::fixed_head, C::well, C::recharge, C::river, C::drain, C::external_head,
              C::evapotranspiration, C::leakage})
    if (present[static_cast<std::size_t>(c)]) layout.components.push_back(c);
  layout.volume_unit = model.length_unit + "3";
  layout.rate_unit = layout.volume_unit + "/" + model.time_unit;
  layout.clock = model_clock(model);
  return layout;
}

std::string budget_steps_csv(const BudgetTableLayout& layout,
                             const std::vector<BudgetStepRow>& rows) {
  std::string out = "period,step,time,dt,component,into_aquifer,out_of_aquifer,unit" +
                    date_header(layout.clock, "date") + "\n";
  for (const BudgetStepRow& row : rows)
    if (is_step(row))
      append_components(out, step_lead(row), layout, row.rates, layout.rate_unit,
                        date_cell(layout.clock, row.time));
  return out;
}

std::string budget_periods_csv(const BudgetTableLayout& layout,
                               const std::vector<BudgetPeriodRow>& rows) {
  std::string out = "period,period_name,start,end,component,into_aquifer,out_of_aquifer,unit" +
                    date_header(layout.clock, "start_date,end_date") + "\n";
  for (const BudgetPeriodRow& row : rows)
    append_components(out, period_lead(row), layout, row.volumes, layout.volume_unit,
                      date_cell(layout.clock, row.start) + date_cell(layout.clock, row.end));
  return out;
}

std::string balance_steps_csv(const std::vector<BudgetStepRow>& rows,
                              const std::optional<CalendarClock>& clock) {
  std::string out =
      "period,step,time,dt,into_aquifer,out_of_aquifer,imbalance_percent,newton_iterations,"
      "cutbacks,confined_cells,water_table_cells,dry_cells" +
      date_header(clock, "date") + "\n";
  for (const BudgetStepRow& row : rows) {
    if (!is_step(row)) continue;
    out += step_lead(row);
    append_in_out(out, {row.rates.total_in(), row.rates.total_out()});
    append_number(out, row.rates.imbalance_percent());
    fmt::format_to(std::back_inserter(out), ",{},{},{},{},{}{}\n", row.newton_iterations,
                   row.cutbacks, row.cells.confined, row.cells.water_table, row.cells.dry,
                   date_cell(clock, row.time));
  }
  return out;
}

std::string balance_periods_csv(const std::vector<BudgetPeriodRow>& rows,
                                const std::optional<CalendarClock>& clock) {
  std::string out = "period,period_name,start,end,into_aquifer,out_of_aquifer,imbalance_percent" +
                    date_header(clock, "start_date,end_date") + "\n";
  for (const BudgetPeriodRow& row : rows) {
    out += period_lead(row);
    append_in_out(out, {row.volumes.total_in(), row.volumes.total_out()});
    append_number(out, row.volumes.imbalance_percent());
    out += date_cell(clock, row.start) + date_cell(clock, row.end) + '\n';
  }
  return out;
}

std::string budget_features_csv(const std::vector<FeatureRef>& features,
                                const std::vector<BudgetPeriodRow>& rows,
                                const std::string& volume_unit,
                                const std::optional<CalendarClock>& clock) {
  std::string out = "period,period_name,feature,kind,into_aquifer,out_of_aquifer,unit" +
                    date_header(clock, "start_date,end_date") + "\n";
  for (const BudgetPeriodRow& row : rows) {
    if (row.volumes.features.size() != features.size()) {
      throw std::invalid_argument(
          fmt::format("budget of period {} has {} feature entries, the model lists {} features",
                      row.period, row.volumes.features.size(), features.size()));
    }
    for (std::size_t k = 0; k < features.size(); ++k) {
      fmt::format_to(std::back_inserter(out), "{},{},{},{}", row.period, csv_text(row.name),
                     csv_text(features[k].name), feature_kind_label(features[k].kind));
      append_in_out(out, row.volumes.features[k]);
      out += ',' + csv_text(volume_unit) + date_cell(clock, row.start) + date_cell(clock, row.end) +
             '\n';
    }
  }
  return out;
}

std::string observations_csv(const std::vector<Observation>& observations,
                             const std::vector<ObservationRow>& rows,
                             const std::optional<CalendarClock>& clock) {
  std::string out =
      "observation,period,step,time,head,drawdown" + date_header(clock, "date") + "\n";
  for (const ObservationRow& row : rows) {
    if (row.observation >= observations.size()) {
      throw std::invalid_argument(fmt::format("observation row refers to observation {} of {}",
                                              row.observation, observations.size()));
    }
    fmt::format_to(std::back_inserter(out), "{},{},{}",
                   csv_text(observations[row.observation].name), row.period, row.step);
    append_number(out, row.time);
    append_number(out, row.head);
    append_number(out, row.drawdown);
    out += date_cell(clock, row.time) + '\n';
  }
  return out;
}

std::string subsidence_points_csv(const std::vector<Observation>& points,
                                  const std::vector<SubsidenceRow>& rows,
                                  const std::optional<CalendarClock>& clock) {
  std::string out = "point,period,step,time,subsidence" + date_header(clock, "date") + "\n";
  for (const SubsidenceRow& row : rows) {
    if (row.point >= points.size())
      throw std::invalid_argument(
          fmt::format("subsidence row refers to point {} of {}", row.point, points.size()));
    fmt::format_to(std::back_inserter(out), "{},{},{}", csv_text(points[row.point].name),
                   row.period, row.step);
    append_number(out, row.time);
    append_number(out, row.subsidence);
    out += date_cell(clock, row.time) + '\n';
  }
  return out;
}

std::string subsidence_residuals_csv(const std::vector<Observation>& points,
                                     const std::vector<SubsidenceRow>& rows,
                                     const std::optional<CalendarClock>& clock) {
  std::string out = "point,time,measured,simulated,residual" + date_header(clock, "date") + "\n";
  for (std::size_t p = 0; p < points.size(); ++p) {
    if (points[p].measured.empty()) continue;
    std::vector<double> times, simulated;
    for (const SubsidenceRow& row : rows)
      if (row.point == p) times.push_back(row.time), simulated.push_back(row.subsidence);
    for (const HeadPair& pair : pair_measured_heads(points[p].measured, times, simulated)) {
      out += csv_text(points[p].name);
      append_number(out, pair.time);
      append_number(out, pair.measured);
      append_number(out, pair.simulated);
      append_number(out, pair.simulated - pair.measured);
      out += date_cell(clock, pair.time) + '\n';
    }
  }
  return out;
}

void write_budget_steps_csv(const std::filesystem::path& path, const BudgetTableLayout& layout,
                            const std::vector<BudgetStepRow>& rows) {
  write_file_atomically(path, budget_steps_csv(layout, rows));
}

void write_budget_periods_csv(const std::filesystem::path& path, const BudgetTableLayout& layout,
                              const std::vector<BudgetPeriodRow>& rows) {
  write_file_atomically(path, budget_periods_csv(layout, rows));
}

void write_balance_steps_csv(const std::filesystem::path& path,
                             const std::vector<BudgetStepRow>& rows,
                             const std::optional<CalendarClock>& clock) {
  write_file_atomically(path, balance_steps_csv(rows, clock));
}

void write_balance_periods_csv(const std::filesystem::path& path,
                               const std::vector<BudgetPeriodRow>& rows,
                               const std::optional<CalendarClock>& clock) {
  write_file_atomically(path, balance_periods_csv(rows, clock));
}

void write_budget_features_csv(const std::filesystem::path& path,
                               const std::vector<FeatureRef>& features,
                               const std::vector<BudgetPeriodRow>& rows,
                               const std::string& volume_unit,
                               const std::optional<CalendarClock>& clock) {
  write_file_atomically(path, budget_features_csv(features, rows, volume_unit, clock));
}

void write_observations_csv(const std::filesystem::path& path,
                            const std::vector<Observation>& observations,
                            const std::vector<ObservationRow>& rows,
                            const std::optional<CalendarClock>& clock) {
  write_file_atomically(path, observations_csv(observations, rows, clock));
}

void write_subsidence_csvs(const std::filesystem::path& folder,
                           const std::vector<Observation>& points,
                           const std::vector<SubsidenceRow>& rows,
                           const std::optional<CalendarClock>& clock) {
  write_file_atomically(folder / "subsidence_points.csv",
                        subsidence_points_csv(points, rows, clock));
  if (std::any_of(points.begin(), points.end(),
                  [](const Observation& p) { return !p.measured.empty(); }))
    write_file_atomically(folder / "subsidence_residuals.csv",
                          subsidence_residuals_csv(points, rows, clock));
}

}  // namespace aquiledger
