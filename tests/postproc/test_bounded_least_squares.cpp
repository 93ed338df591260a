// The bounded Levenberg-Marquardt fit: exact recovery, bounds, intervals on noisy synthetic
// pumping tests, and the choice between models by AICc.
#include <catch2/catch.hpp>
#include <cmath>
#include <random>

#include "postproc/bounded_least_squares.hpp"
#include "postproc/well_test_models.hpp"

using namespace aquiledger;

namespace {

struct SyntheticTest {
  std::vector<double> times;
  Eigen::VectorXd drawdowns;
};

constexpr double q_test = 1000.0, r_obs = 60.0;  // m3/d, m (an invented test)

SyntheticTest synthesise(WellTestModel model, const std::vector<double>& p, double noise_sd,
                         unsigned seed) {
  SyntheticTest test;
  for (int i = 0; i < 40; ++i) test.times.push_back(1e-3 * std::pow(10.0, i / 10.0));
  test.drawdowns.resize(40);
  std::mt19937 generator(seed);
  std::normal_distribution<double> noise(0.0, noise_sd);
  for (int i = 0; i < 40; ++i)
    test.drawdowns[i] =
        schedule_drawdown(model, p, {{0.0, q_test}}, r_obs, test.times[i]) + noise(generator);
  return test;
}

BoundedFitResult fit(WellTestModel model, const SyntheticTest& test) {
  BoundedFitProblem problem;
  problem.model = [&](const Eigen::VectorXd& p) {
    Eigen::VectorXd s(test.times.size());
    const std::vector<double> pv(p.data(), p.data() + p.size());
    for (std::size_t i = 0; i < test.times.size(); ++i)
      s[i] = schedule_drawdown(model, pv, {{0.0, q_test}}, r_obs, test.times[i]);
    return s;
  };
  problem.observed = test.drawdowns;
  problem.weights = Eigen::VectorXd::Ones(test.drawdowns.size());
  const int k = n_model_parameters(model);
  problem.start = Eigen::VectorXd(k);
  problem.lower = Eigen::VectorXd(k);
  problem.upper = Eigen::VectorXd(k);
  problem.start.head(2) << 50.0, 1e-3;
  problem.lower.head(2) << 1e-2, 1e-7;
  problem.upper.head(2) << 1e5, 0.5;
  if (k == 3) {
    problem.start[2] = 1000.0;
    problem.lower[2] = 1.0;
    problem.upper[2] = 1e6;
  }
  return fit_bounded_least_squares(problem);
}

}  // namespace

TEST_CASE("exact data are recovered and bounds hold", "[bounded_least_squares]") {
  // y = a exp(-t / b) without noise: the fit must return (a, b) to the tolerance (by
  // construction).
  BoundedFitProblem problem;
  Eigen::VectorXd t = Eigen::VectorXd::LinSpaced(20, 0.0, 5.0);
  problem.model = [&](const Eigen::VectorXd& p) {
    return Eigen::VectorXd(p[0] * (-t.array() / p[1]).exp());
  };
  problem.observed = 3.0 * (-t.array() / 1.5).exp();
  problem.weights = Eigen::VectorXd::Ones(20);
  problem.start = Eigen::Vector2d(1.0, 1.0);
  problem.lower = Eigen::Vector2d(1e-3, 1e-3);
  problem.upper = Eigen::Vector2d(1e3, 1e3);
  BoundedFitResult exact = fit_bounded_least_squares(problem);
  CHECK(exact.converged);
  CHECK(exact.parameters[0] == Approx(3.0).epsilon(1e-7));
  CHECK(exact.parameters[1] == Approx(1.5).epsilon(1e-7));
  // With b bounded below the true value, the fit stops on the bound and says so.
  problem.upper[1] = 1.0;
  BoundedFitResult bounded = fit_bounded_least_squares(problem);
  CHECK(bounded.parameters[1] == Approx(1.0).epsilon(1e-12));
  CHECK(bounded.at_bound[1]);
  CHECK_FALSE(bounded.at_bound[0]);
  // Malformed problems are refused.
  problem.lower[0] = 0.0;
  CHECK_THROWS_AS(fit_bounded_least_squares(problem), std::invalid_argument);
}

