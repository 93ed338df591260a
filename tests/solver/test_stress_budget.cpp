// Mass balance of whole runs with every stress active at once, accounted from the parts
// (storage function, face flows, per-feature stress flows) independently of the solver's
// residual.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <vector>

#include "solver/face_table.hpp"
#include "solver/simulation.hpp"
#include "solver/storage_function.hpp"
#include "solver/stress_flows.hpp"
#include "solver/system_layout.hpp"
#include "stress_test_models.hpp"

using namespace aquiledger;
using namespace aquiledger::stress_tests;

namespace {

/// A 10 x 12 switching aquifer starting confined (head 21 over a top at 20) with every kind
/// of stress, in three periods: transient, steady, transient with more pumping and a
/// negative recharge.
Model every_stress_model() {
  UniformAquifer a;
  a.condition = Condition::switching;
  a.top = 20.0;
  a.bottom = 0.0;
  a.k = 5.0;
  a.specific_storage = 1e-5;
  a.specific_yield = 0.15;
  a.initial_head = 21.0;
  Model m = uniform_model(10, 12, 100.0, 100.0, a);
  const RectilinearGrid& g = m.grid;
  auto column = [&](int col) {
    std::vector<CellIndex> cells;
    for (int r = 0; r < g.n_rows(); ++r) cells.push_back(g.cell(r, col));
    return cells;
  };
  auto per_period = [](std::vector<double> values) {
    std::vector<std::vector<double>> tables;
    std::vector<std::uint32_t> map;
    for (double v : values) {
      map.push_back(static_cast<std::uint32_t>(tables.size()));
      tables.push_back({v});
    }
    return PeriodValues(tables, map);
  };
  m.periods = {Period{"wet", 30.0, 10, 1.2, false}, Period{"steady", 10.0, 1, 1.0, true},
               Period{"dry", 100.0, 12, 1.3, false}};
  m.wells.push_back(Well{"supply", 550.0, 550.0, g.cell(4, 5), per_period({800.0, 800.0, 2500.0})});
  m.wells.push_back(Well{"injector", 950.0, 250.0, g.cell(7, 9), PeriodValues(-100.0)});
  m.fixed_heads.push_back(FixedHead{"lake", column(0), PeriodValues(18.0)});
  m.recharges.push_back(Recharge{"rain", all_cells(m), per_period({5e-4, 5e-4, -2e-4})});
  std::vector<CellIndex> river_cells = column(8);
  m.rivers.push_back(River{"creek", river_cells, std::vector<double>(river_cells.size(), 100.0),
                           PeriodValues(19.0), PeriodValues(17.5), PeriodValues(30.0)});
  m.drains.push_back(Drain{"tiles", {g.cell(0, 3), g.cell(0, 4), g.cell(0, 5), g.cell(0, 6)},
                           PeriodValues(20.5), PeriodValues(50.0)});
  m.external_heads.push_back(ExternalHead{"regional", column(11), PeriodValues(22.0), PeriodValues(20.0)});
  std::vector<CellIndex> meadow;
  for (int c = 1; c < 8; ++c) {
    meadow.push_back(g.cell(8, c));
    meadow.push_back(g.cell(9, c));
  }
  m.evapotranspiration.push_back(Evapotranspiration{"meadow", meadow, PeriodValues(21.0), PeriodValues(2e-3),
                                                    PeriodValues(2.0)});
  m.leakage = Leakage{"leakage", all_cells(m), PeriodValues(23.0), PeriodValues(1e-4)};
  return m;
}

struct Totals {
  double in = 0.0;   ///< L3/T
  double out = 0.0;  ///< L3/T
  void add(double q) { (q > 0.0 ? in : out) += std::abs(q); }
};

}  // namespace

TEST_CASE("budget closes at every step with every stress active", "[stress_budget]") {
  const Model m = every_stress_model();
  RecordingObserver recorder;
  const RunResult result = run_simulation(m, recorder);
  REQUIRE(result.converged);
  const SystemLayout layout = make_system_layout(m);
  const std::vector<Face> faces = make_face_table(m);
  const std::vector<FeatureRef> features = list_features(m);
  std::vector<int> active_steps(features.size() + 1, 0);  // the last entry: storage

  double worst = 0.0;
  for (const auto& step : recorder.steps) {
    Totals total;
    // Storage released over the step (physics decisions: A (W(h_old) - W(h_new)) / dt).
    if (!step.info.steady) {
      for (CellIndex c : layout.cell_of_unknown) {
        const auto i = static_cast<std::size_t>(c.value);
        const double release = -layout.area[i] * stored_water_change(cell_storage(m, c), step.head_old[i], step.head[i]).total() / step.info.dt;
        total.add(release);
        if (std::abs(release) > 0.0) active_steps.back() = 1;
      }
    }
    // Fixed heads: per fixed cell, the net flow into its unfixed active neighbours.
    std::vector<double> net(static_cast<std::size_t>(m.grid.n_cells()), 0.0);
    for (const Face& f : faces) {
      const auto i = static_cast<std::size_t>(f.i.value), j = static_cast<std::size_t>(f.j.value);
      if (layout.fixed[i] == layout.fixed[j]) continue;
      const double into_i = face_flow(m, layout, f.i, f.j, f.factor, step.head[i], step.head[j]).q;
      if (layout.fixed[j]) net[j] += into_i;
      else net[i] -= into_i;
    }
    for (double q : net) total.add(q);
    // Every other stress, feature by feature.
    std::vector<FeatureFlow> flows(features.size());
    stress_flows_by_feature(m, layout, step.info.period, step.head, flows);
    for (std::size_t k = 0; k < features.size(); ++k) {
      if (features[k].kind == FeatureKind::fixed_head) continue;
      total.in += flows[k].in;
      total.out += flows[k].out;
      if (flows[k].in + flows[k].out > 0.0) ++active_steps[k];
    }
    // Discrepancy as defined by the budget contract: 100 (in - out) / ((in + out) / 2).
    const double discrepancy = 100.0 * (total.in - total.out) / (0.5 * (total.in + total.out));
    worst = std::max(worst, std::abs(discrepancy));
    INFO("period " << step.info.period << " step " << step.info.step << " discrepancy " << discrepancy);
    // Contract (model-format "Rules in detail"): default tolerances close the budget of
    // every converged step to better than 1e-6 percent.
    CHECK(std::abs(discrepancy) < 1e-6);
  }
  WARN("worst discrepancy percent " << worst);
  // Every stress must really have acted (the test would be weaker otherwise).
  for (std::size_t k = 0; k < features.size(); ++k)
    if (features[k].kind != FeatureKind::fixed_head) CHECK(active_steps[k] > 0);
  CHECK(active_steps.back() == 1);
}
