#pragma once
// Newton-Raphson on the cell mass balances with a backtracking line search on the residual
// norm. It reports a result; the time controller decides what to do with it.
#include <span>
#include <vector>

#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"

namespace aquiledger {

struct NewtonSettings {
  double head_tolerance = 1.0e-5;  ///< L
  double flow_tolerance = 1.0e-6;  ///< -, relative to the throughflow
  int max_iterations = 50;
};

struct NewtonResult {
  bool converged = false;
  int iterations = 0;  ///< linear solves
  int linear_iterations = 0;
  double max_head_change =
      0.0;  ///< L, last update (estimated next one when the proving solve was skipped)
  double max_imbalance = 0.0;  ///< -, largest |R_i| over the throughflow
  double sum_imbalance = 0.0;  ///< -, |sum R_i| over the throughflow
  CellIndex worst_cell;        ///< cell of the largest |R_i|
  bool linear_failure = false;
};

/// Newton's work vectors, kept between calls so the time loop does not allocate; the last
/// update also starts the next iterative linear solve.
struct NewtonWorkspace {
  Eigen::VectorXd update;    ///< L per unknown
  std::vector<double> base;  ///< L per unknown, heads before the update
};

/// The residual's largest magnitude (at `worst`) and its Euclidean norm, in one parallel pass.
struct ResidualNorms {
  double max_abs = 0.0;  ///< L3/T
  double norm = 0.0;     ///< L3/T
  int worst = -1;        ///< unknown of the largest |R_i|
};
ResidualNorms residual_norms(const Eigen::VectorXd& r);

/// Converged when max |dh| < head_tolerance, max |R_i| <= flow_tolerance * throughflow and
/// |sum R_i| <= 0.01 flow_tolerance * throughflow (the last closes the step's budget to
/// 1e-6 percent with the default tolerance); or, after an exact solve of a Jacobian that the
/// new heads leave unchanged, when the residual meets 1e-3 of the flow tolerance and the next
/// update, estimated as max |R_i| / A_ii, 1e-3 of the head tolerance. head (per grid cell) holds
/// the start on entry and the last iterate on return; the system must have its step set.
NewtonResult solve_newton(FlowSystem& system, LinearSolver& linear, const NewtonSettings& settings,
                          std::span<double> head, NewtonWorkspace& work);

}  // namespace aquiledger
