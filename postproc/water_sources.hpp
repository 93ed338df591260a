#pragma once
// Sources of water to wells (Theis, 1940; Barlow and Leake, 2012, USGS Circular 1376): the
// difference between a run with a chosen set of wells and one without them, component by
// component and feature by feature, per stress period and cumulatively, as shares of the
// water the chosen wells withdrew. Pure functions, no I/O.
//
// With N_c = in - out of a budget line c (storage: release - uptake), both runs close their
// budgets: sum_c N_c = E, the run's imbalance. The chosen wells' extra withdrawal is
// V = -(N_wells,with - N_wells,without), so
//     sum over every other line of (N_c,with - N_c,without) + (E_without - E_with) = V
// exactly: storage by mechanism, each river, drain, boundary, recharge, evapotranspiration and
// leakage feature, every other well (whose delivery changes when its cell runs dry) and the
// difference of the two runs' imbalances are the rows, and their shares of V sum to one.
#include <cstddef>
#include <span>
#include <string>
#include <vector>

#include "postproc/water_budget.hpp"
#include "solver/model.hpp"
#include "solver/simulation.hpp"
#include "solver/stress_flows.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

/// A feature as both runs list it (same order as WaterBudget::features of each period).
struct SourceFeature {
  std::string name;
  FeatureKind kind = FeatureKind::well;
  bool chosen = false;  ///< one of the wells whose water is traced
};

/// One stress period of the two runs (volumes in L3).
struct PeriodPair {
  std::string name;
  double start = 0.0;         ///< T
  double end = 0.0;           ///< T
  WaterBudget with_wells;     ///< L3, the run with the chosen wells
  WaterBudget without_wells;  ///< L3, the run without them
};

/// A row of the result: a storage mechanism, a feature, or the imbalance difference.
struct SourceLine {
  std::string source;   ///< storage_elastic, ..., river, drain, ..., well, imbalance
  std::string feature;  ///< the feature's name; empty for storage and imbalance
};

struct SourcePeriod {
  std::string name;
  double start = 0.0;                 ///< T
  double end = 0.0;                   ///< T
  double withdrawn = 0.0;             ///< L3, the chosen wells' extra withdrawal V
  double cumulative_withdrawn = 0.0;  ///< L3, V since the start
  std::vector<double> volume;         ///< L3 per line, positive = supplied to the wells
  std::vector<double> cumulative;     ///< L3 per line since the start
};

struct WaterSources {
  std::vector<SourceLine> lines;
  std::vector<SourcePeriod> periods;
};

/// Budget line of a storage mechanism, or "" for a component that is not storage.
std::string_view storage_source_label(BudgetComponent c);

/// The storage components listed by a model: skeleton and water with the compressibility
/// route, elastic otherwise; drainage unless every cell is confined.
std::vector<BudgetComponent> storage_components(const Model& model);

/// The sources table. features: as listed in every budget's features; storage: the storage
/// lines to report (others must be zero). Throws std::invalid_argument when the budgets do
/// not hold one entry per feature.
WaterSources water_sources(std::span<const SourceFeature> features,
                           std::span<const BudgetComponent> storage,
                           std::span<const PeriodPair> periods);

/// The group a line belongs to in summaries: "storage", "rivers and drains", "boundaries"
/// (fixed heads, external heads, leakage) or "other stresses" (recharge, evapotranspiration,
/// other wells, imbalance).
std::string_view source_group(std::string_view source);

/// Share of the chosen wells' withdrawal (NaN when nothing was withdrawn).
double share_of(double volume, double withdrawn);

/// The model with the chosen wells' rates set to zero in every period (the features keep
/// their order, so both runs' budgets line up).
Model without_wells(const Model& model, std::span<const std::size_t> chosen_wells);

/// The model starting from the given heads (L, per grid cell) instead of its initial state.
Model starting_from(const Model& model, std::vector<double> head);

/// Accumulates the volumes (L3) of every component and feature over each period of a run.
class PeriodVolumeObserver final : public SimulationObserver {
 public:
  explicit PeriodVolumeObserver(const Model& model);
  void initial_state(std::span<const double> head) override;
  void step_done(const StepInfo& info, std::span<const double> head_old,
                 std::span<const double> head_new) override;
  void period_done(std::size_t) override {}

  std::vector<double> initial;       ///< L, per grid cell
  std::vector<double> head;          ///< L, per grid cell, at the end of the last step
  std::vector<WaterBudget> periods;  ///< L3, one per period reached

 private:
  const Model& model_;
  SystemLayout layout_;
};

/// Both runs and their difference, as `aquiledger sources MODEL` computes it.
struct WaterSourcesRun {
  bool converged = true;
  std::string failure;  ///< which run failed and why
  WaterSources sources;
  std::vector<double> planned;    ///< L3 per period, the chosen wells' rate x period length
  std::vector<double> initial;    ///< L per grid cell, where both runs start
  std::vector<double> head_with;  ///< L per grid cell, end of the run with the wells
};

/// Runs the model without the chosen wells (indices into model.wells), then with them from
/// the same heads: the model's initial heads, or with [initial] steady the steady state of
/// the first period without the chosen wells.
WaterSourcesRun run_water_sources(const Model& model, std::span<const std::size_t> chosen_wells);

}  // namespace aquiledger
