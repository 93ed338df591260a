#include "solver/newton_solver.hpp"

#include <cmath>
#include <vector>

namespace aquiledger {

namespace {

struct ResidualCheck {
  double max_relative = 0.0;
  double sum_relative = 0.0;
  int worst = -1;
  bool ok = false;
};

ResidualCheck check_residual(const FlowSystem& system, const NewtonSettings& s) {
  ResidualCheck c;
  const Eigen::VectorXd& r = system.residual();
  double worst = -1.0;
  for (Eigen::Index i = 0; i < r.size(); ++i)
    if (std::abs(r[i]) > worst) worst = std::abs(r[i]), c.worst = static_cast<int>(i);
  const double scale = system.throughflow();
  // Nothing flows at all: the residual is zero up to rounding; judge heads alone.
  if (!(scale > 0.0)) {
    c.ok = !(worst > 0.0);
    return c;
  }
  c.max_relative = std::max(worst, 0.0) / scale;
  c.sum_relative = std::abs(system.residual_sum()) / scale;
  c.ok = c.max_relative <= s.flow_tolerance && c.sum_relative <= 0.01 * s.flow_tolerance;
  return c;
}

}  // namespace

NewtonResult solve_newton(FlowSystem& system, LinearSolver& linear, const NewtonSettings& settings,
                          std::span<double> head, NewtonWorkspace& work) {
  const SystemLayout& layout = system.layout();
  const int n = system.n_unknowns();
  NewtonResult result;
  if (work.update.size() != n) work.update.setZero(n);
  work.base.resize(static_cast<std::size_t>(n));
  Eigen::VectorXd& dh = work.update;
  std::vector<double>& base = work.base;
  auto apply = [&](double step) {
    double largest = 0.0;
    for (int u = 0; u < n; ++u) {
      const auto i =
          static_cast<std::size_t>(layout.cell_of_unknown[static_cast<std::size_t>(u)].value);
      head[i] = base[static_cast<std::size_t>(u)] + step * dh[u];
      largest = std::max(largest, std::abs(step * dh[u]));
    }
    return largest;
  };
  auto record = [&](const ResidualCheck& c) {
    result.max_imbalance = c.max_relative;
    result.sum_imbalance = c.sum_relative;
    result.worst_cell =
        c.worst >= 0 ? layout.cell_of_unknown[static_cast<std::size_t>(c.worst)] : CellIndex{};
  };

  system.assemble(head);
  ResidualCheck check = check_residual(system, settings);
  record(check);
  double norm = system.residual().norm();
  while (result.iterations < settings.max_iterations) {
    if (!linear.solve(system.matrix(), system.residual(), dh)) {
      result.linear_failure = true;
      return result;
    }
    ++result.iterations;
    result.linear_iterations += linear.last_iterations();
    for (int u = 0; u < n; ++u)
      base[static_cast<std::size_t>(u)] =
          head[static_cast<std::size_t>(layout.cell_of_unknown[static_cast<std::size_t>(u)].value)];

    // Backtrack while the residual norm does not fall (Armijo condition); once the residual
    // already meets the tolerance the full step is taken.
    double step = 1.0;
    for (int cut = 0;; ++cut) {
      result.max_head_change = apply(step);
      system.assemble(head);
      const double trial = system.residual().norm();
      const bool finite = std::isfinite(trial);
      if ((finite && (check.ok || trial <= (1.0 - 1.0e-4 * step) * norm)) || cut == 4) {
        norm = trial;
        break;
      }
      step *= 0.5;
    }
    check = check_residual(system, settings);
    record(check);
    if (check.ok && result.max_head_change < settings.head_tolerance) {
      result.converged = true;
      return result;
    }
  }
  return result;
}

}  // namespace aquiledger
