// Interpreting a whole pumping test: noise-free synthetic tests of each closed form are
// recovered to 0.5 % (rate steps, recovery, two wells, an image well), `auto` keeps Theis for
// Theis data and picks Hantush-Jacob for leaky data, and the classification words the
// storativity range and the derivative's shape as suggestions.
#include <catch2/catch.hpp>
#include <cmath>

#include "postproc/pumping_test_fit.hpp"

using namespace aquiledger;

namespace {

/// An invented test: 1500 m3/d for 0.5 d, 2400 m3/d to 2 d, then recovery to 3 d; wells at
/// 20 m and 75 m; 30 log-spaced times per step. Drawdowns from the model itself: W(u) and
/// W(u, r/B) are checked against scipy in test_well_test_models.cpp, this checks the fit.
PumpingTest synthesise(WellTestModel model, const std::vector<double>& p,
                       std::vector<ImageWell> images = {}) {
  PumpingTest test;
  test.schedule = {{0.0, 1500.0}, {0.5, 2400.0}, {2.0, 0.0}};
  for (double r : {20.0, 75.0}) {
    ObservationSeries w;
    w.name = "well at " + std::to_string(r);
    w.distance = r;
    w.images = images;
    for (std::size_t k = 0; k < test.schedule.size(); ++k) {
      const double t0 = test.schedule[k].start;
      const double t1 = k + 1 < test.schedule.size() ? test.schedule[k + 1].start : 3.0;
      for (int i = 0; i < 30; ++i)
        w.times.push_back(t0 + (t1 - t0) * std::pow(10.0, -4.0 + 4.0 * (i + 1) / 30.0));
    }
    for (double t : w.times)
      w.drawdowns.push_back(schedule_drawdown(model, p, test.schedule, r, t, images));
    test.wells.push_back(std::move(w));
  }
  return test;
}

void check_recovered(const ModelFit& fit, const std::vector<double>& truth,
                     double tolerance = 0.005) {  // the issue: recovered to 0.5 %
  for (std::size_t j = 0; j < truth.size(); ++j)
    CHECK(fit.fit.parameters[static_cast<Eigen::Index>(j)] == Approx(truth[j]).epsilon(tolerance));
}

}  // namespace

TEST_CASE("noise-free Theis with steps and recovery is recovered to 0.5 %", "[pumping_test_fit]") {
  const std::vector<double> truth{420.0, 3.0e-4};  // m2/d, -
  const ModelFit fit =
      fit_pumping_test(synthesise(WellTestModel::theis, truth), WellTestModel::theis);
  CHECK(fit.fit.converged);
  check_recovered(fit, truth);
  CHECK(fit.n_used == 180);
}

TEST_CASE("noise-free Hantush-Jacob is recovered to 0.5 %", "[pumping_test_fit]") {
  const std::vector<double> truth{250.0, 1.0e-4, 900.0};  // m2/d, -, m
  check_recovered(fit_pumping_test(synthesise(WellTestModel::hantush_jacob, truth),
                                   WellTestModel::hantush_jacob),
                  truth);
}

TEST_CASE("noise-free Papadopulos-Cooper at a large-diameter well is recovered to 0.5 %",
          "[pumping_test_fit]") {
  // An invented dug well: r_w = 0.6 m, casing 0.5 m, 300 m3/d for 2 d then recovery to 3 d,
  // watched in the well itself (distance = r_w) and at 8 m. Well-bore storage dominates
  // until about 250 r_c^2 / T = 1.25 d (Papadopulos and Cooper, 1967), the whole first step.
  const std::vector<double> truth{50.0, 2.0e-3};  // m2/d, -
  PumpingTest test;
  test.pumped_well = {0.6, 0.5};
  test.schedule = {{0.0, 300.0}, {2.0, 0.0}};
  for (double r : {0.6, 8.0}) {
    ObservationSeries w;
    w.name = "well at " + std::to_string(r);
    w.distance = r;
    for (int i = 0; i < 40; ++i)
      w.times.push_back(2.0 * std::pow(10.0, -4.0 + 4.0 * (i + 1) / 40.0));
    for (int i = 0; i < 20; ++i)
      w.times.push_back(2.0 + std::pow(10.0, -3.0 + 3.0 * (i + 1) / 20.0));
    for (double t : w.times)
      w.drawdowns.push_back(schedule_drawdown(WellTestModel::papadopulos_cooper, truth,
                                              test.schedule, r, t, {}, test.pumped_well));
    test.wells.push_back(std::move(w));
  }
  const ModelFit fit = fit_pumping_test(test, WellTestModel::papadopulos_cooper);
  CHECK(fit.fit.converged);
  check_recovered(fit, truth);
  // Without the radii the model cannot be fitted, and says why.
  test.pumped_well = {};
  CHECK_THROWS_WITH(fit_pumping_test(test, WellTestModel::papadopulos_cooper),
                    Catch::Contains("[pumped_well]"));
}

