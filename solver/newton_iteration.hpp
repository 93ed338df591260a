#pragma once
// Newton-Raphson with a backtracking line search, written once over any "problem": the
// serial engine's (newton_solver.cpp) and the distributed engine's (solver/distributed/).
// A problem holds the heads, the residual and the update, and provides
//   void assemble();                  residual and matrix at the current heads
//   ResidualNorms norms() const;      over every equation (all ranks)
//   double throughflow(), rounding_floor(), residual_sum() const;   as in FlowSystem
//   bool solve_linear(int& iterations);   update = matrix^-1 residual
//   void save_base();                 keeps the current heads
//   double apply(double step);        heads = base + step * update; returns max |step * update|
//   CellIndex cell_of(int worst) const;   the cell of ResidualNorms::worst
#include <algorithm>
#include <cmath>

#include "solver/newton_solver.hpp"

namespace aquiledger {

/// The convergence test on the residual (see solve_newton).
struct ResidualCheck {
  double max_relative = 0.0;
  double sum_relative = 0.0;
  int worst = -1;
  bool ok = false;
};

/// throughflow, rounding_floor and residual_sum as in FlowSystem (L3/T).
inline ResidualCheck check_residual(double throughflow, double rounding_floor, double residual_sum,
                                    const ResidualNorms& norms, const NewtonSettings& s) {
  ResidualCheck c;
  const double worst = norms.worst >= 0 ? norms.max_abs : -1.0;
  c.worst = norms.worst;
  const double scale = throughflow;
  // No budget term at all: only rounding of internal flows may remain.
  if (!(scale > 0.0)) {
    c.ok = worst <= rounding_floor;
    return c;
  }
  c.max_relative = std::max(worst, 0.0) / scale;
  c.sum_relative = std::abs(residual_sum) / scale;
  // Where internal circulation dwarfs the budget, rounding sets what is reachable.
  const double floor = rounding_floor;
  c.ok = std::max(worst, 0.0) <= std::max(s.flow_tolerance * scale, floor) &&
         std::abs(residual_sum) <= std::max(0.01 * s.flow_tolerance * scale, floor);
  return c;
}

/// Inexact Newton: the relative residual each iterative linear solve stops at (the forcing
/// term), Eisenstat and Walker, SIAM J. Sci. Comput. 17 (1996) 16-32, choice 2 with their
/// gamma = 0.9, alpha = 2 and safeguard: eta_k = gamma (|F_k| / |F_k-1|)^alpha, at least
/// gamma eta_k-1^alpha when that exceeds 0.1. Our bounds: at most 0.1 (the first solve
/// included), at least iterative_tolerance, and never tighter than needed for a linear-model
/// step to meet the budget test |sum R| <= 0.01 flow_tolerance * throughflow ten times over
/// (|sum r| <= sqrt(n) |r|): the nonlinear test after the update decides convergence, so a
/// looser solve can cost a Newton iteration but never accuracy.
struct ForcingTerm {
  static constexpr double gamma = 0.9, alpha = 2.0, most = 0.1;
  double eta = most;
  double previous_norm = -1.0;
  double next(double norm, double throughflow, double flow_tolerance, int n) {
    if (previous_norm > 0.0 && norm > 0.0) {
      const double guard = gamma * std::pow(eta, alpha);
      eta = gamma * std::pow(norm / previous_norm, alpha);
      if (guard > 0.1) eta = std::max(eta, guard);
    }
    previous_norm = norm;
    eta = std::min(eta, most);
    if (norm > 0.0 && throughflow > 0.0 && n > 0) {
      const double needed = 1.0e-3 * flow_tolerance * throughflow / std::sqrt(double(n));
      eta = std::max(eta, std::min(most, needed / norm));
    }
    return std::max(eta, iterative_tolerance);
  }
};

/// Head update limit at an inflection point: an update that takes a cell's head from h0 strictly
/// across the point s to h ends at s instead; from s itself the next update goes on freely.
/// Newton's method on an S-shaped function converges when no update crosses an inflection
/// point in one iteration, so the iterate is held there once and the next linearisation, at
/// the steepest point, sees the curvature (Jenny, Tchelepi and Lee, J. Comput. Phys. 228
/// (2009) 7497-7512, trust regions bounded by the inflection points of the flux function;
/// Wang and Tchelepi, J. Comput. Phys. 253 (2013) 114-137; both from memory). Used at the
/// withdrawal reduction (stress_kernels.hpp), where pumped cells near their base made Newton
/// cycle: 1e6-cell switching basin, 5 steps per period, 138 -> 90 Newton iterations in 10
/// steps, 60 -> 5 of them damped by the line search (docs/performance.md). L.
inline double stopped_at_inflection(double h0, double h, double s) {
  return (h0 > s && h < s) || (h0 < s && h > s) ? s : h;
}

/// The next Newton update estimated from the last one (L, max |dh|) and the residual norms before
/// and after it (L3/T): an iteration contracting at the rate theta = |F_k| / |F_k-1| < 1 is at
/// most theta / (1 - theta) times its last update from its limit (the a posteriori bound of a
/// contraction, Banach's fixed-point theorem; the rate from the residual norms as in the
/// residual-based monotonicity test of Deuflhard, Newton Methods for Nonlinear Problems,
/// Springer, 2004, section 2.2; both from memory). Infinity unless theta < 1/2 (our choice: no
/// estimate while the iteration is not clearly contracting). Measured against the update the
/// proving iteration then made (1e6-cell switching basin, 12 steps): 0.31 to 3.2 times it, so it is
/// used only with a margin of 1e-3 (docs/performance.md, "Sixth pass").
inline double contraction_update_estimate(double last_update, double norm_before,
                                          double norm_after) {
  if (!(norm_before > 0.0) || !(norm_after >= 0.0)) return INFINITY;
  const double theta = norm_after / norm_before;
  return theta < 0.5 ? last_update * theta / (1.0 - theta) : INFINITY;
}

/// Margin of a skipped proving solve: residual and estimated update 1000 times below the
/// tolerances (a design choice of ours, far above the rounding such steps leave, ~1e-13).
inline constexpr double affine_margin = 1.0e-3;

template <class Problem>
NewtonResult newton_iterate(Problem& problem, const NewtonSettings& settings) {
  NewtonResult result;
  auto check_now = [&](const ResidualNorms& norms) {
    const ResidualCheck c = check_residual(problem.throughflow(), problem.rounding_floor(),
                                           problem.residual_sum(), norms, settings);
    result.max_imbalance = c.max_relative;
    result.sum_imbalance = c.sum_relative;
    result.worst_cell = c.worst >= 0 ? problem.cell_of(c.worst) : CellIndex{};
    return c;
  };

  problem.assemble();
  ResidualNorms norms = problem.norms();
  ResidualCheck check = check_now(norms);
  double norm = norms.norm;
  ForcingTerm forcing;
  while (result.iterations < settings.max_iterations) {
    if constexpr (requires { problem.set_linear_tolerance(1.0); }) {
      problem.set_linear_tolerance(
          forcing.next(norm, problem.throughflow(), settings.flow_tolerance, problem.n_unknowns()));
    }
    int linear_iterations = 0;
    if (!problem.solve_linear(linear_iterations)) {
      result.linear_failure = true;
      return result;
    }
    ++result.iterations;
    result.linear_iterations += linear_iterations;
    problem.save_base();

    // Backtrack while the residual norm does not fall (Armijo condition); once the residual
    // already meets the tolerance the full step is taken.
    const double norm_before = norm;
    double step = 1.0;
    for (int cut = 0;; ++cut) {
      result.max_head_change = problem.apply(step);
      problem.assemble();
      norms = problem.norms();
      const double trial = norms.norm;
      const bool finite = std::isfinite(trial);
      if ((finite && (check.ok || trial <= (1.0 - 1.0e-4 * step) * norm)) || cut == 4) {
        norm = trial;
        break;
      }
      step *= 0.5;
    }
    check = check_now(norms);
    if (check.ok && result.max_head_change < settings.head_tolerance) {
      result.converged = true;
      return result;
    }
    // The residual test is met and a full Newton step contracted the residual so far that the
    // next update, estimated from this one, would be far below the head tolerance: the solve
    // that would only prove the head-change test is skipped (the budget closes as it is).
    if (settings.stop_on_contraction_estimate && step == 1.0 && check.ok) {
      const double next = contraction_update_estimate(result.max_head_change, norm_before, norm);
      if (next < affine_margin * settings.head_tolerance) {
        result.max_head_change = next;
        result.converged = true;
        return result;
      }
    }
    // A problem that can tell an exact solve of a Jacobian the new heads leave unchanged: the
    // residual was affine along the update (every cell on one linear piece: a confined model,
    // or water-table cells far from any switch), so the update solved the step and what is
    // left is rounding. The proving solve is skipped when the residual sits far below the
    // tolerance and the next update, estimated cell by cell, far below the head tolerance.
    if constexpr (requires { problem.affine_update_estimate(); }) {
      NewtonSettings strict = settings;
      strict.flow_tolerance *= affine_margin;
      if (step == 1.0 && check_residual(problem.throughflow(), problem.rounding_floor(),
                                        problem.residual_sum(), norms, strict)
                             .ok) {
        const double next = problem.affine_update_estimate();
        if (next < affine_margin * settings.head_tolerance) {
          result.max_head_change = next;
          result.converged = true;
          return result;
        }
      }
    }
  }
  return result;
}

}  // namespace aquiledger
