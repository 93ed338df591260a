// Parameter estimation with exact sensitivities: a synthetic twin recovers the values its
// targets were made with, the sensitivities of the targets match differences of whole runs,
// and parameters the data cannot separate are reported.
#include <catch2/catch.hpp>
#include <cmath>

#include "postproc/parameter_estimation.hpp"
#include "solver/stress_test_models.hpp"
#include "support/estimation_parameters.hpp"

using namespace aquiledger;
using namespace aquiledger::stress_tests;

namespace {

/// The switching basin of the stress tests with six bores and every stress.
Model basin() {
  Model m = every_stress_model();
  m.aquifer.compressibility.reset();
  m.aquifer.skeleton_share.clear();
  m.solver.head_tolerance = 1e-9;
  m.solver.flow_tolerance = 1e-11;
  test::add_bores(m, {{250.0, 250.0},
                      {450.0, 650.0},
                      {650.0, 450.0},
                      {1050.0, 850.0},
                      {350.0, 850.0},
                      {750.0, 150.0}});
  return m;
}

EstimationSetup twin_setup(const Model& m) {
  EstimationSetup s;
  s.parameters = {
      test::multiplier_parameter("k west", ParameterProperty::conductivity,
                                 test::cells_in_columns(m, 0, 5)),
      test::multiplier_parameter("k east", ParameterProperty::conductivity,
                                 test::cells_in_columns(m, 6, 11)),
      test::multiplier_parameter("sy", ParameterProperty::specific_yield,
                                 test::cells_in_columns(m, 0, 11)),
      test::multiplier_parameter("rain", ParameterProperty::recharge, {}, {0}),
      test::multiplier_parameter("creek", ParameterProperty::river_conductance, {}, {0})};
  for (std::size_t b = 0; b < m.observations.size(); ++b) {
    EstimationTarget t;
    t.name = m.observations[b].name;
    t.kind = b % 2 ? TargetKind::drawdown : TargetKind::head;
    t.bore = b;
    t.times = {5.0, 20.0, 40.0, 60.0, 100.0, 140.0};
    t.values.assign(t.times.size(), 0.0);
    t.weights.assign(t.times.size(), 100.0);
    s.targets.push_back(t);
  }
  EstimationTarget flow;
  flow.name = "creek";
  flow.kind = TargetKind::flow;
  flow.feature = {"creek", FeatureKind::river, 0};
  flow.times = {10.0, 35.0, 140.0};
  flow.values.assign(3, 0.0);
  flow.weights.assign(3, 1e-4);
  s.targets.push_back(flow);
  EstimationTarget diff;
  diff.name = "gradient";
  diff.kind = TargetKind::head_difference;
  diff.bore = 0;
  diff.other_bore = 3;
  diff.times = {30.0, 140.0};
  diff.values.assign(2, 0.0);
  diff.weights.assign(2, 100.0);
  s.targets.push_back(diff);
  return s;
}

}  // namespace

TEST_CASE("estimation: target sensitivities against differences of whole runs", "[estimation]") {
  const Model m = basin();
  const EstimationSetup s = twin_setup(m);
  Eigen::VectorXd p(5);
  p << 1.3, 0.7, 1.1, 0.9, 1.5;
  const SimulatedTargets at = simulate_targets(m, s, p);
  const double d = 1e-5;  // in ln p, as in tests/solver/test_forward_sensitivities.cpp
  for (Eigen::Index j = 0; j < p.size(); ++j) {
    Eigen::VectorXd up = p, down = p;
    up[j] *= std::exp(d);
    down[j] *= std::exp(-d);
    const Eigen::VectorXd fd =
        (simulate_targets(m, s, up).values - simulate_targets(m, s, down).values) / (2 * d);
    INFO("parameter " << j << ": largest " << fd.cwiseAbs().maxCoeff());
    CHECK((at.d_ln_p.col(j) - fd).cwiseAbs().maxCoeff() <= 1e-5 * fd.cwiseAbs().maxCoeff());
  }
}

TEST_CASE("estimation: a synthetic twin recovers its zone values", "[estimation]") {
  // Targets made by the model itself with known multipliers (noise-free): the fit from all
  // multipliers at 1 must return them (Hill and Tiedeman, 2007, sec. 15.1, the use of a
  // synthetic model with known parameters to test a calibration).
  const Model m = basin();
  EstimationSetup s = twin_setup(m);
  Eigen::VectorXd truth(5);
  truth << 1.6, 0.6, 1.25, 0.8, 2.0;
  const SimulatedTargets made = simulate_targets(m, s, truth);
  Eigen::Index row = 0;
  for (EstimationTarget& t : s.targets)
    for (double& v : t.values) v = made.values[row++];
  const EstimationResult r = estimate_parameters(m, s);
  INFO("iterations " << r.fit.n_iterations << ", runs " << r.n_model_runs);
  CHECK(r.fit.converged);
  for (Eigen::Index j = 0; j < truth.size(); ++j)
    CHECK(r.fit.parameters[j] == Approx(truth[j]).epsilon(1e-5));
  CHECK(r.fit.weighted_sum_of_squares < 1e-12);
  for (Eigen::Index j = 0; j < truth.size(); ++j) CHECK(r.css[j] > 0.0);
}

TEST_CASE("estimation: K and recharge of a steady model are not separable", "[estimation]") {
  // Steady heads with fixed-head and recharge boundaries depend on recharge / K only (the
  // steady groundwater flow equation divided by K; Hill and Tiedeman, 2007, sec. 7.2.2, the
  // classic example of extreme parameter correlation): r = 1 and a warning.
  UniformAquifer a;
  a.top = 20.0;
  a.bottom = 0.0;
  a.initial_head = 15.0;
  Model m = uniform_model(5, 8, 100.0, 100.0, a);
  m.periods = {Period{"steady", 1.0, 1, 1.0, true}};
  std::vector<CellIndex> west;
  for (int r = 0; r < 5; ++r) west.push_back(m.grid.cell(r, 0));
  m.fixed_heads.push_back(FixedHead{"west", west, PeriodValues(15.0)});
  m.recharges.push_back(Recharge{"rain", all_cells(m), PeriodValues(1e-3)});
  Observation o{"far", 750.0, 250.0, m.grid.cell(2, 7), {}, {}};
  Observation o2{"mid", 450.0, 250.0, m.grid.cell(2, 4), {}, {}};
  m.observations = {o, o2};
  EstimationSetup s;
  s.parameters = {test::multiplier_parameter("k", ParameterProperty::conductivity,
                                             test::cells_in_columns(m, 0, 7)),
                  test::multiplier_parameter("rain", ParameterProperty::recharge, {}, {0})};
  for (std::size_t b = 0; b < 2; ++b) {
    EstimationTarget t;
    t.name = m.observations[b].name;
    t.bore = b;
    t.times = {1.0};
    t.values = {b == 0 ? 16.5 : 16.0};
    t.weights = {1.0};
    s.targets.push_back(t);
  }
  EstimationTarget t = s.targets[0];
  t.name = "far again";
  t.values = {16.4};
  s.targets.push_back(t);
  const EstimationResult r = estimate_parameters(m, s);
  CHECK(std::abs(r.fit.correlation(0, 1)) > 0.999);
  bool warned = false;
  for (const std::string& w : r.warnings)
    warned |= w.find("do not determine them separately") != std::string::npos;
  CHECK(warned);
}
