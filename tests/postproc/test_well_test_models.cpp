// The pumping-test models: values against scipy, superposition against the published
// recovery and boundary results, the logarithmic derivative against its known limits.
#include <catch2/catch.hpp>
#include <cmath>
#include <numbers>

#include "postproc/analytical_solutions.hpp"
#include "postproc/well_test_models.hpp"

using namespace aquiledger;

namespace {
constexpr double pi = std::numbers::pi;
}

TEST_CASE("unit-rate drawdowns match the well functions from scipy", "[well_test_models]") {
  const double t_aq = 200.0, s_aq = 1e-4, r = 30.0;
  auto time_for_u = [&](double u) { return r * r * s_aq / (4.0 * t_aq * u); };
  // Unit rate: s = W(u) / (4 pi T). W(u) = E1(u) from scipy.special.exp1 (/usr/bin/python3).
  for (auto [u, w] : {std::pair{1e-4, 8.633224704574706}, std::pair{1e-2, 4.037929576538113},
                      std::pair{0.5, 0.5597735947761608}, std::pair{2.0, 0.048900510708061125}})
    CHECK(4.0 * pi * t_aq *
              unit_rate_drawdown(WellTestModel::theis, {t_aq, s_aq}, r, time_for_u(u)) ==
          Approx(w).epsilon(1e-9));
  // Hantush and Jacob (1955) W(u, r/B) = integral_u^inf exp(-y - (r/B)^2/(4y)) / y dy by
  // scipy.integrate.quad (epsrel 1e-13).
  for (auto [u, rb, w] :
       {std::tuple{1e-3, 0.1, 4.829242921092325}, std::tuple{1e-2, 0.5, 1.8485700556343931},
        std::tuple{0.1, 1.0, 0.8190345004361193}})
    CHECK(4.0 * pi * t_aq *
              unit_rate_drawdown(WellTestModel::hantush_jacob, {t_aq, s_aq, r / rb}, r,
                                 time_for_u(u)) ==
          Approx(w).epsilon(1e-8));
  // Cooper and Jacob (1946): W(u) = -gamma - ln u + u - ... (the series of E1, Abramowitz and
  // Stegun 5.1.11); their 2.25 rounds 4 exp(-gamma) = 2.2458, so the line lies
  // ln(2.25 exp(gamma) / 4) - u + O(u^2) above Theis.
  for (double u : {1e-4, 1e-3}) {
    const double t = time_for_u(u);
    const double w_line =
        4.0 * pi * t_aq * unit_rate_drawdown(WellTestModel::cooper_jacob, {t_aq, s_aq}, r, t);
    const double w_theis =
        4.0 * pi * t_aq * unit_rate_drawdown(WellTestModel::theis, {t_aq, s_aq}, r, t);
    CHECK(w_line - w_theis ==
          Approx(std::log(2.25 * std::exp(std::numbers::egamma) / 4.0) - u).margin(u * u));
  }
  CHECK(unit_rate_drawdown(WellTestModel::theis, {t_aq, s_aq}, r, 0.0) == 0.0);
}

TEST_CASE("superposition in time gives Theis recovery", "[well_test_models]") {
  // Theis (1935): residual drawdown after pumping q for tp is q/(4 pi T) [W(u) - W(u')], which
  // for small u' is the recovery line q/(4 pi T) ln(t / t').
  const double t_aq = 200.0, s_aq = 1e-4, r = 30.0, q = 800.0, tp = 2.0;
  const std::vector<RateStep> schedule{{0.0, q}, {tp, 0.0}};
  for (double since_stop : {5.0, 20.0}) {
    const double t = tp + since_stop;
    const double residual = schedule_drawdown(WellTestModel::theis, {t_aq, s_aq}, schedule, r, t);
    CHECK(residual == Approx(q / (4.0 * pi * t_aq) * std::log(t / since_stop)).epsilon(1e-3));
  }
  // Before the stop the schedule is a single constant rate.
  CHECK(schedule_drawdown(WellTestModel::theis, {t_aq, s_aq}, schedule, r, 1.0) ==
        Approx(q * unit_rate_drawdown(WellTestModel::theis, {t_aq, s_aq}, r, 1.0)));
  // A rate step from q to 2 q at t1: at late time the Cooper-Jacob slope per ln t is that of
  // the new rate (the basis of step-drawdown analysis; common practice).
  const std::vector<RateStep> steps{{0.0, q}, {1.0, 2.0 * q}};
  // At t = 1000 the step began 999 before: ln((e 1000 - 1) / 999) = 1.0005 per unit ln t.
  const double s1 = schedule_drawdown(WellTestModel::theis, {t_aq, s_aq}, steps, r, 1000.0);
  const double s2 =
      schedule_drawdown(WellTestModel::theis, {t_aq, s_aq}, steps, r, 1000.0 * std::exp(1.0));
  CHECK(s2 - s1 == Approx(2.0 * q / (4.0 * pi * t_aq)).epsilon(1e-3));
}

