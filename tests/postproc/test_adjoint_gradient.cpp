// The adjoint gradient of the fit's objective (postproc/parameter_estimation.hpp,
// solver/adjoint_gradient.hpp) against central finite differences of the whole objective, the
// definition of the derivative (Hill and Tiedeman, 2007, Effective Groundwater Model
// Calibration, sec. 4.3.3 compare exact and differenced sensitivities the same way), and
// against the gradient -2 J^T W r from the forward sensitivities, which must agree to
// rounding: the two are the same sums in another order. Confined (from an initial steady
// state), water-table and switching models, with every target kind, priors, ln p and p.
#include <catch2/catch.hpp>
#include <cmath>

#include "postproc/parameter_estimation.hpp"
#include "solver/stress_test_models.hpp"
#include "support/estimation_parameters.hpp"

using namespace aquiledger;
using namespace aquiledger::stress_tests;

namespace {

/// The stress tests' basin (every stress, a steady period between two transient ones) with
/// four bores and Newton's tolerances tight, so that differences of whole runs resolve 1e-6.
Model adjoint_basin(Condition condition) {
  Model m = every_stress_model();
  m.aquifer.compressibility.reset();
  m.aquifer.skeleton_share.clear();
  m.solver.head_tolerance = 1e-11;
  m.solver.flow_tolerance = 1e-13;
  m.solver.max_iterations = 100;
  if (condition == Condition::confined) {  // as in tests/solver/test_forward_sensitivities.cpp
    m.aquifer.condition = Condition::confined;
    m.aquifer.specific_yield.clear();
    m.aquifer.top.assign(m.aquifer.top.size(), 20.0);
    m.initial.steady = true;
    m.drains[0].elevation = PeriodValues(18.5);
  } else if (condition == Condition::water_table) {
    m.aquifer.condition = Condition::water_table;
    m.aquifer.top.assign(m.aquifer.top.size(), std::nan(""));
    m.initial.head.assign(m.initial.head.size(), 19.0);
    m.drains[0].elevation = PeriodValues(18.5);
  }
  test::add_bores(m, {{250.0, 250.0}, {450.0, 650.0}, {650.0, 450.0}, {1050.0, 850.0}});
  return m;
}

/// Every parameter kind the model has, one with a prior in ln p and one in p (log = false).
EstimationSetup adjoint_setup(const Model& m) {
  EstimationSetup s;
  s.parameters = {
      test::multiplier_parameter("k west", ParameterProperty::conductivity,
                                 test::cells_in_columns(m, 0, 5)),
      test::multiplier_parameter("k east", ParameterProperty::conductivity,
                                 test::cells_in_columns(m, 6, 11)),
      test::multiplier_parameter("rain", ParameterProperty::recharge, {}, {0}),
      test::multiplier_parameter("creek", ParameterProperty::river_conductance, {}, {0}),
      test::multiplier_parameter("tiles", ParameterProperty::drain_conductance, {}, {0}),
      test::multiplier_parameter("regional", ParameterProperty::external_conductance, {}, {0})};
  if (m.aquifer.condition != Condition::water_table)
    s.parameters.push_back(test::multiplier_parameter("ss", ParameterProperty::specific_storage,
                                                      test::cells_in_columns(m, 0, 11)));
  if (m.aquifer.condition != Condition::confined)
    s.parameters.push_back(test::multiplier_parameter("sy", ParameterProperty::specific_yield,
                                                      test::cells_in_columns(m, 0, 11)));
  s.parameters[0].prior = 1.2;
  s.parameters[0].prior_weight = 4.0;
  s.parameters[2].log = false;
  s.parameters[2].prior = 0.9;
  s.parameters[2].prior_weight = 10.0;
  const TargetKind kinds[] = {TargetKind::head, TargetKind::drawdown, TargetKind::head,
                              TargetKind::drawdown};
  for (std::size_t b = 0; b < m.observations.size(); ++b) {
    EstimationTarget t;
    t.name = m.observations[b].name;
    t.kind = kinds[b];
    t.bore = b;
    t.times = {5.0, 27.5, 40.0, 60.0, 100.0, 140.0};  // 27.5: between two output steps
    t.weights.assign(t.times.size(), 100.0);
    s.targets.push_back(t);
  }
  EstimationTarget flow;
  flow.name = "creek";
  flow.kind = TargetKind::flow;
  flow.feature = {"creek", FeatureKind::river, 0};
  flow.times = {10.0, 35.0, 140.0};
  flow.weights.assign(3, 1e-4);
  s.targets.push_back(flow);
  EstimationTarget diff;
  diff.name = "gradient";
  diff.kind = TargetKind::head_difference;
  diff.bore = 0;
  diff.other_bore = 3;
  diff.times = {30.0, 140.0};
  diff.weights.assign(2, 100.0);
  s.targets.push_back(diff);
  return s;
}

/// Measured values: the model's own at `truth`, so that at other values the residuals are
/// of the size a fit meets.
void measure(const Model& m, EstimationSetup& s, const Eigen::VectorXd& truth) {
  for (EstimationTarget& t : s.targets) t.values.assign(t.times.size(), 0.0);
  const Eigen::VectorXd y = simulate_targets(m, s, truth).values;
  Eigen::Index row = 0;
  for (EstimationTarget& t : s.targets)
    for (double& v : t.values) v = y[row++];
}

void check_adjoint_gradient(const Model& m) {
  EstimationSetup s = adjoint_setup(m);
  const auto k = static_cast<Eigen::Index>(s.parameters.size());
  Eigen::VectorXd truth = Eigen::VectorXd::Ones(k), p(k);
  measure(m, s, truth);
  for (Eigen::Index j = 0; j < k; ++j) p[j] = 1.0 + 0.15 * ((j % 3) - 1.0) + 0.05 * j;
  const ObjectiveGradient adjoint = adjoint_objective_gradient(m, s, p);
  const ObjectiveGradient forward = forward_objective_gradient(m, s, p);
  const double largest = adjoint.gradient.cwiseAbs().maxCoeff();
  INFO("objective " << adjoint.objective << ", largest |dPhi/dx| " << largest);
  REQUIRE(adjoint.objective > 0.0);
  CHECK(adjoint.objective == Approx(forward.objective).epsilon(1e-12));
  // Rounding: the same sums in another order; 1e-9 of the largest component.
  CHECK((adjoint.gradient - forward.gradient).cwiseAbs().maxCoeff() <= 1e-9 * largest);
  // Central differences of the whole objective in the fit's variable x (ln p, or p for
  // "rain"), step 1e-5 as in tests/solver/test_forward_sensitivities.cpp.
  const double d = 1e-5;
  for (Eigen::Index j = 0; j < k; ++j) {
    const bool log = s.parameters[static_cast<std::size_t>(j)].log;
    Eigen::VectorXd up = p, down = p;
    up[j] = log ? p[j] * std::exp(d) : p[j] + d;
    down[j] = log ? p[j] * std::exp(-d) : p[j] - d;
    const double fd = (forward_objective_gradient(m, s, up).objective -
                       forward_objective_gradient(m, s, down).objective) /
                      (2 * d);
    INFO("parameter " << s.parameters[static_cast<std::size_t>(j)].parameter.name << ": adjoint "
                      << adjoint.gradient[j] << ", differences " << fd << ", relative "
                      << std::abs(adjoint.gradient[j] - fd) / std::abs(fd));
    CHECK(std::abs(fd) > 1e-5 * largest);  // every parameter acts on Phi
    // Each component to 1e-6 of itself (the smallest are 2e-5 of the largest).
    CHECK(std::abs(adjoint.gradient[j] - fd) <= 1e-6 * std::abs(fd));
  }
}

}  // namespace

