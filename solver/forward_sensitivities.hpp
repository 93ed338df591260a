#pragma once
// Exact forward (direct) sensitivities of the heads to model parameters. Each accepted step
// solves R_n(h_n, h_{n-1}, p) = 0; differentiating it gives, per parameter,
//   A_n s_n = dR_n/dp + (dR_n/dh_{n-1}) s_{n-1},    A_n = -dR_n/dh_n,  s_n = dh_n/dp,
// one more linear solve with the step's Jacobian at its converged heads per parameter (the
// direct method of sensitivity analysis; e.g. Hill and Tiedeman, 2007, Effective Groundwater
// Model Calibration, Wiley, ch. 4; Yeh, 1986, Water Resour. Res. 22(2) 95-108). dR/dp comes
// from the same kernels as the residual: every parameter scales its property linearly
// (model_parameter.hpp), so dR/d ln p is the part of the residual that property carries
// (a face flow times the elasticity of its factor, the storage release of S or Sy, the
// feature's flow). docs/estimation.md.
#include <Eigen/Core>
#include <span>
#include <vector>

#include "solver/model_parameter.hpp"
#include "solver/simulation.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

/// dh/d ln p (L) per parameter and grid cell: 0 at fixed cells, NaN at inactive ones.
using HeadSensitivities = std::vector<std::vector<double>>;

class SensitivityObserver {
 public:
  virtual ~SensitivityObserver() = default;
  /// The initial heads (info null) or the end of an accepted step, with the sensitivities
  /// of every head at that time. head and s are valid during the call only.
  virtual void state(const StepInfo* info, std::span<const double> head,
                     const HeadSensitivities& s) = 0;
};

struct SensitivityRun {
  RunResult run;
  long sensitivity_solves = 0;  ///< linear solves for the sensitivities
  /// Numeric factorisations (or preconditioner set-ups) the sensitivity solves added to the
  /// run's: 0 when each step's Newton factorisation was of its converged Jacobian.
  long sensitivity_factorizations = 0;
};

/// Runs the model (its parameters at their values already) and reports the sensitivities of
/// the heads to each parameter after the initial state and every accepted step. The solves
/// use the run's matrix at the converged heads and the run's linear solver (its kept
/// factorisation or preconditioner; SimulationObserver::converged_system). Models with
/// interbeds are not supported (std::invalid_argument).
SensitivityRun run_with_sensitivities(const Model& model,
                                      std::span<const ModelParameter> parameters,
                                      SensitivityObserver& observer);

/// dR/d ln p (L3/T per unknown) of one parameter at heads h after a step from h_old of length
/// dt in period (steady: no storage term); the right-hand side above without its old-head term.
void residual_log_slope(const Model& model, const SystemLayout& layout, const ModelParameter& p,
                        std::size_t period, bool steady, double dt, std::span<const double> h_old,
                        std::span<const double> h, Eigen::VectorXd& out);

/// dR/dh_old (L2/T per unknown, a diagonal): the storage release's dependence on the start
/// heads h_old of a transient step of length dt, A W'(h_old) / dt.
void old_head_slope(const Model& model, const SystemLayout& layout, double dt,
                    std::span<const double> h_old, Eigen::VectorXd& out);

/// Position in list_features(model) of feature f of the kind a feature property acts on.
std::size_t feature_position(const Model& model, ParameterProperty property, std::size_t f);

}  // namespace aquiledger
