#include "solver/linear_solver.hpp"

#include <Eigen/IterativeLinearSolvers>
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <stdexcept>

namespace aquiledger {

bool LinearSolver::values_changed(const SparseMatrix& a) {
  const Eigen::Map<const Eigen::VectorXd> v(a.valuePtr(), a.nonZeros());
  if (last_values_.size() == v.size() && std::equal(v.begin(), v.end(), last_values_.begin()))
    return false;
  last_values_ = v;
  return true;
}

bool LinearSolver::factorized(const SparseMatrix& a) const {
  return last_values_.size() == a.nonZeros() &&
         std::equal(a.valuePtr(), a.valuePtr() + a.nonZeros(), last_values_.begin());
}

bool LinearSolver::solve_columns(const SparseMatrix& a, const Eigen::MatrixXd& b,
                                 Eigen::MatrixXd& x) {
  Eigen::VectorXd bj, xj;
  for (Eigen::Index j = 0; j < b.cols(); ++j) {
    bj = b.col(j);
    xj = x.col(j);
    if (!solve(a, bj, xj)) return false;
    x.col(j) = xj;
  }
  return true;
}

namespace {

/// Eigen's iterative solvers, started from the previous solution. The preconditioner is
/// rebuilt only when the matrix values changed.
template <class Iterative>
class IterativeSolver final : public LinearSolver {
 public:
  explicit IterativeSolver(std::string name) : name_(std::move(name)) {
    solver_.setTolerance(iterative_tolerance);
  }
  bool solve(const SparseMatrix& a, const Eigen::VectorXd& b, Eigen::VectorXd& x) override {
    const bool changed = values_changed(a);
    if (!analysed_) {
      solver_.setMaxIterations(std::max<Eigen::Index>(1000, 4 * a.rows()));
      // Analysis and factorisation together: Eigen 3.4's IncompleteLUT leaves its status
      // unset after analyzePattern alone, and the solver then reads it (an invalid enum
      // load, reported by the sanitizer build).
      solver_.compute(a);
      analysed_ = true;
    } else if (changed) {
      solver_.factorize(a);
    }
    count_factorization(!changed);
    if (x.size() != b.size() || !x.allFinite()) x.setZero(b.size());
    x = solver_.solveWithGuess(b, x);
    count_iterations(static_cast<int>(solver_.iterations()));
    return solver_.info() == Eigen::Success && x.allFinite();
  }
  std::string name() const override { return name_; }
  void set_relative_tolerance(double t) override { solver_.setTolerance(t); }