TEST_CASE("adjoint gradient: switching basin", "[adjoint]") {
  check_adjoint_gradient(adjoint_basin(Condition::switching));
}

TEST_CASE("adjoint gradient: confined basin from an initial steady state", "[adjoint]") {
  check_adjoint_gradient(adjoint_basin(Condition::confined));
}

TEST_CASE("adjoint gradient: water-table basin", "[adjoint]") {
  check_adjoint_gradient(adjoint_basin(Condition::water_table));
}

TEST_CASE("adjoint gradient: the fit reports the gradient at its estimates", "[adjoint]") {
  // Seven parameters and every target at the same two times: under "auto" the adjoint is chosen,
  // and its gradient at the estimates is the forward method's there; asked for "forward", the fit's
  // own last Jacobian and residuals give the same.
  const Model m = adjoint_basin(Condition::switching);
  EstimationSetup s = adjoint_setup(m);
  const auto k = static_cast<Eigen::Index>(s.parameters.size());
  for (EstimationTarget& t : s.targets) {
    t.times = {40.0, 140.0};
    t.weights.resize(2);
  }
  REQUIRE(s.n_measurement_times() == 2);
  Eigen::VectorXd truth = Eigen::VectorXd::Ones(k);
  truth[0] = 1.4;
  measure(m, s, truth);
  s.max_iterations = 2;
  const EstimationResult automatic = estimate_parameters(m, s);
  CHECK(automatic.gradient_method == "adjoint");
  const ObjectiveGradient forward = forward_objective_gradient(m, s, automatic.fit.parameters);
  REQUIRE(automatic.gradient.size() == k);
  const double largest = forward.gradient.cwiseAbs().maxCoeff();
  INFO("largest |dPhi/dx| at the estimates " << largest);
  CHECK((automatic.gradient - forward.gradient).cwiseAbs().maxCoeff() <= 1e-9 * largest);
  s.gradient = GradientMethod::forward;
  const EstimationResult asked = estimate_parameters(m, s);
  CHECK(asked.gradient_method == "forward");
  CHECK((asked.fit.parameters - automatic.fit.parameters).cwiseAbs().maxCoeff() == 0.0);
  CHECK((asked.gradient - forward.gradient).cwiseAbs().maxCoeff() <= 1e-9 * largest);
}
