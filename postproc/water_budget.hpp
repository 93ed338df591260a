#pragma once
#include <array>
#include <cstddef>
#include <span>
#include <string_view>
#include <vector>

#include "solver/model.hpp"
#include "solver/result_reduction.hpp"
#include "solver/stress_flows.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

/// Budget components (the `component` column of the budget tables; io/results/result_tables.hpp
/// lists them in the results contract's order).
enum class BudgetComponent {
  storage_skeleton,
  storage_water,
  storage_drainage,
  storage_elastic,
  interbed_recoverable,
  interbed_permanent,
  delay_bed_recoverable,
  delay_bed_permanent,
  fixed_head,
  well,
  recharge,
  river,
  drain,
  external_head,
  evapotranspiration,
  leakage
};
inline constexpr std::size_t n_budget_components = 16;

/// Name of a component in the results, e.g. "storage_skeleton" or "well".
std::string_view component_label(BudgetComponent c);

/// The component that holds the flows of a feature kind.
BudgetComponent budget_component_of(FeatureKind kind);

struct InOut {
  double in = 0.0;   ///< into the flow system (storage: released from storage)
  double out = 0.0;  ///< out of the flow system (storage: taken into storage)
};

/// Rates (L3/T) of one step, or volumes (L3) of one period.
struct WaterBudget {
  std::array<InOut, n_budget_components> components{};
  std::vector<InOut> features;  ///< one per list_features(model) entry
  double well_shortfall = 0.0;  ///< same unit as the components

  InOut& operator[](BudgetComponent c) { return components[static_cast<std::size_t>(c)]; }
  const InOut& operator[](BudgetComponent c) const {
    return components[static_cast<std::size_t>(c)];
  }
  double total_in() const;
  double total_out() const;
  /// 100 (in - out) / ((in + out) / 2); 0 when both are 0.
  double imbalance_percent() const;
  /// this += factor * other (turns rates into volumes with factor = dt).
  void add_scaled(const WaterBudget& other, double factor);
};

/// End-of-step rates of every component and feature for an accepted step.
/// Steady steps have no storage terms; dt is then ignored. preconsolidation: the interbeds'
/// preconsolidation heads at the step start (StepInfo::preconsolidation; empty without
/// interbeds). delay_elastic, delay_inelastic: the delay beds' release over the step (L per
/// unit plan area per cell, StepInfo::delay_bed_elastic and _inelastic; empty without delay
/// beds).
WaterBudget step_budget(const Model& model, const SystemLayout& layout, std::size_t period,
                        bool steady, double dt, std::span<const double> head_old,
                        std::span<const double> head_new,
                        std::span<const double> preconsolidation = {},
                        std::span<const double> delay_elastic = {},
                        std::span<const double> delay_inelastic = {});

/// The share of the cells a part owns (head_old and head_new must hold them and their
/// neighbours): summed over every part, the budget of the whole grid.
WaterBudget step_budget(const Model& model, const SystemLayout& layout, const GridPart& part,
                        std::size_t period, bool steady, double dt, CellValues head_old,
                        CellValues head_new, CellValues preconsolidation,
                        CellValues delay_elastic = std::span<const double>(),
                        CellValues delay_inelastic = std::span<const double>());

/// Replaces every rate of b (components, features, well shortfall) by its sum over the
/// processes of a distributed run.
void sum_across_processes(WaterBudget& b, ResultReduction& reduction);

}  // namespace aquiledger
