// The numerical model of a pumping test (postproc/numerical_well_test.hpp) with straight
// boundaries and a second zone, against image wells: Theis (1935) superposed with images
// across a barrier (added) or a recharge line (subtracted), images of images for two
// perpendicular lines (Ferris et al., 1962, USGS Water-Supply Paper 1536-E, the method of
// images; the project's schedule_drawdown of postproc/well_test_models.hpp), and for a zone
// line between aquifers of equal diffusivity T / S an image of strength (T1 - T2) / (T1 + T2)
// (derived in docs/pumping-tests.md, "Zone line"); a barrier with leakage (Hantush and Jacob,
// 1955) and with casing storage (Papadopulos and Cooper, 1967), each with its image.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "postproc/analytical_solutions.hpp"
#include "postproc/numerical_well_test.hpp"
#include "postproc/parameter_estimation.hpp"
#include "postproc/well_test_models.hpp"

using namespace aquiledger;

namespace {

constexpr double bounded_rate = 1200.0;  // m3/d

/// An observation well at `distance` (m) and `bearing` (degrees clockwise from north) with
/// `count` times log-spaced from `decades` decades before 1 d to 1 d after the start of each
/// rate step.
ObservationSeries bounded_well(double distance, double bearing, const PumpingTest& test,
                               double decades = 3.0, int count = 24) {
  ObservationSeries w;
  w.name = std::to_string(distance) + " m at " + std::to_string(bearing);
  w.distance = distance;
  w.bearing = bearing;
  for (const RateStep& step : test.schedule)
    for (int i = 0; i < count; ++i)
      w.times.push_back(step.start + std::pow(10.0, -decades + decades * i / (count - 1.0)));
  return w;
}

/// The position of a well (x east, y north; m) from its distance and bearing.
std::pair<double, double> bounded_position(const ObservationSeries& w) {
  const double b = *w.bearing * std::numbers::pi / 180.0;
  return {w.distance * std::sin(b), w.distance * std::cos(b)};
}

/// The largest |numerical - reference| drawdown (m) at the model's own values.
double bounded_worst_error(const PumpingTest& test, const Model& model) {
  const std::size_t k = numerical_parameter_names(test).size();
  const EstimationSetup setup =
      numerical_test_setup(test, model, std::vector<double>(k, 0.1), std::vector<double>(k, 10.0));
  const SimulatedTargets sim = simulate_targets(
      model, setup, Eigen::VectorXd::Ones(static_cast<Eigen::Index>(setup.parameters.size())));
  return (sim.values - measured_targets(setup).observed).cwiseAbs().maxCoeff();
}

/// Fills every well's drawdowns with `model` (the project's schedule_drawdown) at its
/// parameters and the rate schedule, plus the images of `images` (x, y of the image well in m,
/// recharge or not; Ferris et al., 1962), each a well of the pumped well's construction.
void fill_with_model_images(PumpingTest& test, WellTestModel model,
                            const std::vector<double>& parameters,
                            const std::vector<std::tuple<double, double, bool>>& images) {
  for (ObservationSeries& w : test.wells) {
    const auto [x, y] = bounded_position(w);
    std::vector<ImageWell> seen;
    for (const auto& [ix, iy, recharge] : images)
      seen.push_back({std::hypot(ix - x, iy - y), recharge});
    w.drawdowns.clear();
    for (double time : w.times)
      w.drawdowns.push_back(schedule_drawdown(model, parameters, test.schedule, w.distance, time,
                                              seen, test.pumped_well));
  }
}

/// Theis (1935) with the images of `images` (fill_with_model_images).
void fill_with_images(PumpingTest& test, double t, double s,
                      const std::vector<std::tuple<double, double, bool>>& images) {
  fill_with_model_images(test, WellTestModel::theis, {t, s}, images);
}

}  // namespace

