#include "postproc/bounded_least_squares.hpp"

#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace aquiledger {
namespace {

Eigen::VectorXd clamp_to_box(const Eigen::VectorXd& x, const Eigen::VectorXd& lo,
                             const Eigen::VectorXd& hi) {
  return x.cwiseMax(lo).cwiseMin(hi);
}

double weighted_cost(const Eigen::VectorXd& r, const Eigen::VectorXd& w) {
  return (r.array().square() * w.array()).sum();
}

void check_problem(const BoundedFitProblem& p) {
  const auto k = p.start.size();
  if (!p.model) throw std::invalid_argument("bounded fit: no model function");
  if (k == 0 || p.lower.size() != k || p.upper.size() != k)
    throw std::invalid_argument("bounded fit: start, lower and upper must have the same size");
  if (p.weights.size() != p.observed.size())
    throw std::invalid_argument("bounded fit: one weight per observation expected");
  if (p.observed.size() <= k)
    throw std::invalid_argument("bounded fit: more observations than parameters are needed");
  for (Eigen::Index i = 0; i < k; ++i)
    if (!(p.lower[i] > 0.0 && p.lower[i] <= p.start[i] && p.start[i] <= p.upper[i]))
      throw std::invalid_argument("bounded fit: need 0 < lower <= start <= upper for parameter " +
                                  std::to_string(i));
  if ((p.weights.array() < 0.0).any())
    throw std::invalid_argument("bounded fit: weights must not be negative");
}

}  // namespace

BoundedFitResult fit_bounded_least_squares(const BoundedFitProblem& problem,
                                           const BoundedFitSettings& settings) {
  check_problem(problem);
  const Eigen::Index k = problem.start.size();
  const Eigen::Index n = problem.observed.size();
  const Eigen::VectorXd lo = problem.lower.array().log();
  const Eigen::VectorXd hi = problem.upper.array().log();
  const Eigen::VectorXd& w = problem.weights;

  auto residual = [&](const Eigen::VectorXd& x) -> Eigen::VectorXd {
    return problem.observed - problem.model(x.array().exp().matrix());
  };
  // Forward differences in log p, stepping inward at an upper bound.
  auto jacobian = [&](const Eigen::VectorXd& x, const Eigen::VectorXd& r0) {
    Eigen::MatrixXd jac(n, k);  // d model / d ln p
    for (Eigen::Index j = 0; j < k; ++j) {
      Eigen::VectorXd xp = x;
      double h = settings.finite_difference_step;
      if (xp[j] + h > hi[j]) h = -h;
      xp[j] += h;
      jac.col(j) = (r0 - residual(xp)) / h;
    }
    return jac;
  };

  BoundedFitResult result;
  Eigen::VectorXd x = clamp_to_box(problem.start.array().log().matrix(), lo, hi);
  Eigen::VectorXd r = residual(x);
  double cost = weighted_cost(r, w);
  double lambda = 1e-3;
  Eigen::MatrixXd jac = jacobian(x, r);
  for (int it = 0; it < settings.max_iterations; ++it) {
    result.n_iterations = it + 1;
    const Eigen::MatrixXd jtwj = jac.transpose() * w.asDiagonal() * jac;
    const Eigen::VectorXd jtwr = jac.transpose() * (w.array() * r.array()).matrix();
    // More (1978): scale the damping by the diagonal of J^T W J so that the step does not
    // depend on the units of the parameters.
    Eigen::VectorXd scale = jtwj.diagonal().cwiseMax(1e-12 * jtwj.diagonal().maxCoeff() + 1e-300);
    bool accepted = false;
    double step_norm = 0.0;
    for (int tries = 0; tries < 30 && !accepted; ++tries) {
      Eigen::MatrixXd a = jtwj;
      a.diagonal() += lambda * scale;
      const Eigen::VectorXd dx = a.ldlt().solve(jtwr);
      const Eigen::VectorXd xt = clamp_to_box(x + dx, lo, hi);
      const Eigen::VectorXd rt = residual(xt);
      const double ct = weighted_cost(rt, w);
      if (std::isfinite(ct) && ct <= cost) {
        step_norm = (xt - x).cwiseAbs().maxCoeff();
        const double decrease = cost - ct;
        x = xt;
        r = rt;
        const bool small_cost = decrease <= settings.relative_cost_tolerance * (cost + 1e-300);
        cost = ct;
        lambda = std::max(lambda / 3.0, 1e-12);
        accepted = true;
        if (step_norm < settings.relative_step_tolerance || small_cost) result.converged = true;
      } else {
        lambda *= 4.0;
      }
    }
    if (!accepted) {  // no descent left at any damping: a minimum to the working precision
      result.converged = true;
      break;
    }
    jac = jacobian(x, r);
    if (result.converged) break;
  }

  result.parameters = x.array().exp();
  result.residuals = r;
  result.weighted_sum_of_squares = cost;
  result.at_bound.resize(k);
  for (Eigen::Index j = 0; j < k; ++j)
    result.at_bound[j] = x[j] <= lo[j] + 1e-9 || x[j] >= hi[j] - 1e-9;

  const Eigen::MatrixXd jtwj = jac.transpose() * w.asDiagonal() * jac;
  const double dof = static_cast<double>(n - k);
  const double s2 = cost / dof;
  Eigen::CompleteOrthogonalDecomposition<Eigen::MatrixXd> cod(jtwj);
  result.log_covariance = s2 * cod.pseudoInverse();
  const boost::math::students_t student(dof);
  const double t975 = boost::math::quantile(student, 0.975);
  result.lower_95.resize(k);
  result.upper_95.resize(k);
  result.correlation.resize(k, k);
  for (Eigen::Index i = 0; i < k; ++i) {
    const double sd = std::sqrt(std::max(result.log_covariance(i, i), 0.0));
    result.lower_95[i] = std::exp(x[i] - t975 * sd);
    result.upper_95[i] = std::exp(x[i] + t975 * sd);
    for (Eigen::Index j = 0; j < k; ++j) {
      const double d = std::sqrt(result.log_covariance(i, i) * result.log_covariance(j, j));
      result.correlation(i, j) =
          d > 0.0 ? result.log_covariance(i, j) / d : std::numeric_limits<double>::quiet_NaN();
    }
  }
  return result;
}

double akaike_criterion(double weighted_sum_of_squares, int n_observations, int n_parameters) {
  const double n = n_observations;
  return n * std::log(weighted_sum_of_squares / n) + 2.0 * n_parameters;
}

double corrected_akaike_criterion(double weighted_sum_of_squares, int n_observations,
                                  int n_parameters) {
  const double k = n_parameters;
  return akaike_criterion(weighted_sum_of_squares, n_observations, n_parameters) +
         2.0 * k * (k + 1.0) / (n_observations - k - 1.0);
}

}  // namespace aquiledger
