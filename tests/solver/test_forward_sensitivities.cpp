// Forward sensitivities of the heads against central finite differences of whole runs (the
// definition of the derivative; Hill and Tiedeman, 2007, Effective Groundwater Model
// Calibration, eq. 4-5 and sec. 4.3.3 compare the two the same way), in confined,
// water-table and switching models with every stress. Relative agreement 1e-6.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/face_conductance.hpp"
#include "solver/forward_sensitivities.hpp"
#include "stress_test_models.hpp"

using namespace aquiledger;
using namespace aquiledger::stress_tests;

namespace {

/// Heads at the end of every accepted step (and the initial heads first).
class HeadRecorder : public SimulationObserver {
 public:
  std::vector<std::vector<double>> heads;
  void initial_state(std::span<const double> h) override { heads.emplace_back(h.begin(), h.end()); }
  void step_done(const StepInfo&, std::span<const double>, std::span<const double> h) override {
    heads.emplace_back(h.begin(), h.end());
  }
  void period_done(std::size_t) override {}
};

/// Sensitivities at the same times.
class SensitivityRecorder : public SensitivityObserver {
 public:
  std::vector<HeadSensitivities> s;
  void state(const StepInfo*, std::span<const double>, const HeadSensitivities& sk) override {
    s.push_back(sk);
  }
};

Model tight(Model m) {
  m.solver.head_tolerance = 1e-11;
  m.solver.flow_tolerance = 1e-13;
  m.solver.max_iterations = 100;
  return m;
}

std::vector<std::vector<double>> heads_with(const Model& base, const ModelParameter& p, double v) {
  Model m = base;
  apply_parameter(base, p, v, m);
  HeadRecorder rec;
  REQUIRE(run_simulation(m, rec).converged);
  return rec.heads;
}

/// Checks every parameter's sensitivities at every output time against central differences
/// in ln p. Step 1e-5: the differences left are the quotient's truncation error, which falls
/// as the step squared (water-table basin, Sy: 8e-4 at a step of 1e-3, 8e-6 at 1e-4, relative
/// to the largest sensitivity 3.9 m), while Newton's tolerance 1e-11 m over the step stays
/// at 1e-6 m.
void check_against_differences(const Model& model, const std::vector<ModelParameter>& params) {
  SensitivityRecorder rec;
  const SensitivityRun run = run_with_sensitivities(model, params, rec);
  REQUIRE(run.run.converged);
  REQUIRE(run.run.cutbacks == 0);  // the perturbed runs must take the same steps
  const double d = 1e-5;
  for (std::size_t k = 0; k < params.size(); ++k) {
    INFO("parameter " << params[k].name);
    const auto up = heads_with(model, params[k], std::exp(d));
    const auto down = heads_with(model, params[k], std::exp(-d));
    REQUIRE(up.size() == rec.s.size());
    REQUIRE(down.size() == rec.s.size());
    double largest = 0.0, worst = 0.0;
    for (std::size_t t = 0; t < rec.s.size(); ++t)
      for (std::size_t i = 0; i < up[t].size(); ++i) {
        if (std::isnan(up[t][i])) continue;
        const double fd = (up[t][i] - down[t][i]) / (2 * d);
        largest = std::max(largest, std::abs(fd));
        worst = std::max(worst, std::abs(rec.s[t][k][i] - fd));
      }
    INFO("largest |dh/dln p| " << largest << ", worst difference " << worst);
    CHECK(largest > 1e-6);  // the parameter does act on the heads
    CHECK(worst <= 1e-6 * largest);
  }
}

ModelParameter cells_parameter(const std::string& name, ParameterProperty prop, const Model& m,
                               int first_col) {
  ModelParameter p;
  p.name = name;
  p.property = prop;
  for (int c = 0; c < m.grid.n_cells(); ++c)
    if (m.grid.row_col(CellIndex{c}).col >= first_col) p.cells.push_back(c);
  return p;
}

ModelParameter feature_parameter(const std::string& name, ParameterProperty prop) {
  ModelParameter p;
  p.name = name;
  p.property = prop;
  p.features = {0};
  return p;
}

std::vector<ModelParameter> every_parameter(const Model& m) {
  std::vector<ModelParameter> params = {
      cells_parameter("k east", ParameterProperty::conductivity, m, 6),
      cells_parameter("k all", ParameterProperty::conductivity, m, 0),
      feature_parameter("rain", ParameterProperty::recharge),
      feature_parameter("creek", ParameterProperty::river_conductance),
      feature_parameter("tiles", ParameterProperty::drain_conductance),
      feature_parameter("regional", ParameterProperty::external_conductance)};
  // k all overlaps k east: a test of the solver only (the set-up reader refuses overlaps).
  if (m.aquifer.condition != Condition::water_table)
    params.push_back(cells_parameter("ss", ParameterProperty::specific_storage, m, 0));
  if (m.aquifer.condition != Condition::confined)
    params.push_back(cells_parameter("sy west", ParameterProperty::specific_yield, m, 0));
  return params;
}

}  // namespace