 private:
  std::string name_;
  Iterative solver_;
  bool analysed_ = false;
};

using Pcg = Eigen::ConjugateGradient<
    SparseMatrix, Eigen::Lower | Eigen::Upper,
    Eigen::IncompleteCholesky<double, Eigen::Lower, Eigen::NaturalOrdering<int>>>;
using Bicgstab = Eigen::BiCGSTAB<SparseMatrix, Eigen::IncompleteLUT<double, int>>;

}  // namespace

std::unique_ptr<LinearSolver> make_pcg_solver() {
  return std::make_unique<IterativeSolver<Pcg>>("pcg");
}
std::unique_ptr<LinearSolver> make_bicgstab_solver() {
  return std::make_unique<IterativeSolver<Bicgstab>>("bicgstab");
}

/// Average reduction of the relative residual per Krylov iteration above which the next solve
/// first rebuilds the multigrid preconditioner. Measured on the 1e6-cell switching basin
/// (benchmarks/multigrid_candidates, docs/performance.md): a fresh PFMG reduces by about 0.03
/// per BiCGSTAB iteration; one set-up costs about as much as two iterations, so rebuilding
/// pays once a kept one needs about twice the iterations (0.03^(1/2) ~ 0.17; we take 0.1, a
/// choice of ours).
constexpr double rebuild_above_rate = 0.1;
/// Reduction of the relative residual per Krylov iteration with a fresh PFMG (same
/// measurement: about 0.03 per BiCGSTAB iteration at 1e6 switching cells).
constexpr double fresh_rate = 0.03;

int multigrid_kept_iteration_limit(double tolerance) {
  const double fresh =
      std::ceil(std::log(std::clamp(tolerance, 1e-300, 0.5)) / std::log(fresh_rate));
  return 2 * std::max(1, static_cast<int>(fresh));
}

bool multigrid_rebuild_pays(int iterations, double reached) {
  // Rate per iteration; none when the start already met the tolerance.
  return iterations > 0 &&
         std::pow(std::max(reached, 1e-300), 1.0 / iterations) > rebuild_above_rate;
}

#ifndef AQUILEDGER_HAVE_MULTIGRID
std::unique_ptr<LinearSolver> make_multigrid_solver(const StructuredUnknowns&, bool) {
  throw std::runtime_error(
      "linear = \"multigrid\": this program was built without the multigrid backend "
      "(-DAQUILEDGER_WITH_HYPRE=ON)");
}
std::unique_ptr<BandMultigrid> make_band_multigrid(int, int, int, int) {
  throw std::runtime_error(
      "the distributed engine's multigrid: this program was built without the multigrid "
      "backend (-DAQUILEDGER_WITH_HYPRE=ON)");
}
#endif

namespace {

/// Below this many unknowns the grid's nested dissection is not used: the factor is then
/// simplicial (sparse_direct.cpp), and with the grid's ordering it was measured slower than
/// with CHOLMOD's own (a 4,000-cell numerical pumping-test fit, tests/postproc "noise-free Theis
/// drawdowns fitted by the numerical model": 9.8 s against 3.5 s; the cause is not known). The
/// grid's ordering was measured to pay from 1e5 unknowns (docs/performance.md, "Ninth pass").
constexpr int grid_ordering_from = 100'000;

/// Cholesky, with the grid's nested dissection as its ordering when the grid is known and the
/// system has at least grid_ordering_from unknowns.
std::unique_ptr<LinearSolver> cholesky_on_grid(const StructuredUnknowns* grid, int n) {
  return grid != nullptr && n >= grid_ordering_from ? make_cholmod_solver(*grid)
                                                    : make_cholmod_solver();
}

std::string gib(double bytes) {
  char text[32];
  std::snprintf(text, sizeof text, "%.1f GiB", bytes / (1024.0 * 1024.0 * 1024.0));
  return text;
}

}  // namespace

LinearSolverChoice choose_linear_solver(LinearChoice choice, bool symmetric, int n,
                                        double memory_bytes, const StructuredUnknowns* grid) {
  const std::string size = std::to_string(n) + " unknowns";
  const bool multigrid = multigrid_available() && grid != nullptr;
  switch (choice) {
    case LinearChoice::multigrid:
      if (grid == nullptr)
        throw std::invalid_argument("multigrid solver requested without the grid of the unknowns");
      return {make_multigrid_solver(*grid, symmetric), "multigrid requested"};
    case LinearChoice::direct:
      if (symmetric)
        return {cholesky_on_grid(grid, n), "direct requested; symmetric system: Cholesky"};
      return {make_umfpack_solver(), "direct requested; non-symmetric system: LU"};
    case LinearChoice::pcg:
      if (symmetric) return {make_pcg_solver(), "pcg requested"};
      return {make_bicgstab_solver(),
              "pcg requested but the system is not symmetric (head-dependent face thickness): "
              "bicgstab"};
    case LinearChoice::bicgstab:
      return {make_bicgstab_solver(), "bicgstab requested"};
    case LinearChoice::automatic:
      break;
  }
  if (symmetric) {
    const double needed = cholmod_bytes_per_unknown * n;
    if (!(memory_bytes > 0.0)) {
      if (n <= cholmod_auto_limit)
        return {cholesky_on_grid(grid, n), "auto: symmetric (confined), " + size + ": Cholesky"};
      if (multigrid)
        return {make_multigrid_solver(*grid, true),
                "auto: symmetric (confined), " + size + " (over the direct limit): multigrid"};
      return {make_pcg_solver(),
              "auto: symmetric (confined), " + size + " (over the direct limit): pcg"};
    }
    const std::string fit = "needs about " + gib(needed) + " of " + gib(memory_bytes);
    if (needed <= 0.75 * memory_bytes)
      return {cholesky_on_grid(grid, n),
              "auto: symmetric (confined), " + size + ": Cholesky (" + fit + ")"};
    if (multigrid)
      return {
          make_multigrid_solver(*grid, true),
          "auto: symmetric (confined), " + size + ": multigrid (a Cholesky factor " + fit + ")"};
    return {make_pcg_solver(),
            "auto: symmetric (confined), " + size + ": pcg (a Cholesky factor " + fit + ")"};
  }
  if (multigrid && n >= multigrid_auto_from)
    return {make_multigrid_solver(*grid, false),
            "auto: non-symmetric (head-dependent face thickness), " + size + ": multigrid"};
  if (n <= umfpack_auto_limit)
    return {make_umfpack_solver(),
            "auto: non-symmetric (head-dependent face thickness), " + size + ": LU"};
  return {make_picard_krylov_solver(), "auto: non-symmetric (head-dependent face thickness), " +
                                           size +
                                           " (over the direct limit): bicgstab with a Cholesky "
                                           "factor of the fixed-thickness matrix"};
}

}  // namespace aquiledger
