#pragma once
#include <algorithm>
#include <cmath>
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
  /// Stop a cell's head at the inflection point of its withdrawal reduction when an update
  /// would cross it (stopped_at_inflection, newton_iteration.hpp); water-table and switching
  /// cells only.
  bool limit_at_withdrawal_inflection = true;
  /// Converged without the proving solve when the residual test is met after a full step and
  /// the next update, estimated from the residual's contraction (contraction_update_estimate,
  /// newton_iteration.hpp), is below 1e-3 of head_tolerance.
  bool stop_on_contraction_estimate = true;
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

/// The norms of a residual scanned equation by equation in increasing index order, so that
/// ties of the largest go to the lowest index; scans of disjoint ranges (threads, ranks)
/// merge into the scan of their union. Both engines' norms are made with it.
struct ResidualScan {
  double sum_sq = 0.0;    ///< (L3/T)^2
  double largest = -1.0;  ///< L3/T, -1 before any equation
  int worst = -1;         ///< index of the largest, -1 before any equation
  void add(double r, int index) {
    const double a = std::abs(r);
    sum_sq += a * a;
    if (a > largest) largest = a, worst = index;
  }
  void merge(const ResidualScan& o) {
    sum_sq += o.sum_sq;
    if (o.largest > largest || (o.largest == largest && o.worst >= 0 && o.worst < worst))
      largest = o.largest, worst = o.worst;
  }
  ResidualNorms norms() const { return {std::max(largest, 0.0), std::sqrt(sum_sq), worst}; }
};

/// The norms of r over its threads' static ranges, merged in thread order (the same sums for
/// the same thread count).
ResidualNorms residual_norms(const Eigen::VectorXd& r);

/// Converged when max |dh| < head_tolerance, max |R_i| <= flow_tolerance * throughflow and
/// |sum R_i| <= 0.01 flow_tolerance * throughflow (the last closes the step's budget to
/// 1e-6 percent with the default tolerance); or when the residual test is met after a full
/// step and the next update, estimated from the residual's contraction, is below 1e-3 of the
/// head tolerance (stop_on_contraction_estimate); or, after an exact solve of a Jacobian that the
/// new heads leave unchanged, when the residual meets 1e-3 of the flow tolerance and the next
/// update, estimated as max |R_i| / A_ii, 1e-3 of the head tolerance. head (per grid cell) holds
/// the start on entry and the last iterate on return; the system must have its step set.
NewtonResult solve_newton(FlowSystem& system, LinearSolver& linear, const NewtonSettings& settings,
                          std::span<double> head, NewtonWorkspace& work);

}  // namespace aquiledger
