#pragma once
// The CSV result tables (column names fixed by the format contract). Numbers are written in
// the shortest form that reads back to the same double. Every table is rewritten whole and
// atomically, so a crash leaves the last complete version.
#include <cstddef>
#include <filesystem>
#include <string>
#include <vector>

#include "io/output_error.hpp"
#include "postproc/water_budget.hpp"
#include "solver/model.hpp"
#include "solver/stress_flows.hpp"

namespace aquiledger {

/// One row of budget_steps.csv: end-of-step rates (L3/T).
struct BudgetStepRow {
  std::size_t period = 0;  ///< 1-based as written; 0 for the time-0 row
  int step = 0;            ///< 1-based; 0 for the time-0 row
  double time = 0.0;       ///< T, end of the step
  double dt = 0.0;         ///< T
  WaterBudget rates;       ///< L3/T
};

/// One row of budget_periods.csv: volumes over the period (L3).
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

/// Header of a budget table after its leading columns: C_in,C_out for each component in
/// BudgetComponent order, then total_in,total_out,discrepancy_percent.
std::string budget_column_names();

/// The CSV text of the tables (exposed for tests and the terminal summary).
std::string budget_steps_csv(const std::vector<BudgetStepRow>& rows);
std::string budget_periods_csv(const std::vector<BudgetPeriodRow>& rows);
std::string budget_features_csv(const std::vector<FeatureRef>& features,
                                const std::vector<BudgetPeriodRow>& rows);
std::string observations_csv(const std::vector<Observation>& observations,
                             const std::vector<ObservationRow>& rows);

/// Columns period,step,time,dt, then budget_column_names().
void write_budget_steps_csv(const std::filesystem::path& path,
                            const std::vector<BudgetStepRow>& rows);
/// Columns period,name,start,end, then budget_column_names().
void write_budget_periods_csv(const std::filesystem::path& path,
                              const std::vector<BudgetPeriodRow>& rows);
/// Columns feature,kind,period,in,out: one row per feature per period, volumes (L3). in =
/// into the aquifer (a river's in is its losing reach, a well's in is injection).
void write_budget_features_csv(const std::filesystem::path& path,
                               const std::vector<FeatureRef>& features,
                               const std::vector<BudgetPeriodRow>& rows);
/// Columns observation,period,step,time,head,drawdown; the observation column holds the
/// observation's name.
void write_observations_csv(const std::filesystem::path& path,
                            const std::vector<Observation>& observations,
                            const std::vector<ObservationRow>& rows);

}  // namespace aquiledger