TEST_CASE("face factor elasticities against finite differences", "[sensitivities]") {
  // d ln F / d ln k by central differences of ln F (F: harmonic_face_factor); the difference
  // quotient carries a rounding error of about eps / h = 2e-10 absolute, hence the margin.
  for (auto [ki, di, kj, dj] : {std::tuple{2.0, 10.0, 8.0, 30.0}, {5.0, 1.0, 0.01, 7.0}}) {
    const FaceElasticity e = harmonic_face_factor_elasticities(ki, di, kj, dj);
    const double h = 1e-6;
    auto lnf = [&](double a, double b) {
      return std::log(harmonic_face_factor(3.0, a, di, b, dj));
    };
    CHECK(e.i == Approx((lnf(ki * std::exp(h), kj) - lnf(ki * std::exp(-h), kj)) / (2 * h))
                     .epsilon(1e-7)
                     .margin(1e-9));
    CHECK(e.j == Approx((lnf(ki, kj * std::exp(h)) - lnf(ki, kj * std::exp(-h))) / (2 * h))
                     .epsilon(1e-7)
                     .margin(1e-9));
    CHECK(e.i + e.j == Approx(1.0));  // F is homogeneous of degree 1 in (ki, kj)
  }
}

TEST_CASE("sensitivities: switching basin with every stress", "[sensitivities]") {
  Model m = tight(every_stress_model());
  m.aquifer.compressibility.reset();
  m.aquifer.skeleton_share.clear();
  check_against_differences(m, every_parameter(m));
}

TEST_CASE("sensitivities: confined basin, initial steady state", "[sensitivities]") {
  Model m = tight(every_stress_model());
  m.aquifer.compressibility.reset();
  m.aquifer.skeleton_share.clear();
  m.aquifer.condition = Condition::confined;
  m.aquifer.specific_yield.clear();
  m.aquifer.top.assign(m.aquifer.top.size(), 20.0);
  m.initial.steady = true;
  m.drains[0].elevation = PeriodValues(18.5);  // below the heads, so that the drain flows
  check_against_differences(m, every_parameter(m));
}

TEST_CASE("sensitivities: water-table basin", "[sensitivities]") {
  Model m = tight(every_stress_model());
  m.aquifer.compressibility.reset();
  m.aquifer.skeleton_share.clear();
  m.aquifer.condition = Condition::water_table;
  m.aquifer.top.assign(m.aquifer.top.size(), std::nan(""));
  m.initial.head.assign(m.initial.head.size(), 19.0);
  m.drains[0].elevation = PeriodValues(18.5);
  check_against_differences(m, every_parameter(m));
}

TEST_CASE("sensitivities reuse the run's factorisation of a linear step", "[sensitivities]") {
  // A confined model with a well and a fixed-head edge is linear in the heads, so each step's
  // Newton factorisation is of its converged Jacobian: the sensitivity solves add no
  // factorisation (steps of equal length share one), and still match central differences.
  UniformAquifer a;
  a.k = 5.0;
  a.specific_storage = 2e-4;
  Model m = tight(uniform_model(8, 9, 50.0, 60.0, a));
  m.periods = {Period{"pumping", 2.0, 6, 1.0, false}, Period{"recovery", 2.0, 4, 1.0, false}};
  const RectilinearGrid& g = m.grid;
  m.wells.push_back(Well{"supply", 225.0, 240.0, g.cell(4, 4), PeriodValues(300.0)});
  std::vector<CellIndex> edge;
  for (int r = 0; r < g.n_rows(); ++r) edge.push_back(g.cell(r, 0));
  m.fixed_heads.push_back(FixedHead{"edge", edge, PeriodValues(0.0)});
  const std::vector<ModelParameter> params = {
      cells_parameter("k east", ParameterProperty::conductivity, m, 5),
      cells_parameter("ss", ParameterProperty::specific_storage, m, 0)};
  SensitivityRecorder rec;
  const SensitivityRun run = run_with_sensitivities(m, params, rec);
  REQUIRE(run.run.converged);
  CHECK(run.sensitivity_solves == 2 * 10);
  CHECK(run.sensitivity_factorizations == 0);
  check_against_differences(m, params);
}