TEST_CASE("a barrier and a recharge line: the numerical model within 1 % of the images",
          "[numerical_boundaries]") {
  // Theis (1935) T = 350 m2/d, S = 2e-4, 1200 m3/d for 1 d; one line 150 m east of the
  // pumped well, wells toward it, along it and away from it. Budget: 1 % of Q / (4 pi T), the
  // quarter grid's (test_numerical_well_test.cpp), since the line is a cell face (barrier) or
  // a column of centres (recharge) exactly, and the image well's drawdown is that of a well
  // 2 d away, resolved by the same telescoping widths. The recovery's error is the quarter
  // grid's (measured figures in docs/pumping-tests.md, "Straight lines").
  const double t = 350.0, s = 2e-4;
  for (const bool recharge : {false, true}) {
    PumpingTest test;
    test.schedule = {{0.0, bounded_rate}};
    test.lines.push_back({recharge ? TestLineKind::recharge : TestLineKind::barrier, 150.0, 90.0});
    test.wells = {bounded_well(25.0, 90.0, test), bounded_well(80.0, 180.0, test),
                  bounded_well(60.0, 300.0, test)};
    fill_with_images(test, t, s, {{300.0, 0.0, recharge}});
    const Model m = numerical_test_model(test, {t, s}, t, s);
    CAPTURE(recharge);
    // One line: the axis across it is still a line of symmetry (a half grid).
    CHECK(m.grid.y_min() == 0.0);
    CHECK(m.grid.x_min() < -1000.0);
    CHECK(m.wells.front().rate.at(0, 0) == Approx(0.5 * bounded_rate));
    CHECK(m.fixed_heads.size() == (recharge ? 1u : 0u));
    const double slope = bounded_rate / (4.0 * std::numbers::pi * t);
    const double err = bounded_worst_error(test, m);
    CHECK(err < 0.01 * slope);
    // The boundary matters: without the image the drawdowns differ by far more.
    CHECK(std::abs(test.wells[0].drawdowns[23] - theis_drawdown(bounded_rate, t, s, 25.0, 1.0)) >
          0.1 * slope);
  }
}

TEST_CASE("two perpendicular lines: images of images, the numerical model within 1 %",
          "[numerical_boundaries]") {
  // A barrier 150 m east and a recharge line 200 m north of the pumped well: images at
  // (300, 0) (barrier, +), (0, 400) (recharge, -) and (300, 400) (the image of each image,
  // sign the product: -) (Ferris et al., 1962). 1 d of pumping. Whole grid (no symmetry).
  const double t = 350.0, s = 2e-4;
  PumpingTest test;
  test.schedule = {{0.0, bounded_rate}};
  test.lines = {{TestLineKind::barrier, 150.0, 90.0}, {TestLineKind::recharge, 200.0, 0.0}};
  test.wells = {bounded_well(25.0, 45.0, test), bounded_well(80.0, 200.0, test),
                bounded_well(100.0, 60.0, test)};
  fill_with_images(test, t, s, {{300.0, 0.0, false}, {0.0, 400.0, true}, {300.0, 400.0, true}});
  const Model m = numerical_test_model(test, {t, s}, t, s);
  CHECK(m.grid.x_min() < 0.0);
  CHECK(m.grid.y_min() < 0.0);
  CHECK(m.wells.front().rate.at(0, 0) == bounded_rate);
  const double slope = bounded_rate / (4.0 * std::numbers::pi * t);
  CHECK(bounded_worst_error(test, m) < 0.01 * slope);
}

TEST_CASE("noise-free drawdowns beside a barrier fitted by the numerical model to 1 %",
          "[numerical_boundaries]") {
  // Theis (1935) with the barrier's image (Ferris et al., 1962), T = 350 m2/d, S = 2e-4, from
  // a start a factor 2 and 5 away; 2 decades of data (fewer time steps keep the test short).
  const double t = 350.0, s = 2e-4;
  PumpingTest test;
  test.schedule = {{0.0, bounded_rate}};
  test.lines.push_back({TestLineKind::barrier, 150.0, 90.0});
  test.wells = {bounded_well(25.0, 90.0, test, 2.0, 16), bounded_well(80.0, 180.0, test, 2.0, 16)};
  fill_with_images(test, t, s, {{300.0, 0.0, false}});
  const ModelFit fit = fit_numerical_pumping_test(test, {700.0, 1e-3}, {1.0, 1e-7}, {1e5, 0.5});
  CHECK(fit.fit.converged);
  CHECK(fit.fit.parameters[0] == Approx(t).epsilon(0.01));
  CHECK(fit.fit.parameters[1] == Approx(s).epsilon(0.01));
  CHECK(fit.description.find("half radial grid") != std::string::npos);
  CHECK(fit.description.find("a barrier at 150") != std::string::npos);
}

