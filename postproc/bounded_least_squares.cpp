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
  if (!p.model && !p.model_with_jacobian)
    throw std::invalid_argument("bounded fit: no model function");
  if (k == 0 || p.lower.size() != k || p.upper.size() != k)
    throw std::invalid_argument("bounded fit: start, lower and upper must have the same size");
  if (p.weights.size() != p.observed.size())
    throw std::invalid_argument("bounded fit: one weight per observation expected");
  if (!p.linear.empty() && static_cast<Eigen::Index>(p.linear.size()) != k)
    throw std::invalid_argument("bounded fit: one transform flag per parameter expected");
  if (p.prior.size() != p.prior_weights.size() || (p.prior.size() != 0 && p.prior.size() != k))
    throw std::invalid_argument("bounded fit: priors and their weights: none or one per parameter");
  const Eigen::Index n_priors = p.prior.size() == 0 ? 0 : (p.prior_weights.array() > 0.0).count();
  if (p.observed.size() + n_priors <= k)
    throw std::invalid_argument("bounded fit: more observations than parameters are needed");
  for (Eigen::Index i = 0; i < k; ++i)
    if (!(p.lower[i] > 0.0 && p.lower[i] <= p.start[i] && p.start[i] <= p.upper[i]))
      throw std::invalid_argument("bounded fit: need 0 < lower <= start <= upper for parameter " +
                                  std::to_string(i));
  if ((p.weights.array() < 0.0).any() || (p.prior_weights.array() < 0.0).any())
    throw std::invalid_argument("bounded fit: weights must not be negative");
}

}  // namespace

