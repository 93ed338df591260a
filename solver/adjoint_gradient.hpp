#pragma once
// The adjoint (backward) gradient of an objective Phi of the heads at the run's states with
// respect to the model's parameters: one forward run that keeps every converged state, then
// one backward pass with the transposed Jacobians of the steps. With R_n(h_n, h_{n-1}, p) = 0
// the balances of step n, A_n = -dR_n/dh_n (the matrix Newton assembles) and
// D_n = dR_n/dh_{n-1} (diagonal: the storage release's dependence on the start heads, zero in
// a steady step), the multipliers of the steps, from the last back to the first,
//   A_n^T lambda_n = dPhi/dh_n + D_{n+1} lambda_{n+1},     lambda_{N+1} = 0,
// give dPhi/dp = sum_n lambda_n^T dR_n/dp + (the objective's explicit dPhi/dp). This is the
// transpose of the forward method (forward_sensitivities.hpp), written with the same dR/dp
// (residual_log_slope) and the same D_n (storage_function.hpp): lambda_n^T J_n =
// -dPhi/dh_n - lambda_{n+1}^T dR_{n+1}/dh_n with J_n = dR_n/dh_n = -A_n (Sun, 1994, Inverse
// Problems in Groundwater Modeling, Kluwer, ch. 8; Carrera and Neuman, 1986, Water Resour.
// Res. 22(2) 211-227, the adjoint state of the discretised equations; both citations from
// memory). docs/estimation.md.
#include <Eigen/Core>
#include <span>
#include <vector>

#include "solver/model_parameter.hpp"
#include "solver/simulation.hpp"

namespace aquiledger {

/// The objective's side of the adjoint gradient.
class AdjointObjective {
 public:
  virtual ~AdjointObjective() = default;
  /// Forward pass: the initial heads (info null) or the end of an accepted step; head (per
  /// grid cell, NaN where inactive) and info are valid during the call only.
  virtual void state(const StepInfo* info, std::span<const double> head) = 0;
  /// After a converged forward run, before the backward pass (the objective can now be
  /// evaluated). Default: nothing.
  virtual void run_done() {}
  /// Backward pass, after the run: adds dPhi/dh (Phi's unit per L) of state k (0: the initial
  /// state, then one per accepted step, in the order state() saw them) into g, per grid cell.
  /// head: the heads of that state.
  virtual void add_head_gradient(std::size_t k, std::span<const double> head,
                                 std::span<double> g) = 0;
};

struct AdjointRun {
  RunResult run;
  /// dPhi/d ln p through the heads (Phi's unit): without the objective's explicit dependence
  /// on the parameters, which its caller adds.
  Eigen::VectorXd gradient;
  long adjoint_solves = 0;          ///< transposed solves of the backward pass
  long adjoint_factorizations = 0;  ///< numeric factorisations (or set-ups) of the backward pass
  std::size_t stored_states = 0;    ///< heads kept in memory (states x cells doubles)
};

/// Runs the model (its parameters at their values already) keeping every converged state, then
/// computes the gradient by the backward pass above. Models with interbeds are not supported
/// (std::invalid_argument). When the run fails, the gradient is empty.
AdjointRun run_with_adjoint_gradient(const Model& model, std::span<const ModelParameter> parameters,
                                     AdjointObjective& objective);

}  // namespace aquiledger