TEST_CASE("image wells: barrier doubles the slope, recharge boundary reaches steady state",
          "[well_test_models]") {
  // Ferris et al. (1962): with a barrier the late semi-log slope doubles; with a recharge
  // boundary the drawdown becomes steady at q/(2 pi T) ln(r_image / r) (Thiem for the pair).
  const double t_aq = 200.0, s_aq = 1e-4, r = 30.0, r_image = 500.0, q = 800.0;
  const std::vector<RateStep> constant{{0.0, q}};
  const std::vector<double> p{t_aq, s_aq};
  auto s = [&](double t, bool recharge) {
    return schedule_drawdown(WellTestModel::theis, p, constant, r, t, {{r_image, recharge}});
  };
  CHECK(s(1e3 * std::exp(1.0), false) - s(1e3, false) ==
        Approx(2.0 * q / (4.0 * pi * t_aq)).epsilon(1e-3));
  CHECK(s(1e4, true) == Approx(q / (2.0 * pi * t_aq) * std::log(r_image / r)).epsilon(1e-3));
}

TEST_CASE("logarithmic derivative of known series", "[well_test_models]") {
  // s = a ln t + b has ds/d ln t = a everywhere (definition; Bourdet et al., 1989).
  std::vector<double> times, line, theis;
  for (int i = 0; i < 40; ++i) times.push_back(1e-3 * std::pow(10.0, i / 8.0));
  for (double t : times) {
    line.push_back(0.3 * std::log(t) + 1.0);
    theis.push_back(unit_rate_drawdown(WellTestModel::theis, {200.0, 1e-4}, 30.0, t));
  }
  for (double d : logarithmic_derivative(times, line)) CHECK(d == Approx(0.3).epsilon(1e-12));
  // Theis: the derivative tends to 1 / (4 pi T) at late time (Cooper and Jacob, 1946).
  CHECK(logarithmic_derivative(times, theis).back() ==
        Approx(1.0 / (4.0 * pi * 200.0)).epsilon(1e-3));
}

TEST_CASE("Papadopulos-Cooper: well-bore storage early, Theis late", "[well_test_models]") {
  const double t_aq = 50.0, s_aq = 1e-3, r_w = 0.5, r_c = 0.5, q = 100.0;  // m2/d, -, m, m3/d
  // Early on the casing supplies all of q: s_w = q t / (pi r_c^2) (mass balance of the
  // well bore; Papadopulos and Cooper, 1967).
  const double t_early = 1e-7;
  CHECK(papadopulos_cooper_drawdown(q, t_aq, s_aq, r_w, r_c, r_w, t_early) ==
        Approx(q * t_early / (std::numbers::pi * r_c * r_c)).epsilon(0.02));
  // After t > 250 r_c^2 / T the well-bore storage no longer matters (Papadopulos and Cooper,
  // 1967): the drawdown is Theis's at the well radius, within the Stehfest accuracy (1e-4 of the
  // scale q / (2 pi T); see test_laplace_inversion.cpp).
  const double t_late = 250.0 * r_c * r_c / t_aq * 10.0;
  CHECK(papadopulos_cooper_drawdown(q, t_aq, s_aq, r_w, r_c, r_w, t_late) ==
        Approx(theis_drawdown(q, t_aq, s_aq, r_w, t_late)).epsilon(0.01));
  // A vanishing casing at a small well is Theis at an observation radius at any time.
  CHECK(papadopulos_cooper_drawdown(q, t_aq, s_aq, 0.01, 1e-6, 20.0, 0.5) ==
        Approx(theis_drawdown(q, t_aq, s_aq, 20.0, 0.5)).epsilon(2e-3));
}