TEST_CASE("noisy Theis and Hantush-Jacob tests: parameters inside their 95 % intervals",
          "[bounded_least_squares]") {
  // Synthetic tests with known parameters and Gaussian noise (fixed seeds): the generating
  // values must lie inside the fitted 95 % intervals (holds 95 % of the time by definition;
  // the seeds are fixed, so the check is deterministic).
  const std::vector<double> theis_p{250.0, 2e-4};
  const BoundedFitResult theis =
      fit(WellTestModel::theis, synthesise(WellTestModel::theis, theis_p, 0.005, 7));
  REQUIRE(theis.converged);
  for (int j = 0; j < 2; ++j) {
    CHECK(theis.lower_95[j] < theis_p[j]);
    CHECK(theis.upper_95[j] > theis_p[j]);
  }
  // T and S from one observation well are negatively correlated in log space (a larger T
  // with a smaller S moves the curve the same way at late time; Cooper and Jacob, 1946).
  CHECK(theis.correlation(0, 1) < 0.0);
  CHECK(theis.correlation(0, 0) == Approx(1.0));

  const std::vector<double> leaky_p{250.0, 2e-4, 300.0};
  const BoundedFitResult leaky = fit(WellTestModel::hantush_jacob,
                                     synthesise(WellTestModel::hantush_jacob, leaky_p, 0.005, 11));
  REQUIRE(leaky.converged);
  for (int j = 0; j < 3; ++j) {
    CHECK(leaky.lower_95[j] < leaky_p[j]);
    CHECK(leaky.upper_95[j] > leaky_p[j]);
  }
}

TEST_CASE("AICc prefers the generating model", "[bounded_least_squares]") {
  // Hurvich and Tsai (1989): the model with the lower AICc is preferred.
  auto aicc = [](const BoundedFitResult& r, int k) {
    return corrected_akaike_criterion(r.weighted_sum_of_squares,
                                      static_cast<int>(r.residuals.size()), k);
  };
  const SyntheticTest leaky_data =
      synthesise(WellTestModel::hantush_jacob, {250.0, 2e-4, 300.0}, 0.005, 3);
  CHECK(aicc(fit(WellTestModel::hantush_jacob, leaky_data), 3) <
        aicc(fit(WellTestModel::theis, leaky_data), 2));
  // On Theis data the leaky model may fit the noise a little better, but not by the 2 AICc
  // units that count as support for it (Burnham and Anderson, 2002; common practice).
  const SyntheticTest theis_data = synthesise(WellTestModel::theis, {250.0, 2e-4}, 0.005, 5);
  CHECK(aicc(fit(WellTestModel::theis, theis_data), 2) <
        aicc(fit(WellTestModel::hantush_jacob, theis_data), 3) + 2.0);
  // AIC by its definition: n ln(WSS / n) + 2 k, here 10 ln(0.1) + 4.
  CHECK(akaike_criterion(1.0, 10, 2) == Approx(10.0 * std::log(0.1) + 4.0));
  CHECK(corrected_akaike_criterion(1.0, 10, 2) == Approx(10.0 * std::log(0.1) + 4.0 + 12.0 / 7.0));
}

TEST_CASE("linear parameters, exact Jacobians and priors", "[bounded_least_squares]") {
  // A straight line y = a t + b through exact points: linear least squares has the unique
  // solution (a, b) that made them (Gauss-Markov; any statistics text), so the fit in p
  // itself, given d y / d ln p exactly, must return it.
  BoundedFitProblem problem;
  const Eigen::VectorXd t = Eigen::VectorXd::LinSpaced(6, 1.0, 6.0);
  problem.model_with_jacobian = [&](const Eigen::VectorXd& p, Eigen::MatrixXd* jac) {
    if (jac) {
      jac->resize(t.size(), 2);
      jac->col(0) = p[0] * t;                                   // d y / d ln a
      jac->col(1) = Eigen::VectorXd::Constant(t.size(), p[1]);  // d y / d ln b
    }
    return Eigen::VectorXd((p[0] * t.array() + p[1]).matrix());
  };
  problem.observed = (2.5 * t.array() + 4.0).matrix();
  problem.weights = Eigen::VectorXd::Ones(t.size());
  problem.start = Eigen::Vector2d(1.0, 1.0);
  problem.lower = Eigen::Vector2d(0.1, 0.1);
  problem.upper = Eigen::Vector2d(10.0, 10.0);
  problem.linear = {true, false};
  const BoundedFitResult free = fit_bounded_least_squares(problem);
  CHECK(free.parameters[0] == Approx(2.5).epsilon(1e-8));
  CHECK(free.parameters[1] == Approx(4.0).epsilon(1e-8));
  for (std::size_t i = 1; i < free.cost_history.size(); ++i)
    CHECK(free.cost_history[i] <= free.cost_history[i - 1]);
  // A prior on b with a weight 1e12 times the data's holds b at the prior; a then takes the
  // least-squares slope through the points with b fixed: sum t (y - b) / sum t^2.
  problem.prior = Eigen::Vector2d(1.0, 3.0);
  problem.prior_weights = Eigen::Vector2d(0.0, 1e12);
  const BoundedFitResult held = fit_bounded_least_squares(problem);
  const double a = (t.array() * (problem.observed.array() - 3.0)).sum() / t.squaredNorm();
  CHECK(held.parameters[1] == Approx(3.0).epsilon(1e-6));
  CHECK(held.parameters[0] == Approx(a).epsilon(1e-6));
}