BoundedFitResult fit_bounded_least_squares(const BoundedFitProblem& problem,
                                           const BoundedFitSettings& settings) {
  check_problem(problem);
  const Eigen::Index k = problem.start.size();
  const Eigen::Index n_obs = problem.observed.size();
  // The fitted unknowns x: ln p, or p for a linear parameter.
  auto is_linear = [&](Eigen::Index j) { return !problem.linear.empty() && problem.linear[j]; };
  auto to_x = [&](const Eigen::VectorXd& p) {
    Eigen::VectorXd x(k);
    for (Eigen::Index j = 0; j < k; ++j) x[j] = is_linear(j) ? p[j] : std::log(p[j]);
    return x;
  };
  auto to_p = [&](const Eigen::VectorXd& x) {
    Eigen::VectorXd p(k);
    for (Eigen::Index j = 0; j < k; ++j) p[j] = is_linear(j) ? x[j] : std::exp(x[j]);
    return p;
  };
  const Eigen::VectorXd lo = to_x(problem.lower);
  const Eigen::VectorXd hi = to_x(problem.upper);
  // Prior equations are observations x_prior of the model x, appended after the data.
  std::vector<Eigen::Index> prior_of;
  for (Eigen::Index j = 0; j < problem.prior.size(); ++j)
    if (problem.prior_weights[j] > 0.0) prior_of.push_back(j);
  const auto n_priors = static_cast<Eigen::Index>(prior_of.size());
  const Eigen::Index n = n_obs + n_priors;
  Eigen::VectorXd observed(n), w(n);
  observed.head(n_obs) = problem.observed;
  w.head(n_obs) = problem.weights;
  {
    const Eigen::VectorXd xp = n_priors > 0 ? to_x(problem.prior) : Eigen::VectorXd();
    for (Eigen::Index m = 0; m < n_priors; ++m) {
      observed[n_obs + m] = xp[prior_of[static_cast<std::size_t>(m)]];
      w[n_obs + m] = problem.prior_weights[prior_of[static_cast<std::size_t>(m)]];
    }
  }
  // The augmented model at x; with jac, also d model / dx when the problem gives exact
  // derivatives (else jac is left for the forward differences below).
  auto evaluate = [&](const Eigen::VectorXd& x, Eigen::MatrixXd* jac) -> Eigen::VectorXd {
    const Eigen::VectorXd p = to_p(x);
    Eigen::VectorXd m(n);
    if (problem.model_with_jacobian) {
      Eigen::MatrixXd d_ln_p;
      m.head(n_obs) = problem.model_with_jacobian(p, jac ? &d_ln_p : nullptr);
      if (jac) {
        jac->setZero(n, k);
        for (Eigen::Index j = 0; j < k; ++j)
          jac->col(j).head(n_obs) =
              is_linear(j) ? Eigen::VectorXd(d_ln_p.col(j) / p[j]) : Eigen::VectorXd(d_ln_p.col(j));
      }
    } else {
      m.head(n_obs) = problem.model(p);
    }
    for (Eigen::Index r = 0; r < n_priors; ++r) {
      m[n_obs + r] = x[prior_of[static_cast<std::size_t>(r)]];
      if (jac && problem.model_with_jacobian)
        (*jac)(n_obs + r, prior_of[static_cast<std::size_t>(r)]) = 1.0;
    }
    return m;
  };
  // Forward differences in x, stepping inward at an upper bound.
  auto difference_jacobian = [&](const Eigen::VectorXd& x, const Eigen::VectorXd& m0) {
    Eigen::MatrixXd jac(n, k);
    for (Eigen::Index j = 0; j < k; ++j) {
      Eigen::VectorXd xp = x;
      double h =
          settings.finite_difference_step * (is_linear(j) ? std::max(std::abs(x[j]), 1e-300) : 1.0);
      if (xp[j] + h > hi[j]) h = -h;
      xp[j] += h;
      jac.col(j) = (evaluate(xp, nullptr) - m0) / h;
    }
    return jac;
  };
  auto model_and_jacobian = [&](const Eigen::VectorXd& x, Eigen::MatrixXd& jac) {
    if (problem.model_with_jacobian) return evaluate(x, &jac);
    Eigen::VectorXd m = evaluate(x, nullptr);
    jac = difference_jacobian(x, m);
    return m;
  };
  // A trial the model cannot evaluate (it throws) counts as an infinite cost.
  auto try_evaluate = [&](const Eigen::VectorXd& x, Eigen::VectorXd& m) {
    try {
      m = evaluate(x, nullptr);
      return true;
    } catch (const std::exception&) {
      return false;
    }
  };

  BoundedFitResult result;
  Eigen::VectorXd x = clamp_to_box(to_x(problem.start), lo, hi);
  Eigen::MatrixXd jac;
  Eigen::VectorXd model_x = model_and_jacobian(x, jac);
  Eigen::VectorXd r = observed - model_x;
  double cost = weighted_cost(r, w);
  result.cost_history.push_back(cost);
  double lambda = 1e-3;
  for (int it = 0; it < settings.max_iterations; ++it) {
    result.n_iterations = it + 1;
    const Eigen::MatrixXd jtwj = jac.transpose() * w.asDiagonal() * jac;
    const Eigen::VectorXd jtwr = jac.transpose() * (w.array() * r.array()).matrix();
    // More (1978): scale the damping by the diagonal of J^T W J so that the step does not
    // depend on the units of the parameters.
    Eigen::VectorXd scale = jtwj.diagonal().cwiseMax(1e-12 * jtwj.diagonal().maxCoeff() + 1e-300);
    bool accepted = false;
    double step_norm = 0.0;
    Eigen::VectorXd accepted_model;  // the model at the accepted trial, not run again below
    for (int tries = 0; tries < 30 && !accepted; ++tries) {
      Eigen::MatrixXd a = jtwj;
      a.diagonal() += lambda * scale;
      const Eigen::VectorXd dx = a.ldlt().solve(jtwr);
      const Eigen::VectorXd xt = clamp_to_box(x + dx, lo, hi);
      Eigen::VectorXd mt;
      const double ct = try_evaluate(xt, mt) ? weighted_cost(observed - mt, w)
                                             : std::numeric_limits<double>::infinity();
      if (std::isfinite(ct) && ct <= cost) {
        step_norm = (xt - x).cwiseAbs().maxCoeff();
        const double decrease = cost - ct;
        x = xt;
        accepted_model = std::move(mt);
        const bool small_cost = decrease <= settings.relative_cost_tolerance * (cost + 1e-300);
        cost = ct;
        result.cost_history.push_back(cost);
        lambda = std::max(lambda / 3.0, 1e-12);
        accepted = true;
        const std::size_t n_costs = result.cost_history.size();
        const bool stalled =
            settings.stall_window > 0 &&
            n_costs > static_cast<std::size_t>(settings.stall_window) &&
            result.cost_history[n_costs - 1 - static_cast<std::size_t>(settings.stall_window)] -
                    cost <=
                settings.stall_relative_decrease * cost;
        if (step_norm < settings.relative_step_tolerance || small_cost || stalled)
          result.converged = true;
      } else {
        lambda *= 4.0;
      }
    }
    if (!accepted) {  // no descent left at any damping: a minimum to the working precision
      result.converged = true;
      break;
    }
    // Exact derivatives come with a model run of their own (callers cache a repeated point);
    // differences start from the accepted trial's values.
    if (problem.model_with_jacobian) {
      model_x = evaluate(x, &jac);
    } else {
      model_x = std::move(accepted_model);
      jac = difference_jacobian(x, model_x);
    }
    r = observed - model_x;
    cost = weighted_cost(r, w);
    if (result.converged) break;
  }

  result.parameters = to_p(x);
  result.residuals = r.head(n_obs);
  result.simulated = model_x.head(n_obs);
  result.weighted_sum_of_squares = cost;
  result.jacobian.resize(n_obs, k);
  for (Eigen::Index j = 0; j < k; ++j)
    result.jacobian.col(j) = is_linear(j)
                                 ? Eigen::VectorXd(jac.col(j).head(n_obs) * result.parameters[j])
                                 : Eigen::VectorXd(jac.col(j).head(n_obs));
  result.at_bound.resize(k);
  for (Eigen::Index j = 0; j < k; ++j) {
    const double tol = 1e-9 * (is_linear(j) ? std::max(std::abs(hi[j]), 1.0) : 1.0);
    result.at_bound[j] = x[j] <= lo[j] + tol || x[j] >= hi[j] - tol;
  }

  const Eigen::MatrixXd jtwj = jac.transpose() * w.asDiagonal() * jac;
  const double dof = static_cast<double>(n - k);
  const double s2 = cost / dof;
  result.error_variance = s2;
  Eigen::CompleteOrthogonalDecomposition<Eigen::MatrixXd> cod(jtwj);
  result.log_covariance = s2 * cod.pseudoInverse();
  const boost::math::students_t student(dof);
  const double t975 = boost::math::quantile(student, 0.975);
  result.lower_95.resize(k);
  result.upper_95.resize(k);
  result.correlation.resize(k, k);
  for (Eigen::Index i = 0; i < k; ++i) {
    const double sd = std::sqrt(std::max(result.log_covariance(i, i), 0.0));
    result.lower_95[i] = is_linear(i) ? x[i] - t975 * sd : std::exp(x[i] - t975 * sd);
    result.upper_95[i] = is_linear(i) ? x[i] + t975 * sd : std::exp(x[i] + t975 * sd);
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
