// The direct backends. This is the only file that includes SuiteSparse headers.
#include <dlfcn.h>

#include <Eigen/CholmodSupport>
#include <Eigen/IterativeLinearSolvers>
#include <Eigen/UmfPackSupport>
#include <vector>

#include "solver/linear_solver.hpp"

namespace aquiledger {

namespace {

/// OpenBLAS runs its own thread pool beside OpenMP's; on 2 cores the pools spin and yield
/// against each other (perf showed most of a step in sched_yield and the OpenMP spin-wait),
/// and the fronts of a 2D grid are too small for threaded BLAS to pay. BLAS therefore runs
/// single-threaded in factorisations and solves (docs/performance.md: 2x faster LU steps at
/// 1e5 cells). Looked up at run time: the reference BLAS has no such call.
void set_blas_threads(int n) {
  using SetThreads = void (*)(int);
  static const auto set = reinterpret_cast<SetThreads>(dlsym(RTLD_DEFAULT, "openblas_set_num_threads"));
  if (set) set(n);
}

template <class Factorization>
void configure(Factorization&, CholmodOrdering) {}

template <>
void configure(Eigen::CholmodSupernodalLLT<SparseMatrix, Eigen::Lower>& f, CholmodOrdering ordering) {
  cholmod_common& c = f.cholmod();
  if (ordering == CholmodOrdering::automatic) return;
  c.nmethods = 1;
  c.method[0].ordering = ordering == CholmodOrdering::metis ? CHOLMOD_METIS : CHOLMOD_AMD;
  c.postorder = 1;
}

/// Symbolic analysis on the first call, numeric factorisation only when values changed.
template <class Factorization>
class DirectSolver final : public LinearSolver {
 public:
  DirectSolver(std::string name, CholmodOrdering ordering) : name_(std::move(name)) {
    configure(factorization_, ordering);
  }
  bool solve(const SparseMatrix& a, const Eigen::VectorXd& b, Eigen::VectorXd& x) override {
    set_blas_threads(1);
    if (!analysed_) {
      factorization_.analyzePattern(a);
      analysed_ = true;
    }
    const bool changed = values_changed(a);
    if (changed) factorization_.factorize(a);
    count_factorization(!changed);
    if (factorization_.info() != Eigen::Success) return false;
    x = factorization_.solve(b);
    count_iterations(0);
    return factorization_.info() == Eigen::Success && x.allFinite();
  }
  std::string name() const override { return name_; }
  bool exact() const override { return true; }

 private:
  std::string name_;
  Factorization factorization_;
  bool analysed_ = false;
};

/// Preconditioner for Eigen's BiCGSTAB: solves with a Cholesky factor held elsewhere
/// (compute() does nothing: the owner decides when to refactorise).
class HeldCholesky {
 public:
  using Factor = Eigen::CholmodSupernodalLLT<SparseMatrix, Eigen::Lower>;
  HeldCholesky() = default;
  void hold(const Factor* f) { factor_ = f; }
  template <class M> HeldCholesky& analyzePattern(const M&) { return *this; }
  template <class M> HeldCholesky& factorize(const M&) { return *this; }
  template <class M> HeldCholesky& compute(const M&) { return *this; }
  template <class V> Eigen::VectorXd solve(const V& b) const { return factor_->solve(Eigen::VectorXd(b)); }
  Eigen::ComputationInfo info() const { return factor_ ? factor_->info() : Eigen::Success; }

