#pragma once
// Weighted least squares with bounds for positive parameters: Levenberg-Marquardt (More,
// 1978) on the logarithms of the parameters, the bounds enforced by projecting each trial
// step onto the box. Pure numerics, no I/O.

#include <Eigen/Dense>
#include <functional>
#include <vector>

namespace aquiledger {

/// Model values (same units as the observations) for the given positive parameters.
using ModelFunction = std::function<Eigen::VectorXd(const Eigen::VectorXd& parameters)>;

/// Model values for the given positive parameters and, when jacobian is not null, their
/// exact derivatives with respect to ln p (one column per parameter), e.g. from forward
/// sensitivities. Throws to mark parameters where the model cannot be evaluated.
using ModelWithJacobian =
    std::function<Eigen::VectorXd(const Eigen::VectorXd& parameters, Eigen::MatrixXd* jacobian)>;

/// A fit to solve: observations, their weights (1 / variance, or relative weights), the start
/// and the bounds of each parameter (all strictly positive, lower <= start <= upper).
struct BoundedFitProblem {
  ModelFunction model;  ///< used (with forward differences) when model_with_jacobian is empty
  ModelWithJacobian model_with_jacobian;
  Eigen::VectorXd observed;
  Eigen::VectorXd weights;
  Eigen::VectorXd start;
  Eigen::VectorXd lower;
  Eigen::VectorXd upper;
  /// Per parameter: fitted as p itself instead of ln p (empty: every parameter in ln p).
  std::vector<bool> linear;
  /// Tikhonov regularisation: per parameter a prior value (as start) and the weight of the
  /// prior equation w (x_prior - x) = 0, x = ln p or p (1 / variance of x; 0: no prior).
  /// Empty: no priors. The prior equations count as observations in the statistics.
  Eigen::VectorXd prior;
  Eigen::VectorXd prior_weights;
};

struct BoundedFitSettings {
  int max_iterations = 200;
  double relative_step_tolerance = 1e-10;  ///< stop when |d log p| < this
  double relative_cost_tolerance = 1e-14;  ///< stop when the cost decreases less than this
  double finite_difference_step = 1e-6;    ///< step in log p for the Jacobian
  /// Stop when the last `stall_window` accepted steps together lowered the cost by less than
  /// `stall_relative_decrease` of it: a slow creep along a flat valley (0: never).
  int stall_window = 0;
  double stall_relative_decrease = 0.0;
};

/// The fitted parameters with their statistics. The intervals are 95 % intervals from the
/// linearised covariance s^2 (J^T W J)^-1 in log space (J the Jacobian in log p, s^2 the
/// weighted residual sum of squares over n - k), mapped back by exp: they are asymmetric
/// around the value and never cross zero.
struct BoundedFitResult {
  Eigen::VectorXd parameters;
  Eigen::VectorXd lower_95;
  Eigen::VectorXd upper_95;
  Eigen::MatrixXd log_covariance;  ///< covariance of ln p (of p for a linear parameter)
  Eigen::MatrixXd correlation;     ///< correlation of ln p (of p for a linear parameter)
  Eigen::VectorXd residuals;       ///< observed - model
  Eigen::VectorXd simulated;       ///< model at the parameters
  /// d model / d ln p at the parameters (the last Jacobian), one column per parameter.
  Eigen::MatrixXd jacobian;
  /// The objective (weighted sum of squares with the prior terms) at the start and after
  /// each accepted step.
  std::vector<double> cost_history;
  double error_variance = 0.0;  ///< s^2, the objective over (n + priors - k)
  std::vector<bool> at_bound;   ///< the parameter ended on one of its bounds
  double weighted_sum_of_squares = 0.0;
  int n_iterations = 0;
  bool converged = false;
};

/// Solves the problem; throws std::invalid_argument when the problem is malformed (sizes,
/// non-positive bounds, fewer observations than parameters).
BoundedFitResult fit_bounded_least_squares(const BoundedFitProblem& problem,
                                           const BoundedFitSettings& settings = {});

/// Akaike (1974) information criterion for a least-squares fit with Gaussian errors,
/// n ln(WSS / n) + 2 k, and its small-sample correction AICc = AIC + 2 k (k + 1) / (n - k - 1)
/// (Hurvich and Tsai, 1989). k counts the fitted parameters.
double akaike_criterion(double weighted_sum_of_squares, int n_observations, int n_parameters);
double corrected_akaike_criterion(double weighted_sum_of_squares, int n_observations,
                                  int n_parameters);

}  // namespace aquiledger
