// The direct backends. This is the only file that includes SuiteSparse headers.
#include <Eigen/CholmodSupport>
#include <Eigen/UmfPackSupport>

#include "solver/linear_solver.hpp"

namespace aquiledger {

namespace {

/// Symbolic analysis on the first call, numeric factorisation only when values changed.
template <class Factorization>
class DirectSolver final : public LinearSolver {
 public:
  explicit DirectSolver(std::string name) : name_(std::move(name)) {}
  bool solve(const SparseMatrix& a, const Eigen::VectorXd& b, Eigen::VectorXd& x) override {
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

 private:
  std::string name_;
  Factorization factorization_;
  bool analysed_ = false;
};

}  // namespace

std::unique_ptr<LinearSolver> make_cholmod_solver() {
  return std::make_unique<DirectSolver<Eigen::CholmodSupernodalLLT<SparseMatrix, Eigen::Lower>>>(
      "cholmod");
}

std::unique_ptr<LinearSolver> make_umfpack_solver() {
  return std::make_unique<DirectSolver<Eigen::UmfPackLU<SparseMatrix>>>("umfpack");
}

}  // namespace aquiledger