TEST_CASE("Theis beside a barrier image is recovered to 0.5 %", "[pumping_test_fit]") {
  const std::vector<double> truth{600.0, 5.0e-4};
  const PumpingTest test = synthesise(WellTestModel::theis, truth, {{400.0, false}});
  check_recovered(fit_pumping_test(test, WellTestModel::theis), truth);
}

TEST_CASE("the Cooper-Jacob line uses only u < 0.01 and matches Theis there",
          "[pumping_test_fit]") {
  // Cooper and Jacob (1946): the line drops the terms u - u^2/4 + ... of W(u) (the series of
  // E1, Abramowitz and Stegun 5.1.11). A drawdown short by u shifts ln S by u, so with
  // u < 0.01 S comes back to 1 %; T, from the slope, to 0.5 %.
  const std::vector<double> truth{420.0, 3.0e-4};
  const ModelFit fit =
      fit_pumping_test(synthesise(WellTestModel::theis, truth), WellTestModel::cooper_jacob);
  CHECK(fit.n_used < 180);
  CHECK(fit.n_used > 20);
  check_recovered(fit, {truth[0]});
  CHECK(fit.fit.parameters[1] == Approx(truth[1]).epsilon(0.01));
}

TEST_CASE("auto keeps Theis for Theis data and picks Hantush-Jacob for leaky data",
          "[pumping_test_fit]") {
  const PumpingTestInterpretation theis =
      interpret_pumping_test(synthesise(WellTestModel::theis, {420.0, 3.0e-4}), std::nullopt);
  CHECK(theis.automatic);
  CHECK(theis.chosen_fit().model == WellTestModel::theis);
  const PumpingTestInterpretation leaky = interpret_pumping_test(
      synthesise(WellTestModel::hantush_jacob, {250.0, 1.0e-4, 300.0}), std::nullopt);
  CHECK(leaky.chosen_fit().model == WellTestModel::hantush_jacob);
}

TEST_CASE("classification words storativity ranges and derivative shapes as suggestions",
          "[pumping_test_fit]") {
  // Ranges: common practice (about 1e-5..1e-3 confined, 0.01..0.3 water table).
  const PumpingTestInterpretation confined = interpret_pumping_test(
      synthesise(WellTestModel::theis, {420.0, 3.0e-4}), WellTestModel::theis);
  CHECK(confined.classification.front().find("confined") != std::string::npos);
  CHECK(confined.classification.back().find("professional") != std::string::npos);
  const PumpingTestInterpretation unconfined =
      interpret_pumping_test(synthesise(WellTestModel::theis, {420.0, 0.08}), WellTestModel::theis);
  CHECK(unconfined.classification.front().find("water-table") != std::string::npos);
  // A strongly leaky aquifer: the derivative falls off (Hantush and Jacob, 1955).
  const PumpingTestInterpretation leaky = interpret_pumping_test(
      synthesise(WellTestModel::hantush_jacob, {250.0, 1.0e-4, 150.0}), std::nullopt);
  bool falls = false;
  for (const std::string& s : leaky.classification)
    if (s.find("falls off") != std::string::npos) {
      falls = true;
      // auto chose the leaky model, so the sentence does not suggest fitting one.
      CHECK(s.find("the fitted model (hantush-jacob) includes leakage.") != std::string::npos);
    }
  CHECK(falls);
  const PumpingTestInterpretation leaky_theis = interpret_pumping_test(
      synthesise(WellTestModel::hantush_jacob, {250.0, 1.0e-4, 150.0}), WellTestModel::theis);
  bool suggests_leaky = false;
  for (const std::string& s : leaky_theis.classification)
    suggests_leaky = suggests_leaky || s.find(
                                           "a leaky model or a recharge image may be worth "
                                           "trying") != std::string::npos;
  CHECK(suggests_leaky);
  // A barrier: the derivative rises at late time (Ferris et al., 1962: the slope doubles). The
  // image at 400 m acts (u_image = 0.033 d / t < 1) over the last third of the first step.
  const PumpingTestInterpretation barrier = interpret_pumping_test(
      synthesise(WellTestModel::theis, {600.0, 5.0e-4}, {{400.0, false}}), WellTestModel::theis);
  bool rises = false;
  for (const std::string& s : barrier.classification)
    if (s.find("rises at late time") != std::string::npos) {
      rises = true;
      CHECK(s.find("the fitted model (theis) includes a barrier.") != std::string::npos);
    }
  CHECK(rises);
}
