// Neuman (1974) delayed yield: its limits (Theis with S for Sy -> 0 and at early time for a
// long drainage length, Theis with S + Sy at late time), Stehfest with 12 against 16 terms, an
// independent inversion (fixed Talbot with complex eigenvalues, scipy), and a noise-free
// synthetic test recovered to 0.5 %.
#include <catch2/catch.hpp>
#include <cmath>

#include "postproc/analytical_solutions.hpp"
#include "postproc/pumping_test_fit.hpp"
#include "postproc/well_test_models.hpp"

using namespace aquiledger;

namespace {
// An invented water-table aquifer: T (m2/d), S, Sy, L_v (m), r (m).
constexpr double t_aq = 200.0, s_el = 2e-4, s_y = 0.15, l_v = 30.0, r_obs = 15.0;
}  // namespace

TEST_CASE("Neuman tends to Theis with S without drainage and with S + Sy late", "[neuman]") {
  for (double t : {1e-4, 1e-3, 1e-2}) {
    // Sy -> 0: the water table adds nothing, Theis (1935) with S (Neuman, 1974).
    CHECK(neuman_drawdown(1.0, t_aq, s_el, 1e-9, l_v, r_obs, t) ==
          Approx(theis_drawdown(1.0, t_aq, s_el, r_obs, t)).epsilon(1e-3));
    // A long drainage length (beta = r^2 / L_v^2 = 2.5e-5): early time is Theis with S.
    if (t <= 1e-3)
      CHECK(neuman_drawdown(1.0, t_aq, s_el, s_y, 3000.0, r_obs, t) ==
            Approx(theis_drawdown(1.0, t_aq, s_el, r_obs, t)).epsilon(1e-2));
  }
  // A drainage length far beyond the wells (r / L_v = 1.5e-5, the series' tail integral): no
  // water from the water table within the test, Theis with S (Neuman, 1974), to the 1e-3 of
  // Stehfest's 12 terms as for Sy -> 0 above.
  for (double t : {1e-4, 1e-2, 1.0})
    CHECK(neuman_drawdown(1.0, t_aq, s_el, s_y, 1e6, r_obs, t) ==
          Approx(theis_drawdown(1.0, t_aq, s_el, r_obs, t)).epsilon(1e-3));
  // Late time: Theis with S + Sy (Neuman, 1974; Neuman, 1975).
  CHECK(neuman_drawdown(1.0, t_aq, s_el, s_y, l_v, r_obs, 100.0) ==
        Approx(theis_drawdown(1.0, t_aq, s_el + s_y, r_obs, 100.0)).epsilon(1e-3));
}

TEST_CASE("Neuman: Stehfest 12 and 16 terms and an independent Talbot inversion agree",
          "[neuman]") {
  for (double t : {1e-4, 1e-2, 1.0, 10.0})
    CHECK(neuman_drawdown(1.0, t_aq, s_el, s_y, l_v, r_obs, t, 12) ==
          Approx(neuman_drawdown(1.0, t_aq, s_el, s_y, l_v, r_obs, t, 16)).epsilon(1e-3));
  // tests/data/pumping/neuman_talbot_reference.py (scipy: complex eigenvalues by
  // scipy.optimize.newton, K0 by scipy.special.kv, fixed Talbot of Abate and Valko, 2004).
  CHECK(neuman_drawdown(1.0, t_aq, s_el, s_y, l_v, r_obs, 1.0) ==
        Approx(0.00105619977).epsilon(1e-4));
  CHECK(neuman_drawdown(1.0, t_aq, s_el, s_y, l_v, r_obs, 10.0) ==
        Approx(0.001947297841).epsilon(1e-4));
}

TEST_CASE("noise-free Neuman test is recovered to 0.5 %", "[neuman][pumping_test_fit]") {
  const std::vector<double> truth{t_aq, s_el, s_y, l_v};
  PumpingTest test;
  test.schedule = {{0.0, 800.0}};
  for (double r : {8.0, 25.0}) {
    ObservationSeries w;
    w.name = "well";
    w.distance = r;
    for (int i = 0; i < 36; ++i) w.times.push_back(1e-4 * std::pow(10.0, i / 6.0));
    for (double t : w.times)
      w.drawdowns.push_back(schedule_drawdown(WellTestModel::neuman, truth, test.schedule, r, t));
    test.wells.push_back(std::move(w));
  }
  const ModelFit fit = fit_pumping_test(test, WellTestModel::neuman);
  for (std::size_t j = 0; j < truth.size(); ++j)
    CHECK(fit.fit.parameters[static_cast<Eigen::Index>(j)] == Approx(truth[j]).epsilon(0.005));
  // The derivative shows the delayed-yield trough and the classification says so.
  // A long drainage length (beta = 7e-4 at 8 m) makes the trough deep enough to be seen; with
  // L_v = 30 m it is shallow and the derivative only rises at late time.
  PumpingTest deep = test;
  for (ObservationSeries& w : deep.wells)
    for (std::size_t i = 0; i < w.times.size(); ++i)
      w.drawdowns[i] = schedule_drawdown(WellTestModel::neuman, {t_aq, s_el, s_y, 300.0},
                                         deep.schedule, w.distance, w.times[i]);
  const PumpingTestInterpretation result = interpret_pumping_test(deep, WellTestModel::neuman);
  bool trough = false;
  for (const std::string& s : result.classification)
    trough = trough || s.find("delayed yield") != std::string::npos;
  INFO(result.classification[1]);
  CHECK(trough);
  // The fitted model already has delayed yield: the sentence says so instead of suggesting it.
  CHECK(result.classification[1].find("the fitted model (neuman) includes delayed yield") !=
        std::string::npos);
  CHECK(result.classification[1].find("may be worth") == std::string::npos);
}
