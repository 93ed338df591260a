#pragma once
// Parameter estimation: the set-up's targets simulated with exact sensitivities
// (solver/forward_sensitivities.hpp) and fitted by the shared bounded Levenberg-Marquardt
// (bounded_least_squares.hpp), with the statistics of Hill and Tiedeman (2007), Effective
// Groundwater Model Calibration, Wiley: linearised 95 % intervals, parameter correlations,
// composite scaled sensitivities. Pure numerics, no I/O (docs/estimation.md).
#include <string>
#include <vector>

#include "postproc/bounded_least_squares.hpp"
#include "postproc/estimation_setup.hpp"

namespace aquiledger {

/// |r| above which two parameters are reported as not separately identifiable (Hill and
/// Tiedeman, 2007, guideline 9 and sec. 7.2.2 use 0.95; common practice).
inline constexpr double identifiability_correlation = 0.95;

/// The simulated values of every target at its times, in the set-up's order (targets, then
/// times), with d value / d ln p per parameter (rows: values, columns: parameters).
struct SimulatedTargets {
  Eigen::VectorXd values;
  Eigen::MatrixXd d_ln_p;
};

/// Runs the model with the parameters at `values`; throws std::runtime_error when the run
/// does not converge.
SimulatedTargets simulate_targets(const Model& base, const EstimationSetup& setup,
                                  const Eigen::VectorXd& values);

/// The measured values and their weights, in the set-up's order (targets, then times).
struct MeasuredTargets {
  Eigen::VectorXd observed;  ///< L (L3/T for flows)
  Eigen::VectorXd weights;   ///< 1 / value unit^2
};
MeasuredTargets measured_targets(const EstimationSetup& setup);

/// The fit's objective, Phi = sum_i w_i (observed_i - simulated_i)^2 + sum_j w_j (prior_j -
/// x_j)^2 (the weighted sum of squares bounded_least_squares minimises), and its gradient with
/// respect to the fit's variables x (ln p for a log parameter, p otherwise).
struct ObjectiveGradient {
  double objective = 0.0;     ///< -, when the weights are 1 / variance
  Eigen::VectorXd gradient;   ///< dPhi/dx
  Eigen::VectorXd simulated;  ///< the targets' simulated values
};

/// Phi and its gradient by the adjoint method (solver/adjoint_gradient.hpp): one run keeping
/// its states and one backward pass, whatever the number of parameters. Throws
/// std::runtime_error when the run does not converge.
ObjectiveGradient adjoint_objective_gradient(const Model& base, const EstimationSetup& setup,
                                             const Eigen::VectorXd& values);
/// The same from the forward sensitivities, -2 J^T W r plus the priors' terms (one solve per
/// parameter and step).
ObjectiveGradient forward_objective_gradient(const Model& base, const EstimationSetup& setup,
                                             const Eigen::VectorXd& values);

/// Composite scaled sensitivity of each parameter (Hill and Tiedeman, 2007, eq. 4-3):
/// css_j = sqrt( sum_i (d y_i / d ln p_j * w_i^(1/2))^2 / n ), the dimensionless scaled
/// sensitivities (d y / d b) b w^(1/2) averaged over the n observations.
Eigen::VectorXd composite_scaled_sensitivities(const Eigen::MatrixXd& d_ln_p,
                                               const Eigen::VectorXd& weights);

struct EstimationResult {
  BoundedFitResult fit;               ///< parameters, intervals, correlation, residuals
  Eigen::VectorXd observed, weights;  ///< the measured values and weights, in target order
  Eigen::VectorXd css;                ///< composite scaled sensitivities at the estimates
  std::vector<std::string> warnings;  ///< pairs with |r| > 0.95, bounds reached, no convergence
  int n_model_runs = 0;               ///< runs with sensitivities
  /// dPhi/dx at the estimates (the first-order optimality: about 0 for a parameter inside
  /// its bounds at a converged fit), and how it was computed: "forward" or "adjoint".
  Eigen::VectorXd gradient;
  std::string gradient_method;
};

/// Fits the set-up's parameters to its targets.
EstimationResult estimate_parameters(const Model& base, const EstimationSetup& setup);

}  // namespace aquiledger
