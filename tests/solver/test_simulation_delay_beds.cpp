// Delay beds in whole runs (docs/subsidence.md, "Delay beds"): Terzaghi's (1925) degree of
// consolidation through the model after a step change of the aquifer's head, budget closure
// with every mechanism active, and a resumed run that repeats the uninterrupted one.
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "postproc/water_budget.hpp"
#include "solver/simulation.hpp"
#include "stress_test_models.hpp"
#include "support/budget_observer.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {

/// Degree of consolidation U(Tv) of a layer drained on both faces after a step change of
/// head at its faces (Terzaghi, 1925): U = 1 - sum_m 8 / ((2m+1)^2 pi^2)
/// exp(-(2m+1)^2 pi^2 Tv / 4), Tv = cv t / H^2, H = half the thickness.
double terzaghi_series_u(double tv) {
  double sum = 0.0;
  for (int m = 0; m < 2000; ++m) {
    const double k = (2.0 * m + 1.0) * M_PI;
    sum += 8.0 / (k * k) * std::exp(-k * k * tv / 4.0);
  }
  return 1.0 - sum;
}

constexpr double cell_area = 100.0 * 100.0;  // L2
constexpr double bed_b = 4.0, bed_kv = 1e-4, bed_ske = 1e-5, bed_skv = 4e-4;
constexpr int bed_nodes = 100;
constexpr double dtv = 1e-4;  // Tv per step

/// One confined cell with one delay bed, its head held at 19 by an external head of huge
/// conductance from t = 0 (it starts at 20 with the bed): a step change of 1 m at the bed's
/// faces. pc_offset: the preconsolidation head below the initial head (0: every node goes
/// below it at once and consolidates with Skv; large: elastic only, Ske). Periods end at the
/// given Tv with steps of dtv.
Model step_change_model(double pc_offset, double skeletal, const std::vector<double>& tv_ends) {
  test::AquiferSpec a;
  a.specific_storage = 1e-6;
  a.top = 10.0;
  a.bottom = 0.0;
  a.initial_head = 20.0;
  Model m = test::make_model({100.0}, {100.0}, a);
  const double cv = bed_kv / skeletal, half = 0.5 * bed_b;
  double tv = 0.0;
  for (double end : tv_ends) {
    const int steps = static_cast<int>(std::lround((end - tv) / dtv));
    test::add_period(m, (end - tv) * half * half / cv, steps);
    tv = end;
  }
  // Conductance 1e8 m2/d: the bed's largest flow (200 m3/d in the first step) moves the
  // cell's head by 2e-6 m, far below the tolerances below.
  m.external_heads.push_back(
      ExternalHead{"held", {m.grid.cell(0, 0)}, PeriodValues(19.0), PeriodValues(1e8)});
  test::add_interbeds(m, 0.0, 1e-5, 4e-4, pc_offset);
  test::add_delay_beds(m, 1.0, bed_b, bed_kv, bed_ske, bed_skv, bed_nodes);
  m.solver.threads = 1;  // one cell: threads would only wait for each other
  return m;
}

/// The delay beds' release of cell 0 at each step (L per unit area) and its head. The budget
/// closure is not checked here: with a conductance of 1e8 m2/d, the head's rounding
/// (2^-52 x 19 m) alone moves the boundary's flow by 4e-7 m3/d, above 1e-8 of the late,
/// small flows; the closure test below covers the beds' budget.
class ReleaseObserver : public SimulationObserver {
 public:
  struct Step {
    std::size_t period;
    double elastic, inelastic, head;
  };
  std::vector<Step> steps;
  void initial_state(std::span<const double>) override {}
  void step_done(const StepInfo& info, std::span<const double>,
                 std::span<const double> head_new) override {
    REQUIRE(info.delay_bed_elastic.size() == 1);
    steps.push_back(
        {info.period, info.delay_bed_elastic[0], info.delay_bed_inelastic[0], head_new[0]});
  }
  void period_done(std::size_t) override {}
};

}  // namespace