TEST_CASE(
    "a zone line between aquifers of equal diffusivity: one image of strength "
    "(T1 - T2) / (T1 + T2)",
    "[numerical_boundaries]") {
  // T1 = 350, S1 = 2e-4 on the well's side; beyond a line 100 m east T2 = 4 T1, S2 = 4 S1
  // (the same T / S). On the well's side s = Q / (4 pi T1) [W(u) + k W(u_i)], k = (T1 - T2) /
  // (T1 + T2) = -0.6, u_i of the image at (200, 0); beyond it s = Q / (2 pi (T1 + T2)) W(u)
  // (derivation in docs/pumping-tests.md; W = E1 of analytical_solutions.hpp).
  const double t1 = 350.0, s1 = 2e-4, t2 = 4.0 * t1, s2 = 4.0 * s1;
  const double kappa = (t1 - t2) / (t1 + t2);
  PumpingTest test;
  test.schedule = {{0.0, bounded_rate}};
  test.lines.push_back({TestLineKind::zone, 100.0, 90.0});
  test.wells = {bounded_well(25.0, 90.0, test), bounded_well(60.0, 270.0, test),
                bounded_well(160.0, 90.0, test)};
  for (ObservationSeries& w : test.wells) {
    const auto [x, y] = bounded_position(w);
    for (double time : w.times)
      w.drawdowns.push_back(
          x < 100.0
              ? theis_drawdown(bounded_rate, t1, s1, w.distance, time) +
                    kappa * theis_drawdown(bounded_rate, t1, s1, std::hypot(200.0 - x, y), time)
              : theis_drawdown(bounded_rate, t2, s2, w.distance, time) * 2.0 * t2 / (t1 + t2));
  }
  REQUIRE(numerical_parameter_names(test) ==
          std::vector<std::string>{"transmissivity", "storativity", "transmissivity_beyond",
                                   "storativity_beyond"});
  const Model m = numerical_test_model(test, {t1, s1, t2, s2}, t1, s1);
  const double slope = bounded_rate / (4.0 * std::numbers::pi * t1);
  CHECK(bounded_worst_error(test, m) < 0.01 * slope);
  // The zones as given: K beyond the line 4 times K before it.
  const auto near = static_cast<std::size_t>(m.observations[0].cell.value);
  const auto far = static_cast<std::size_t>(m.observations[2].cell.value);
  CHECK(m.aquifer.kx[far] == Approx(4.0 * m.aquifer.kx[near]));
  CHECK(m.aquifer.specific_storage[far] == Approx(4.0 * m.aquifer.specific_storage[near]));

  SECTION("fitted: T and S of both zones to 1 %") {
    // From a start a factor 1.4 to 1.5 away on each side, on all 3 decades (with only the
    // last 2, measured: S1 -1.1 %, the early data are what set S1 apart from the zone).
    const ModelFit fit = fit_numerical_pumping_test(test, {500.0, 3e-4, 2000.0, 1.2e-3},
                                                    {1.0, 1e-7, 1.0, 1e-7}, {1e5, 0.5, 1e5, 0.5});
    CHECK(fit.fit.converged);
    CHECK(fit.fit.parameters[0] == Approx(t1).epsilon(0.01));
    CHECK(fit.fit.parameters[1] == Approx(s1).epsilon(0.01));
    CHECK(fit.fit.parameters[2] == Approx(t2).epsilon(0.01));
    CHECK(fit.fit.parameters[3] == Approx(s2).epsilon(0.01));
  }
}

