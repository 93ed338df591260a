// The direct backends. This is the only file that includes SuiteSparse headers.
#include <dlfcn.h>
#ifdef _OPENMP
#include <omp.h>
#endif

#include <Eigen/CholmodSupport>
#include <Eigen/UmfPackSupport>

#include "solver/linear_solver.hpp"

namespace aquiledger {

namespace {

/// OpenBLAS runs its own thread pool beside OpenMP's; on few cores the two pools spin against
/// each other. A single right-hand side's triangular solves are memory bound, so BLAS runs
/// single-threaded inside them (measured in docs/performance.md); factorisations get the
/// OpenMP thread count. Looked up at run time: the reference BLAS has no such call.
void set_blas_threads(int n) {
  using SetThreads = void (*)(int);
  static const auto set = reinterpret_cast<SetThreads>(dlsym(RTLD_DEFAULT, "openblas_set_num_threads"));
  if (set) set(n);
}

int openmp_threads() {
#ifdef _OPENMP
  return omp_get_max_threads();
#else
  return 1;
#endif
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
    const int threads = openmp_threads();
    set_blas_threads(threads);
    if (!analysed_) {
      factorization_.analyzePattern(a);
      analysed_ = true;
    }
    const bool changed = values_changed(a);
    if (changed) factorization_.factorize(a);
    count_factorization(!changed);
    if (factorization_.info() != Eigen::Success) return false;
    set_blas_threads(1);
    x = factorization_.solve(b);
    count_iterations(0);
    return factorization_.info() == Eigen::Success && x.allFinite();
  }
  std::string name() const override { return name_; }

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
