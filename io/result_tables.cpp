#include "io/result_tables.hpp"

#include <fmt/format.h>

#include <iterator>
#include <stdexcept>
#include <string_view>

#include "io/atomic_file.hpp"

namespace aquiledger {
namespace {

/// A text field quoted as RFC 4180 asks when it holds a comma, quote or line break.
std::string csv_text(std::string_view text) {
  if (text.find_first_of(",\"\r\n") == std::string_view::npos) return std::string(text);
  std::string quoted = "\"";
  for (char ch : text) {
    if (ch == '"') quoted += '"';
    quoted += ch;
  }
  quoted += '"';
  return quoted;
}

/// fmt's "{}" for double is the shortest text that reads back to the same value.
void append_number(std::string& out, double value) {
  out += ',';
  fmt::format_to(std::back_inserter(out), "{}", value);
}

void append_budget(std::string& out, const WaterBudget& budget) {
  for (const InOut& c : budget.components) {
    append_number(out, c.in);
    append_number(out, c.out);
  }
  append_number(out, budget.total_in());
  append_number(out, budget.total_out());
  append_number(out, budget.discrepancy_percent());
  out += '\n';
}

}  // namespace

std::string budget_column_names() {
  std::string names;
  for (std::size_t i = 0; i < n_budget_components; ++i) {
    const std::string_view stem = component_label(static_cast<BudgetComponent>(i));
    fmt::format_to(std::back_inserter(names), ",{0}_in,{0}_out", stem);
  }
  names += ",total_in,total_out,discrepancy_percent";
  return names;
}

std::string budget_steps_csv(const std::vector<BudgetStepRow>& rows) {
  std::string out = "period,step,time,dt" + budget_column_names() + '\n';
  for (const BudgetStepRow& row : rows) {
    fmt::format_to(std::back_inserter(out), "{},{}", row.period, row.step);
    append_number(out, row.time);
    append_number(out, row.dt);
    append_budget(out, row.rates);
  }
  return out;
}

std::string budget_periods_csv(const std::vector<BudgetPeriodRow>& rows) {
  std::string out = "period,name,start,end" + budget_column_names() + '\n';
  for (const BudgetPeriodRow& row : rows) {
    fmt::format_to(std::back_inserter(out), "{},{}", row.period, csv_text(row.name));
    append_number(out, row.start);
    append_number(out, row.end);
    append_budget(out, row.volumes);
  }
  return out;
}

std::string budget_features_csv(const std::vector<FeatureRef>& features,
                                const std::vector<BudgetPeriodRow>& rows) {
  std::string out = "feature,kind,period,in,out\n";
  for (const BudgetPeriodRow& row : rows) {
    if (row.volumes.features.size() != features.size()) {
      throw std::invalid_argument(
          fmt::format("budget of period {} has {} feature entries, the model lists {} features",
                      row.period, row.volumes.features.size(), features.size()));
    }
    for (std::size_t k = 0; k < features.size(); ++k) {
      fmt::format_to(std::back_inserter(out), "{},{},{}", csv_text(features[k].name),
                     feature_kind_label(features[k].kind), row.period);
      append_number(out, row.volumes.features[k].in);
      append_number(out, row.volumes.features[k].out);
      out += '\n';
    }
  }
  return out;
}

std::string observations_csv(const std::vector<Observation>& observations,
                             const std::vector<ObservationRow>& rows) {
  std::string out = "observation,period,step,time,head,drawdown\n";
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
    out += '\n';
  }
  return out;
}

void write_budget_steps_csv(const std::filesystem::path& path,
                            const std::vector<BudgetStepRow>& rows) {
  write_file_atomically(path, budget_steps_csv(rows));
}

void write_budget_periods_csv(const std::filesystem::path& path,
                              const std::vector<BudgetPeriodRow>& rows) {
  write_file_atomically(path, budget_periods_csv(rows));
}

void write_budget_features_csv(const std::filesystem::path& path,
                               const std::vector<FeatureRef>& features,
                               const std::vector<BudgetPeriodRow>& rows) {
  write_file_atomically(path, budget_features_csv(features, rows));
}

void write_observations_csv(const std::filesystem::path& path,
                            const std::vector<Observation>& observations,
                            const std::vector<ObservationRow>& rows) {
  write_file_atomically(path, observations_csv(observations, rows));
}

}  // namespace aquiledger
