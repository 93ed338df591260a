#include "solver/newton_solver.hpp"

#include <omp.h>

#include <cmath>
#include <vector>

#include "solver/newton_iteration.hpp"
#include "solver/stress_kernels.hpp"

namespace aquiledger {

ResidualNorms residual_norms(const Eigen::VectorXd& r) {
  const auto n = static_cast<int>(r.size());
  std::vector<ResidualScan> scans(static_cast<std::size_t>(omp_get_max_threads()));
#pragma omp parallel
  {
    ResidualScan& local = scans[static_cast<std::size_t>(omp_get_thread_num())];
#pragma omp for schedule(static)
    for (int i = 0; i < n; ++i) local.add(r[i], i);
  }
  ResidualScan total;
  for (const ResidualScan& s : scans) total.merge(s);
  return total.norms();
}

namespace {

/// The serial problem: heads per grid cell, the FlowSystem's residual and matrix.
class SerialProblem {
 public:
  SerialProblem(FlowSystem& system, LinearSolver& linear, std::span<double> head,
                NewtonWorkspace& work, bool limit_at_inflection)
      : system_(system),
        linear_(linear),
        layout_(system.layout()),
        head_(head),
        work_(work),
        n_(system.n_unknowns()),
        limit_(limit_at_inflection && system.model().aquifer.condition != Condition::confined) {
    if (work.update.size() != n_) work.update.setZero(n_);
    work.base.resize(static_cast<std::size_t>(n_));
  }
  void assemble() { system_.assemble(head_); }
  ResidualNorms norms() const { return residual_norms(system_.residual()); }
  double throughflow() const { return system_.throughflow(); }
  double rounding_floor() const { return system_.rounding_floor(); }
  double residual_sum() const { return system_.residual_sum(); }
  /// Newton's forcing term for an iterative linear solver (ignored by direct ones). A confined
  /// system is linear: one tight solve beats a sequence of loose restarts, so it keeps
  /// iterative_tolerance.
  void set_linear_tolerance(double relative) {
    linear_.set_relative_tolerance(system_.symmetric() ? iterative_tolerance : relative);
  }
  int n_unknowns() const { return n_; }
  bool solve_linear(int& iterations) {
    if (!linear_.solve(system_.matrix(), system_.residual(), work_.update)) return false;
    iterations = linear_.last_iterations();
    return true;
  }
  void save_base() {
    std::vector<double>& base = work_.base;
#pragma omp parallel for schedule(static)
    for (int u = 0; u < n_; ++u) base[static_cast<std::size_t>(u)] = head_[cell(u)];
  }
  double apply(double step) {
    const Eigen::VectorXd& dh = work_.update;
    const std::vector<double>& base = work_.base;
    const CellArray<double>& bottom = system_.model().aquifer.bottom;
    double largest = 0.0;
#pragma omp parallel for schedule(static) reduction(max : largest)
    for (int u = 0; u < n_; ++u) {
      const std::size_t c = cell(u);
      const double h0 = base[static_cast<std::size_t>(u)];
      double h = h0 + step * dh[u];
      if (limit_)
        h = stopped_at_inflection(
            h0, h, withdrawal_inflection_head(bottom[c], layout_.reduction_length[c]));
      head_[c] = h;
      largest = std::max(largest, std::abs(h - h0));
    }
    return largest;
  }
  /// After an exact solve whose matrix is still the Jacobian at the current heads: the next
  /// update estimated cell by cell, max |R_i| / A_ii (L); infinity otherwise.
  double affine_update_estimate() const {
    if (!linear_.exact() || !linear_.factorized(system_.matrix())) return INFINITY;
    const Eigen::VectorXd& r = system_.residual();
    double largest = 0.0;
#pragma omp parallel for schedule(static) reduction(max : largest)
    for (int u = 0; u < n_; ++u) {
      const double diag = system_.diagonal(u);
      largest = std::max(largest, diag > 0.0 ? std::abs(r[u]) / diag : INFINITY);
    }
    return largest;
  }
  CellIndex cell_of(int worst) const {
    return layout_.cell_of_unknown[static_cast<std::size_t>(worst)];
  }

 private:
  std::size_t cell(int u) const {
    return static_cast<std::size_t>(layout_.cell_of_unknown[static_cast<std::size_t>(u)].value);
  }
  FlowSystem& system_;
  LinearSolver& linear_;
  const SystemLayout& layout_;
  std::span<double> head_;
  NewtonWorkspace& work_;
  int n_;
  bool limit_;  ///< stopped_at_inflection on (water-table and switching cells)
};

}  // namespace

NewtonResult solve_newton(FlowSystem& system, LinearSolver& linear, const NewtonSettings& settings,
                          std::span<double> head, NewtonWorkspace& work) {
  SerialProblem problem(system, linear, head, work, settings.limit_at_withdrawal_inflection);
  return newton_iterate(problem, settings);
}

}  // namespace aquiledger
