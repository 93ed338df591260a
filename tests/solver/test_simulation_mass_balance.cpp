// Mass balance of whole runs with every stress active at once, accounted from the parts
// (storage function, face flows, per-feature stress flows) independently of the solver's
// residual.
#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "postproc/water_budget.hpp"
#include "solver/face_table.hpp"
#include "solver/flow_system.hpp"
#include "solver/simulation.hpp"
#include "solver/storage_function.hpp"
#include "solver/stress_flows.hpp"
#include "solver/system_layout.hpp"
#include "stress_test_models.hpp"

using namespace aquiledger;
using namespace aquiledger::stress_tests;

namespace {

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
  bool disconnected = false, drained = false, confined = false;
  for (const auto& step : recorder.steps) {
    for (CellIndex c : m.rivers[0].cells)
      disconnected |= step.head[static_cast<std::size_t>(c.value)] < 18.5;
    for (CellIndex c : layout.cell_of_unknown) {
      drained |= step.head[static_cast<std::size_t>(c.value)] < 20.0;
      confined |= step.head[static_cast<std::size_t>(c.value)] > 20.0;
    }
    Totals total;
    double elastic_net = 0.0;  // L3/T released from elastic storage
    // Storage released over the step (physics decisions: A (W(h_old) - W(h_new)) / dt).
    if (!step.info.steady) {
      for (CellIndex c : layout.cell_of_unknown) {
        const auto i = static_cast<std::size_t>(c.value);
        const double release =
            -layout.area[i] *
            stored_water_change(cell_storage(m, c), step.head_old[i], step.head[i]).total() /
            step.info.dt;
        total.add(release);
        elastic_net +=
            -layout.area[i] *
            stored_water_change(cell_storage(m, c), step.head_old[i], step.head[i]).elastic /
            step.info.dt;
        if (std::abs(release) > 0.0) active_steps.back() = 1;
      }
    }
    // Fixed heads: per fixed cell, the net flow into its unfixed active neighbours.
    std::vector<double> net(static_cast<std::size_t>(m.grid.n_cells()), 0.0);
    for (const Face& f : faces) {
      const auto i = static_cast<std::size_t>(f.i.value), j = static_cast<std::size_t>(f.j.value);
      if (layout.fixed[i] == layout.fixed[j]) continue;
      const double into_i = face_flow(m, layout, f.i, f.j, f.factor, step.head[i], step.head[j]).q;
      if (layout.fixed[j])
        net[j] += into_i;
      else
        net[i] -= into_i;
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
    INFO("period " << step.info.period << " step " << step.info.step << " discrepancy "
                   << discrepancy);
    // Contract (model-format "Rules in detail"): default tolerances close the budget of
    // every converged step to better than 1e-6 percent.
    CHECK(std::abs(discrepancy) < 1e-6);

    // The budget of record (postproc) agrees with this independent accounting, and its
    // per-feature rows add up to its component columns.
    const WaterBudget b = step_budget(m, layout, step.info.period, step.info.steady, step.info.dt,
                                      step.head_old, step.head);
    CHECK(std::abs(b.imbalance_percent()) < 1e-6);
    CHECK(b.total_in() == Approx(total.in).epsilon(1e-12));
    CHECK(b.total_out() == Approx(total.out).epsilon(1e-12));
    const double skeleton =
        b[BudgetComponent::storage_skeleton].in - b[BudgetComponent::storage_skeleton].out;
    const double water =
        b[BudgetComponent::storage_water].in - b[BudgetComponent::storage_water].out;
    CHECK(skeleton + water == Approx(elastic_net).margin(1e-12 * total.in));
    CHECK(skeleton == Approx(0.6 * (skeleton + water)).margin(1e-12 * total.in));
    CHECK(b[BudgetComponent::storage_elastic].in + b[BudgetComponent::storage_elastic].out == 0.0);
    const std::pair<FeatureKind, BudgetComponent> kinds[] = {
        {FeatureKind::well, BudgetComponent::well},
        {FeatureKind::fixed_head, BudgetComponent::fixed_head},
        {FeatureKind::recharge, BudgetComponent::recharge},
        {FeatureKind::river, BudgetComponent::river},
        {FeatureKind::drain, BudgetComponent::drain},
        {FeatureKind::external_head, BudgetComponent::external_head},
        {FeatureKind::evapotranspiration, BudgetComponent::evapotranspiration},
        {FeatureKind::leakage, BudgetComponent::leakage}};
    for (const auto& [kind, component] : kinds) {
      InOut sum;
      for (std::size_t k = 0; k < features.size(); ++k)
        if (features[k].kind == kind) {
          sum.in += b.features[k].in;
          sum.out += b.features[k].out;
        }
      CHECK(sum.in == Approx(b[component].in).margin(1e-12 * total.in));
      CHECK(sum.out == Approx(b[component].out).margin(1e-12 * total.in));
    }
    CHECK(b.well_shortfall == Approx(flows[0].shortfall + flows[1].shortfall).margin(1e-12));
  }
  WARN("worst discrepancy percent " << worst);
  // Every stress must really have acted (the test would be weaker otherwise).
  for (std::size_t k = 0; k < features.size(); ++k)
    if (features[k].kind != FeatureKind::fixed_head) CHECK(active_steps[k] > 0);
  CHECK(active_steps.back() == 1);
  // Both regimes of the switching cells and the disconnected river branch were visited.
  CHECK(disconnected);
  CHECK(drained);
  CHECK(confined);
}

TEST_CASE("Jacobian matches finite differences along a run with every stress", "[stress_budget]") {
  // At accepted states of the run (cells confined, drained below the top, disconnected
  // under the river, drains and ET partly active), -dR/dh assembled by the flow system
  // against central differences of its residual. Step 1e-7: truncation ~ 1e-14 |d3R/dh3|,
  // rounding ~ 1e-16 |R| / 1e-7; where a head sits within 1e-7 of a smoothing end the C1
  // kink adds ~ 1e-7 C / delta = 1.5e-4, below the 1e-5 relative check (matrix entries
  // ~ 1e2). Heads within 1e-6 of a switching cell's top (storage kinked by design, exact
  // piecewise linear) are skipped.
  const Model m = every_stress_model();
  RecordingObserver recorder;
  REQUIRE(run_simulation(m, recorder).converged);
  const SystemLayout layout = make_system_layout(m);
  FlowSystem sys(m, layout);
  double worst = 0.0;
  for (std::size_t n = 0; n < recorder.steps.size(); n += 4) {
    const auto& step = recorder.steps[n];
    sys.set_step(step.info.period, step.info.steady, step.info.dt, step.head_old);
    std::vector<double> head = step.head;
    sys.assemble(head);
    const Eigen::MatrixXd a(sys.matrix());
    const double scale = a.cwiseAbs().maxCoeff();
    for (int u = 0; u < sys.n_unknowns(); ++u) {
      const auto i =
          static_cast<std::size_t>(layout.cell_of_unknown[static_cast<std::size_t>(u)].value);
      if (std::abs(head[i] - m.aquifer.top[i]) < 1e-6) continue;
      const double h0 = head[i], s = 1e-7;
      head[i] = h0 + s;
      sys.assemble(head);
      const Eigen::VectorXd rp = sys.residual();
      head[i] = h0 - s;
      sys.assemble(head);
      const Eigen::VectorXd rm = sys.residual();
      head[i] = h0;
      const Eigen::VectorXd column = -(rp - rm) / (2.0 * s);
      worst = std::max(worst, (column - a.col(u)).cwiseAbs().maxCoeff() / scale);
    }
  }
  CHECK(worst < 1e-5);
  WARN("Jacobian along the all-stress run: worst relative difference " << worst);
}