TEST_CASE("delay beds: Terzaghi's degree of consolidation through a whole run", "[delay_beds]") {
  const std::vector<double> ends = {0.01, 0.05, 0.1, 0.197, 0.5, 0.848, 1.0};
  struct Case {
    double pc_offset, skeletal;
    bool elastic;
  };
  for (const Case& c : {Case{1000.0, bed_ske, true}, Case{0.0, bed_skv, false}}) {
    const Model m = step_change_model(c.pc_offset, c.skeletal, ends);
    ReleaseObserver obs;
    REQUIRE(run_simulation(m, obs).converged);
    // U at the end of each period: the beds' release over its final value Sk b (1 m).
    std::vector<double> u(ends.size(), 0.0);
    double released = 0.0, other = 0.0;
    for (const auto& s : obs.steps) {
      released += c.elastic ? s.elastic : s.inelastic;
      other += std::abs(c.elastic ? s.inelastic : s.elastic);
      u[s.period] = released / (c.skeletal * bed_b * 1.0);
      // The head is held, to 3e-5 m: the aquifer's own storage (0.1 m3 per m) released over
      // the first step (4e-5 d) is 2500 m3/d, over a conductance of 1e8 m2/d.
      CHECK(std::abs(s.head - 19.0) < 3e-5);
    }
    // Elastic only above pc, inelastic only below: the other branch releases nothing.
    CHECK(other == 0.0);
    for (std::size_t p = 0; p < ends.size(); ++p) {
      INFO("Tv = " << ends[p] << (c.elastic ? " (elastic)" : " (inelastic)"));
      // The series, computed here. Backward Euler with Tv steps of 1e-4 on 100 slices of
      // the half-bed: error measured -2.1e-4 at Tv = 0.01, -9.5e-5 at 0.05, -2.6e-5 to
      // -6.7e-5 later, the same on both branches (first order in time, largest early, as in
      // the bed's own test); tolerance 5e-4.
      CHECK(u[p] == Approx(terzaghi_series_u(ends[p])).margin(5e-4));
    }
    // The table of U against Tv of soil-mechanics texts (from memory): U = 50 % at
    // Tv = 0.197 and 90 % at Tv = 0.848, given to three digits.
    CHECK(u[3] == Approx(0.50).margin(1.5e-3));
    CHECK(u[5] == Approx(0.90).margin(1.5e-3));
  }
}

namespace {

/// The every-stress switching basin (wet, steady and dry periods, wells pumping and
/// injecting, fixed heads, rivers, drains, ET, leakage) with a fourth period of recovery
/// (the supply well off, recharge back), no-delay beds and two delay beds in every cell.
Model every_mechanism_model() {
  Model m = stress_tests::every_stress_model();
  m.periods.push_back(Period{"recovery", 200.0, 12, 1.3, false});
  m.wells[0].rate = PeriodValues({{800.0}, {2500.0}, {0.0}}, {0, 0, 1, 2});
  m.recharges[0].rate = PeriodValues({{5e-4}, {-2e-4}}, {0, 0, 1, 0});
  // Beds 6 m thick, pc 0.2 m below the initial head, so the pumped cells cross it; two delay
  // beds of 1.5 m (Kv 1e-3 m/d, Ske 2e-5, Skv 6e-4 1/m), 10 slices a half.
  test::add_interbeds(m, 6.0, 2e-5, 5e-4, 0.2);
  test::add_delay_beds(m, 2.0, 1.5, 1e-3, 2e-5, 6e-4, 10);
  return m;
}

}  // namespace

TEST_CASE("delay beds: budget closes at every step with every mechanism active",
          "[delay_beds][stress_budget]") {
  const Model m = every_mechanism_model();
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  const InOut perm = obs.cumulative[BudgetComponent::delay_bed_permanent];
  const InOut rec = obs.cumulative[BudgetComponent::delay_bed_recoverable];
  CHECK(perm.in > 0.0);  // some beds were driven below pc ...
  CHECK(rec.out > 0.0);  // ... and some took water back on recovery
  CHECK(perm.out == 0.0);
  CHECK(obs.cumulative[BudgetComponent::interbed_permanent].in > 0.0);
  // Some cells switched between confined and water table (switching basin).
  bool confined = false, unconfined = false;
  for (const auto& h : obs.heads)
    for (double v : h) {
      if (std::isnan(v)) continue;
      confined |= v >= 20.0;
      unconfined |= v < 20.0;
    }
  CHECK((confined && unconfined));
  // BudgetObserver checks every step closes below 1e-6 percent (model format contract).
  CHECK(obs.max_imbalance < 1e-6);
}

TEST_CASE("delay beds: a resumed run repeats the uninterrupted one bit for bit",
          "[delay_beds][checkpoint]") {
  const Model m = every_mechanism_model();
  test::BudgetObserver full(m);
  std::vector<StartState> states;
  SimulationOptions options;
  options.checkpoint_every = 5;
  options.checkpoint = [&](const StartState& s) { states.push_back(s); };
  REQUIRE(run_simulation(m, full, options).converged);
  REQUIRE(states.size() >= 3);
  const StartState& start = states[2];
  REQUIRE_FALSE(start.delay_bed_heads.empty());
  REQUIRE(start.delay_bed_preconsolidation.size() == start.delay_bed_heads.size());
  test::BudgetObserver resumed(m);
  const std::size_t skipped = test::resume_and_check_heads(m, start, full, resumed);
  for (std::size_t k = 0; k < resumed.steps.size(); ++k) {
    CHECK(resumed.delay_inelastic[k] == full.delay_inelastic[skipped + k]);
    CHECK(resumed.delay_elastic[k] == full.delay_elastic[skipped + k]);
  }
  // A start state without the beds' node state is refused, saying why.
  SimulationOptions bare;
  bare.start = start;
  bare.start->delay_bed_heads.clear();
  test::BudgetObserver refused(m);
  const RunResult r = run_simulation(m, refused, bare);
  CHECK_FALSE(r.converged);
}
