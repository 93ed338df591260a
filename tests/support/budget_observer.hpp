#pragma once
// An observer shared by the solver tests: it keeps every accepted step's heads and budget
// and checks each step's budget closure, the contract's promise that default tolerances
// close every converged step to better than 1e-6 percent (model format, "Rules in detail").
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "postproc/water_budget.hpp"
#include "solver/simulation.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger::test {

class BudgetObserver : public SimulationObserver {
 public:
  explicit BudgetObserver(const Model& model, bool keep_heads = true)
      : model_(model), layout_(make_system_layout(model)), keep_heads_(keep_heads) {}

  void initial_state(std::span<const double> head) override {
    initial.assign(head.begin(), head.end());
  }
  void step_done(const StepInfo& info, std::span<const double> head_old,
                 std::span<const double> head_new) override {
    steps.push_back(info);
    steps.back().preconsolidation = {};  // valid only during this call
    steps.back().delay_bed_elastic = steps.back().delay_bed_inelastic = {};
    preconsolidation.emplace_back(info.preconsolidation.begin(), info.preconsolidation.end());
    delay_elastic.emplace_back(info.delay_bed_elastic.begin(), info.delay_bed_elastic.end());
    delay_inelastic.emplace_back(info.delay_bed_inelastic.begin(), info.delay_bed_inelastic.end());
    const WaterBudget b =
        step_budget(model_, layout_, info.period, info.steady, info.dt, head_old, head_new,
                    info.preconsolidation, info.delay_bed_elastic, info.delay_bed_inelastic);
    const double d = b.imbalance_percent();
    max_imbalance = std::max(max_imbalance, std::abs(d));
    CHECK(std::abs(d) < 1e-6);
    budgets.push_back(b);
    if (keep_heads_) heads.emplace_back(head_new.begin(), head_new.end());
    last_head.assign(head_new.begin(), head_new.end());
    cumulative.add_scaled(b, info.dt);
  }
  void period_done(std::size_t period) override { periods_done.push_back(period); }

  const SystemLayout& layout() const { return layout_; }

  std::vector<double> initial;
  std::vector<StepInfo> steps;
  std::vector<WaterBudget> budgets;
  std::vector<std::vector<double>> heads;
  std::vector<std::vector<double>> preconsolidation;  ///< L, at each step's start
  /// L per unit area, the delay beds' release of each step (empty without delay beds).
  std::vector<std::vector<double>> delay_elastic, delay_inelastic;
  std::vector<double> last_head;
  std::vector<std::size_t> periods_done;
  WaterBudget cumulative;      ///< volumes (L3) since the start
  double max_imbalance = 0.0;  ///< percent

 private:
  const Model& model_;
  SystemLayout layout_;
  bool keep_heads_;
};

/// Checks two runs' values of one step cell by cell, bit for bit (NaN matching NaN, at
/// inactive cells).
inline void check_same_values(const std::vector<double>& a, const std::vector<double>& b) {
  REQUIRE(a.size() == b.size());
  for (std::size_t i = 0; i < a.size(); ++i)
    if (!std::isnan(a[i]) || !std::isnan(b[i])) CHECK(a[i] == b[i]);
}

/// Runs `model` again from `start` (a state the full run handed to its checkpoint callback)
/// into `resumed`, and checks that every step of it has, bit for bit, the heads of the same
/// step of the full run. Returns how many steps of the full run came before the start.
inline std::size_t resume_and_check_heads(const Model& model, const StartState& start,
                                          const BudgetObserver& full, BudgetObserver& resumed) {
  SimulationOptions again;
  again.start = start;
  REQUIRE(run_simulation(model, resumed, again).converged);
  REQUIRE(!resumed.steps.empty());
  const std::size_t skipped = full.steps.size() - resumed.steps.size();
  for (std::size_t k = 0; k < resumed.steps.size(); ++k)
    check_same_values(resumed.heads[k], full.heads[skipped + k]);
  return skipped;
}

}  // namespace aquiledger::test