TEST_CASE("leakage beside a barrier: the numerical model within 1 % of Hantush-Jacob's images",
          "[numerical_boundaries]") {
  // Hantush and Jacob (1955) (the project's W(u, r/B), checked against scipy in
  // test_analytical_solutions.cpp) with the barrier's image (Ferris et al., 1962): leakage
  // from a bed at the static level is linear in the drawdown and the same on both sides of
  // the line, so the image method holds as for Theis. T = 350 m2/d, S = 2e-4, K'/b' = 5e-4
  // 1/d (B = 837 m, held), a barrier 150 m east. Budget 1 % of Q / (4 pi T), the confined
  // model's (neither the leakage nor the line alone adds a measured share, above).
  const double t = 350.0, s = 2e-4, leakance = 5e-4;
  PumpingTest test;
  test.schedule = {{0.0, bounded_rate}};
  test.leakance = TestLeakance{false, leakance};
  test.lines.push_back({TestLineKind::barrier, 150.0, 90.0});
  test.wells = {bounded_well(25.0, 90.0, test), bounded_well(80.0, 180.0, test),
                bounded_well(60.0, 300.0, test)};
  fill_with_model_images(test, WellTestModel::hantush_jacob, {t, s, std::sqrt(t / leakance)},
                         {{300.0, 0.0, false}});
  // With the default widths (growing by 1.1) measured 1.08 %, over the budget: late at
  // 25 m, toward the barrier, where the leaky cone's steady part is resolved by the widths
  // (steps growing by 1.01 instead of 1.02: 1.23 %; the far edge at 5 radii instead of 3:
  // unchanged). With widths growing by 1.05 it is 0.65 %, checked here against the budget,
  // so that the model converges to the images; the default's shortfall is in
  // docs/pumping-tests.md ("Not yet done").
  NumericalTestSettings finer;
  finer.width_growth = 1.05;
  const Model m = numerical_test_model(test, {t, s}, t, s, finer);
  REQUIRE(m.external_heads.size() == 1);
  const double slope = bounded_rate / (4.0 * std::numbers::pi * t);
  CHECK(bounded_worst_error(test, m) < 0.01 * slope);
}

TEST_CASE("casing storage beside a barrier: the numerical model within 2 % of the images",
          "[numerical_boundaries]") {
  // Papadopulos and Cooper (1967) (the project's closed form) at each well plus the same at
  // its image across the barrier (Ferris et al., 1962). The image of a large-diameter well is
  // a large-diameter well; the sum leaves out that each casing also feeds the other's
  // drawdown at the well: the casing then supplies pi r_c^2 d(s_image)/dt more, a share of
  // the rate of r_c^2 exp(-u) / (4 T t) with u = R^2 S / (4 T t) of the image at R, at most
  // r_c^2 / (e R^2 S) = 0.37 % (u = 1) for R = 300 m (derived here). T = 50 m2/d, S = 1e-4,
  // r_w = 0.2, r_c = 0.3 m, 500 m3/d, a barrier 150 m east, wells at 10 and 30 m. Budget the
  // casing model's 2 % of Q / (4 pi T) (test_numerical_well_test.cpp). Measured 1.81 % (1.96 %
  // before the well's cell was sized from its measured radius).
  const double t = 50.0, s = 1e-4;
  PumpingTest test;
  test.schedule = {{0.0, 500.0}};
  test.pumped_well = PumpedWellRadii{0.2, 0.3};
  test.lines.push_back({TestLineKind::barrier, 150.0, 90.0});
  test.wells = {bounded_well(10.0, 90.0, test), bounded_well(30.0, 180.0, test)};
  fill_with_model_images(test, WellTestModel::papadopulos_cooper, {t, s}, {{300.0, 0.0, false}});
  const Model m = numerical_test_model(test, {t, s}, t, s);
  const double slope = 500.0 / (4.0 * std::numbers::pi * t);
  CHECK(bounded_worst_error(test, m) < 0.02 * slope);
}