 private:
  const Factor* factor_ = nullptr;
};

/// BiCGSTAB on the non-symmetric Jacobian of upstream-weighted (water-table, switching)
/// models, preconditioned by a Cholesky factorisation of its symmetric part (J + J^T) / 2.
/// With mass-conserving upstream weighting J is a column-diagonally-dominant M-matrix whose
/// skew part is the thickness derivative, of relative size |dh across a face| / (saturated
/// thickness); the symmetric part is then a symmetric M-matrix (positive definite once storage
/// or a fixed head is present) and close to J, so few iterations are needed (preconditioning
/// by the symmetric part: Concus and Golub, 1976; Widlund, 1978). The factorisation is kept
/// across Newton iterations and steps while the iterations stay few, and redone when they
/// grow: one numeric factorisation serves many solves.
class SymmetricPartKrylov final : public LinearSolver {
 public:
  SymmetricPartKrylov() { krylov_.setTolerance(iterative_tolerance); }
  bool solve(const SparseMatrix& a, const Eigen::VectorXd& b, Eigen::VectorXd& x) override {
    set_blas_threads(1);
    if (!analysed_) {
      mirror_ = transpose_positions(a);
      symmetric_ = a;
      factor_.analyzePattern(symmetric_);
      krylov_.setMaxIterations(max_iterations);
      analysed_ = true;
      refactor_ = true;
    }
    if (x.size() != b.size() || !x.allFinite()) x.setZero(b.size());
    // The previous solution starts the iteration only where it is closer than zero.
    if ((b - a * x).squaredNorm() >= b.squaredNorm()) x.setZero();
    for (int attempt = 0; attempt < 2; ++attempt) {
      if (refactor_ || attempt > 0) {
        if (!refactorize(a)) return false;
      } else {
        count_factorization(true);
      }
      krylov_.compute(a);
      krylov_.preconditioner().hold(&factor_);
      Eigen::VectorXd y = krylov_.solveWithGuess(b, x);
      const int used = static_cast<int>(krylov_.iterations());
      if (krylov_.info() == Eigen::Success && y.allFinite()) {
        x = std::move(y);
        count_iterations(used);
        refactor_ = used > refactor_after;
        return true;
      }
      count_iterations(used);
    }
    return false;
  }
  std::string name() const override { return "bicgstab (Cholesky of the symmetric part)"; }

 private:
  /// Iterations beyond which the factorisation is renewed before the next solve; a solve
  /// with the factor reused costs about one triangular solve pair per half iteration, a new
  /// numeric factorisation about as much as 15 to 20 of them at 1e6 cells (measured,
  /// docs/performance.md).
  static constexpr int refactor_after = 12;
  static constexpr int max_iterations = 400;

  /// For every stored entry (r, c) the position of (c, r); the 5-point pattern is symmetric.
  static std::vector<int> transpose_positions(const SparseMatrix& a) {
    std::vector<int> mirror(static_cast<std::size_t>(a.nonZeros()), -1);
    for (int c = 0; c < a.outerSize(); ++c)
      for (int p = a.outerIndexPtr()[c]; p < a.outerIndexPtr()[c + 1]; ++p) {
        const int r = a.innerIndexPtr()[p];
        for (int q = a.outerIndexPtr()[r]; q < a.outerIndexPtr()[r + 1]; ++q)
          if (a.innerIndexPtr()[q] == c) mirror[static_cast<std::size_t>(p)] = q;
      }
    return mirror;
  }

  bool refactorize(const SparseMatrix& a) {
    const double* v = a.valuePtr();
    double* s = symmetric_.valuePtr();
    const auto nnz = static_cast<std::ptrdiff_t>(a.nonZeros());
#pragma omp parallel for schedule(static)
    for (std::ptrdiff_t p = 0; p < nnz; ++p) {
      const int q = mirror_[static_cast<std::size_t>(p)];
      s[p] = q >= 0 ? 0.5 * (v[p] + v[q]) : v[p];
    }
    factor_.factorize(symmetric_);
    count_factorization(false);
    refactor_ = false;
    return factor_.info() == Eigen::Success;
  }

  HeldCholesky::Factor factor_;
  Eigen::BiCGSTAB<SparseMatrix, HeldCholesky> krylov_;
  SparseMatrix symmetric_;
  std::vector<int> mirror_;
  bool analysed_ = false;
  bool refactor_ = true;
};

}  // namespace

std::unique_ptr<LinearSolver> make_symmetric_part_krylov_solver() {
  return std::make_unique<SymmetricPartKrylov>();
}

std::unique_ptr<LinearSolver> make_cholmod_solver() {
  return make_cholmod_solver(CholmodOrdering::automatic);
}

std::unique_ptr<LinearSolver> make_cholmod_solver(CholmodOrdering ordering) {
  const char* name = ordering == CholmodOrdering::metis ? "cholmod (METIS)"
                     : ordering == CholmodOrdering::amd ? "cholmod (AMD)"
                                                        : "cholmod";
  return std::make_unique<DirectSolver<Eigen::CholmodSupernodalLLT<SparseMatrix, Eigen::Lower>>>(
      name, ordering);
}

std::unique_ptr<LinearSolver> make_umfpack_solver() {
  return std::make_unique<DirectSolver<Eigen::UmfPackLU<SparseMatrix>>>("umfpack",
                                                                        CholmodOrdering::automatic);
}

}  // namespace aquiledger
