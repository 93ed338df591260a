// No-delay interbeds in whole runs: compaction through pumping and recovery cycles against
// the preconsolidation-head law, and budget closure with every mechanism active.
#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "postproc/cell_fields.hpp"
#include "postproc/water_budget.hpp"
#include "solver/simulation.hpp"
#include "stress_test_models.hpp"
#include "support/budget_observer.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {

/// One confined cell of plan area A with a well: what the well takes comes from storage
/// alone, so the head path follows from the storage law. The law (Terzaghi, 1925, one-
/// dimensional consolidation, with the preconsolidation head as the memory of the lowest
/// head; Jacob, 1940, for the aquifer's own elastic storage S): per unit decline of head,
/// A (S + Ske b) above the preconsolidation head pc and A (S + Skv b) below it; pc is
/// lowered to the lowest head reached; a rise stores A (S + Ske b) per unit rise.
struct Cell {
  double area, s, ske_b, skv_b;
  double head, pc;
  double permanent = 0.0;    ///< L3 released by the beds' inelastic part
  double recoverable = 0.0;  ///< L3 released (net) by the beds' elastic part

  /// The well takes volume v (L3; negative: injects) from storage.
  void take(double v) {
    const double above = area * (s + ske_b);  // L2
    const double below = area * (s + skv_b);  // L2
    if (v <= 0.0) {
      const double rise = -v / above;
      recoverable -= area * ske_b * rise;
      head += rise;
      return;
    }
    const double elastic_room = (head - pc) * above;  // head >= pc always
    if (v <= elastic_room) {
      recoverable += area * ske_b * v / above;
      head -= v / above;
      return;
    }
    recoverable += area * ske_b * (head - pc);
    const double drop = (v - elastic_room) / below;
    permanent += area * skv_b * drop;
    head = pc - drop;
    pc = head;
  }
};

constexpr double area = 100.0 * 100.0;  // L2
constexpr double ss = 1e-5, thickness = 10.0;
constexpr double bed = 5.0, ske = 1e-5, skv = 4e-4, offset = 1.0;

Model one_cell(const std::vector<double>& rates, int steps) {
  test::AquiferSpec a;
  a.specific_storage = ss;
  a.top = thickness;
  a.bottom = 0.0;
  a.initial_head = 20.0;
  Model m = test::make_model({100.0}, {100.0}, a);
  for (std::size_t p = 0; p < rates.size(); ++p) test::add_period(m, 10.0, steps);
  test::add_well(m, 0, 0, rates);
  test::add_interbeds(m, bed, ske, skv, offset);
  return m;
}

}  // namespace

TEST_CASE("interbeds: compaction Skv b dh below pc, Ske b dh above, through cycles",
          "[interbeds]") {
  // Pump (head falls through pc), inject (recovers 2 m, elastic only), pump again (first
  // through the elastic range, then below the previous low), inject, pump less than the
  // recovery (never below the low: no further permanent compaction).
  const std::vector<double> rates = {10.0, -0.3, 1.0, -0.3, 0.2};  // L3/T, + = withdrawal
  for (int steps : {1, 7}) {
    const Model m = one_cell(rates, steps);
    test::BudgetObserver obs(m);
    REQUIRE(run_simulation(m, obs).converged);
    Cell cell{area, ss * thickness, ske * bed, skv * bed, 20.0, 20.0 - offset};
    double permanent_run = 0.0, recoverable_run = 0.0;
    std::size_t step = 0;
    for (std::size_t p = 0; p < rates.size(); ++p) {
      for (int k = 0; k < steps; ++k, ++step) {
        const StepInfo& info = obs.steps[step];
        const double low_before = cell.pc;
        CHECK(obs.preconsolidation[step][0] == Approx(low_before).epsilon(1e-12));
        cell.take(rates[p] * info.dt);
        const WaterBudget& b = obs.budgets[step];
        const InOut perm = b[BudgetComponent::interbed_permanent];
        const InOut rec = b[BudgetComponent::interbed_recoverable];
        permanent_run += (perm.in - perm.out) * info.dt;
        recoverable_run += (rec.in - rec.out) * info.dt;
        // Permanent compaction only on first loading: never taken back in.
        CHECK(perm.out == 0.0);
        if (cell.head >= low_before) CHECK(perm.in == 0.0);
        CHECK(obs.heads[step][0] == Approx(cell.head).epsilon(1e-10));
      }
      CHECK(permanent_run == Approx(cell.permanent).epsilon(1e-9));
      CHECK(recoverable_run == Approx(cell.recoverable).epsilon(1e-9).margin(1e-9));
    }
    // The permanent part is Skv b (pc0 - lowest head) per unit area: compaction (L).
    CHECK(permanent_run / area == Approx(skv * bed * (20.0 - offset - cell.pc)).epsilon(1e-9));
    // The cell fields: compaction of the beds, subsidence and the preconsolidation head.
    const SystemLayout& layout = obs.layout();
    CellFields f = initial_cell_fields(m, layout, obs.initial);
    CHECK(f.preconsolidation_head[0] == 20.0 - offset);
    std::vector<double> old = obs.initial;
    for (std::size_t k = 0; k < obs.steps.size(); ++k) {
      update_cell_fields(m, layout, false, obs.steps[k].dt, obs.initial, old, obs.heads[k], f,
                         obs.preconsolidation[k]);
      old = obs.heads[k];
    }
    CHECK(f.interbed_inelastic_compaction[0] == Approx(cell.permanent / area).epsilon(1e-9));
    CHECK(f.interbed_elastic_compaction[0] ==
          Approx(ske * bed * ((20.0 - (20.0 - offset)) - (cell.head - cell.pc))).epsilon(1e-9));
    CHECK(f.preconsolidation_head[0] == Approx(cell.pc).epsilon(1e-12));
    // Specific storage given directly: compaction is the whole elastic release S (h0 - h).
    CHECK(f.subsidence[0] ==
          Approx(f.interbed_elastic_compaction[0] + f.interbed_inelastic_compaction[0] +
                 ss * thickness * (20.0 - cell.head))
              .epsilon(1e-9));
    CHECK(cell.pc < 20.0 - offset - 4.0);  // the cycles did reach far below pc0
  }
}

