// Whole runs in which one head-dependent stress controls the result: a river disconnected
// from a falling water level, and evapotranspiration draining a closed water-table aquifer.
#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "solver/simulation.hpp"
#include "solver/stress_flows.hpp"
#include "solver/system_layout.hpp"
#include "stress_test_models.hpp"

using namespace aquiledger;
using namespace aquiledger::stress_tests;

TEST_CASE("a disconnected losing river seeps at a fixed rate however far the head falls",
          "[stress_runs]") {
  // One row of 21 cells of 100 m, confined (T constant, so the head may fall far below the
  // river bed), the river in the west cell, a well withdrawing more than the river can give
  // in the east cell: the head at the river falls ever further below the bed bottom.
  UniformAquifer a;
  a.condition = Condition::confined;
  a.top = 0.0;
  a.bottom = -10.0;
  a.k = 10.0;
  a.specific_storage = 1e-4;
  a.initial_head = 10.0;
  Model m = uniform_model(1, 21, 100.0, 100.0, a);
  const double stage = 6.0, bed_bottom = 5.0, conductance = 10.0;
  m.rivers.push_back(River{"creek",
                           {CellIndex{0}},
                           {100.0},
                           PeriodValues(stage),
                           PeriodValues(bed_bottom),
                           PeriodValues(conductance)});
  m.wells.push_back(Well{"well", 2050.0, 50.0, CellIndex{20}, PeriodValues(500.0)});
  m.periods = {Period{"pumping", 50.0, 50, 1.0, false}};

  RecordingObserver recorder;
  REQUIRE(run_simulation(m, recorder).converged);
  const SystemLayout layout = make_system_layout(m);
  int disconnected_steps = 0;
  double lowest = a.initial_head;
  for (const auto& step : recorder.steps) {
    const double h = step.head[0];
    std::vector<FeatureFlow> flows(2);
    stress_flows_by_feature(m, layout, 0, step.head, flows);
    if (h < bed_bottom) {
      ++disconnected_steps;
      lowest = std::min(lowest, h);
      // Disconnected river (project contract, model-format "river": below the bed bottom
      // seepage no longer grows): C (stage - bed bottom), exactly.
      CHECK(flows[1].in == Approx(conductance * (stage - bed_bottom)).epsilon(1e-14));
      CHECK(flows[1].out == 0.0);
    } else if (h > bed_bottom + layout.smoothing_length[0]) {
      // Connected: Darcy flow across the bed, C (stage - h) (common practice).
      CHECK(flows[1].in - flows[1].out == Approx(conductance * (stage - h)).epsilon(1e-12));
    }
  }
  CHECK(disconnected_steps > 20);
  CHECK(lowest < bed_bottom - 50.0);  // the head fell far below the bed
}

TEST_CASE("evapotranspiration drains a closed water-table aquifer exponentially", "[stress_runs]") {
  // A closed 3 x 3 water-table aquifer, uniform, so no water moves between cells. Between
  // the extinction level z0 = surface - d and the surface, the linear rate-depth law makes
  // mass balance per unit area read Sy dh/dt = -R (h - z0) / d, whence (derived here)
  //   h(t) - z0 = (h0 - z0) exp(-a t),  a = R / (Sy d).
  // The implicit (backward Euler) step of the same balance gives exactly
  //   h_n - z0 = (h_{n-1} - z0) / (1 + a dt).
  UniformAquifer a;
  a.condition = Condition::water_table;
  a.top = std::nan("");
  a.bottom = 0.0;
  a.k = 5.0;
  a.specific_yield = 0.2;
  a.initial_head = 19.5;
  Model m = uniform_model(3, 3, 100.0, 100.0, a);
  const double surface = 20.0, depth = 3.0, max_rate = 3e-3, z0 = surface - depth;
  m.evapotranspiration.push_back(Evapotranspiration{"meadow", all_cells(m), PeriodValues(surface),
                                                    PeriodValues(max_rate), PeriodValues(depth)});
  const double decay = max_rate / (a.specific_yield * depth);  // 5e-3 1/d
  // 2000 steps of 0.2 d: a dt = 1e-3, a t = 2 at the end; h - z0 falls from 2.5 to 0.34 m,
  // staying far above the smoothing interval [z0, z0 + 0.01 m].
  m.periods = {Period{"dry", 400.0, 2000, 1.0, false}};

  RecordingObserver recorder;
  REQUIRE(run_simulation(m, recorder).converged);
  REQUIRE(recorder.steps.size() == 2000);
  double worst_discrete = 0.0, worst_continuous = 0.0;
  for (const auto& step : recorder.steps) {
    const double dt = step.info.dt, t = step.info.time;
    for (std::size_t i = 0; i < 9; ++i) {
      const double excess = step.head[i] - z0;
      const double discrete = (step.head_old[i] - z0) / (1.0 + decay * dt);
      const double exact = (a.initial_head - z0) * std::exp(-decay * t);
      worst_discrete = std::max(worst_discrete, std::abs(excess - discrete) / excess);
      worst_continuous = std::max(worst_continuous, std::abs(excess - exact) / exact);
    }
  }
  // The law is linear between its kinks, so Newton's first iterate solves the step to
  // round-off; 1e-9 relative leaves room for a few hundred ulps of h ~ 20 m.
  CHECK(worst_discrete < 1e-9);
  // (1 + x)^-n against exp(-n x): relative gap n x^2 / 2 = (a t)(a dt) / 2 = 1e-3 at the end
  // (first-order time error of the implicit step); 10 % margin over that bound.
  CHECK(worst_continuous < 1.1 * 2.0 * 1e-3 / 2.0);
  WARN("ET worst discrete " << worst_discrete << " continuous " << worst_continuous);
}
