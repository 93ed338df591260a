#pragma once
// The CSV result tables (results contract version 2: names fixed by the format contract,
// every column defined in docs/results.md). Budgets are long tables, one row per component
// with its unit; the balance check of each step and period has tables of its own. Numbers
// are written in the shortest form that reads back to the same double. Every table is
// rewritten whole and atomically, so a crash leaves the last complete version.
#include <cstddef>
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "io/files/calendar.hpp"
#include "io/files/output_error.hpp"
#include "postproc/cell_fields.hpp"
#include "postproc/water_budget.hpp"
#include "solver/model.hpp"
#include "solver/stress_flows.hpp"

namespace aquiledger {

/// One accepted step: end-of-step rates (L3/T) and how the step went.
struct BudgetStepRow {
  std::size_t period = 0;  ///< 1-based as written
  int step = 0;            ///< 1-based
  double time = 0.0;       ///< T, end of the step
  double dt = 0.0;         ///< T
  WaterBudget rates;       ///< L3/T
  int newton_iterations = 0;
  int cutbacks = 0;       ///< step halvings before the step was accepted
  CellStateCounts cells;  ///< states of the active cells at the end of the step
};

/// One period: volumes over the period (L3).
struct BudgetPeriodRow {
  std::size_t period = 0;  ///< 1-based
  std::string name;
  double start = 0.0;   ///< T
  double end = 0.0;     ///< T
  WaterBudget volumes;  ///< L3; volumes.features has one entry per list_features(model)
};

/// One row of observations.csv.
struct ObservationRow {
  std::size_t observation = 0;  ///< 0-based index into the model's observations
  std::size_t period = 0;       ///< 1-based; 0 for the time-0 row
  int step = 0;                 ///< 1-based; 0 for the time-0 row
  double time = 0.0;            ///< T
  double head = 0.0;            ///< L
  double drawdown = 0.0;        ///< L, initial head minus head
};

/// Simulated subsidence at a subsidence point at one output time.
struct SubsidenceRow {
  std::size_t point = 0;    ///< 0-based index into the model's subsidence_points
  std::size_t period = 0;   ///< 1-based; 0 for the time-0 row
  int step = 0;             ///< 1-based; 0 for the time-0 row
  double time = 0.0;        ///< T
  double subsidence = 0.0;  ///< L, positive = the ground has sunk since time 0
};

/// Which components a model's budget tables list, and the units they are written in.
struct BudgetTableLayout {
  /// In the contract's order; `total` follows them in every table.
  std::vector<BudgetComponent> components;
  std::string rate_unit;    ///< e.g. "m3/d"
  std::string volume_unit;  ///< e.g. "m3"
  /// With a start date every table also gives dates: `date` (steps, observations) or
  /// `start_date,end_date` (periods) after its contract columns.
  std::optional<CalendarClock> clock;
};

/// Storage always (storage_skeleton and storage_water with the compressibility route,
/// storage_elastic otherwise; storage_drainage when the aquifer can drain, i.e. is not
/// confined), then the stress components of the feature kinds the model holds.
BudgetTableLayout budget_table_layout(const Model& model);

/// The CSV text of the tables (exposed for tests).
/// period,step,time,dt,component,into_aquifer,out_of_aquifer,unit
std::string budget_steps_csv(const BudgetTableLayout& layout,
                             const std::vector<BudgetStepRow>& rows);
/// period,period_name,start,end,component,into_aquifer,out_of_aquifer,unit
std::string budget_periods_csv(const BudgetTableLayout& layout,
                               const std::vector<BudgetPeriodRow>& rows);
/// period,step,time,dt,into_aquifer,out_of_aquifer,imbalance_percent,newton_iterations,
/// cutbacks,confined_cells,water_table_cells,dry_cells (rates of the step, L3/T)
std::string balance_steps_csv(const std::vector<BudgetStepRow>& rows,
                              const std::optional<CalendarClock>& clock = std::nullopt);
/// period,period_name,start,end,into_aquifer,out_of_aquifer,imbalance_percent (volumes, L3)
std::string balance_periods_csv(const std::vector<BudgetPeriodRow>& rows,
                                const std::optional<CalendarClock>& clock = std::nullopt);
/// period,period_name,feature,kind,into_aquifer,out_of_aquifer,unit: one row per feature
/// per period, volumes (into_aquifer: well injection, a losing river reach, ...).
std::string budget_features_csv(const std::vector<FeatureRef>& features,
                                const std::vector<BudgetPeriodRow>& rows,
                                const std::string& volume_unit,
                                const std::optional<CalendarClock>& clock = std::nullopt);
/// observation,period,step,time,head,drawdown; the observation column holds its name.
std::string observations_csv(const std::vector<Observation>& observations,
                             const std::vector<ObservationRow>& rows,
                             const std::optional<CalendarClock>& clock = std::nullopt);
/// point,period,step,time,subsidence; the point column holds its name.
std::string subsidence_points_csv(const std::vector<Observation>& points,
                                  const std::vector<SubsidenceRow>& rows,
                                  const std::optional<CalendarClock>& clock = std::nullopt);
/// point,time,measured,simulated,residual: each measured value of a point inside the rows'
/// times, paired with the simulated subsidence interpolated linearly in time
/// (pair_measured_heads); residual = simulated - measured (L).
std::string subsidence_residuals_csv(const std::vector<Observation>& points,
                                     const std::vector<SubsidenceRow>& rows,
                                     const std::optional<CalendarClock>& clock = std::nullopt);

/// The same, written atomically to path; throw OutputError naming the path on failure.
void write_budget_steps_csv(const std::filesystem::path& path, const BudgetTableLayout& layout,
                            const std::vector<BudgetStepRow>& rows);
void write_budget_periods_csv(const std::filesystem::path& path, const BudgetTableLayout& layout,
                              const std::vector<BudgetPeriodRow>& rows);
void write_balance_steps_csv(const std::filesystem::path& path,
                             const std::vector<BudgetStepRow>& rows,
                             const std::optional<CalendarClock>& clock = std::nullopt);
void write_balance_periods_csv(const std::filesystem::path& path,
                               const std::vector<BudgetPeriodRow>& rows,
                               const std::optional<CalendarClock>& clock = std::nullopt);
void write_budget_features_csv(const std::filesystem::path& path,
                               const std::vector<FeatureRef>& features,
                               const std::vector<BudgetPeriodRow>& rows,
                               const std::string& volume_unit,
                               const std::optional<CalendarClock>& clock = std::nullopt);
void write_observations_csv(const std::filesystem::path& path,
                            const std::vector<Observation>& observations,
                            const std::vector<ObservationRow>& rows,
                            const std::optional<CalendarClock>& clock = std::nullopt);
/// subsidence_points.csv and, when a point has measured values, subsidence_residuals.csv
/// into folder.
void write_subsidence_csvs(const std::filesystem::path& folder,
                           const std::vector<Observation>& points,
                           const std::vector<SubsidenceRow>& rows,
                           const std::optional<CalendarClock>& clock = std::nullopt);

}  // namespace aquiledger