TEST_CASE("interbeds: budget closes at every step with every stress active",
          "[interbeds][stress_budget]") {
  Model m = stress_tests::every_stress_model();
  // Beds 6 m thick, pc 0.2 m below the initial head, so the pumped cells cross it.
  test::add_interbeds(m, 6.0, 2e-5, 5e-4, 0.2);
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  const InOut perm = obs.cumulative[BudgetComponent::interbed_permanent];
  const InOut rec = obs.cumulative[BudgetComponent::interbed_recoverable];
  CHECK(perm.in > 0.0);  // some cells went below pc ...
  CHECK(rec.out > 0.0);  // ... and some rose again
  CHECK(perm.out == 0.0);
  // BudgetObserver checks every step closes below 1e-6 percent (model format contract).
  CHECK(obs.max_imbalance < 1e-6);
}

TEST_CASE("interbeds: a run resumed from a checkpoint repeats the uninterrupted one",
          "[interbeds][checkpoint]") {
  // The preconsolidation heads are part of the state (docs/subsidence.md): without them a
  // resumed run would put the kink back at the initial pc and differ.
  Model m = stress_tests::every_stress_model();
  test::add_interbeds(m, 6.0, 2e-5, 5e-4, 0.2);
  test::BudgetObserver full(m);
  std::vector<StartState> states;
  SimulationOptions options;
  options.checkpoint_every = 4;
  options.checkpoint = [&](const StartState& s) { states.push_back(s); };
  REQUIRE(run_simulation(m, full, options).converged);
  REQUIRE(states.size() >= 2);
  const StartState& start = states[1];
  REQUIRE(start.preconsolidation.size() == static_cast<std::size_t>(m.grid.n_cells()));
  // Some pc has already fallen below its initial value at the checkpoint.
  bool lowered = false;
  for (std::size_t i = 0; i < full.initial.size(); ++i)
    lowered |= start.preconsolidation[i] < full.initial[i] - 0.2 - 1e-9;
  CHECK(lowered);
  test::BudgetObserver resumed(m);
  const std::size_t skipped = test::resume_and_check_heads(m, start, full, resumed);
  for (std::size_t k = 0; k < resumed.steps.size(); ++k)
    test::check_same_values(resumed.preconsolidation[k], full.preconsolidation[skipped + k]);
  // A start state without preconsolidation heads is refused, saying why.
  SimulationOptions bare;
  bare.start = start;
  bare.start->preconsolidation.clear();
  test::BudgetObserver refused(m);
  const RunResult r = run_simulation(m, refused, bare);
  CHECK_FALSE(r.converged);
  CHECK(r.failure.find("preconsolidation") != std::string::npos);
}
