// The direct backends. This is the only file that includes SuiteSparse headers.
#include <dlfcn.h>

#include <Eigen/CholmodSupport>
#include <Eigen/UmfPackSupport>

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

}  // namespace

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
