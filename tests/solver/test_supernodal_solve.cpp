#include <omp.h>

#include <Eigen/Dense>
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "solver/linear_solver.hpp"
#include "solver/supernodal_solve.hpp"

using namespace aquiledger;

namespace {

/// A factor by hand with the shape nested dissection gives: two independent blocks (columns
/// 0-9 and 10-19), each of two supernodes of five columns, and a separator of two columns
/// (20, 21) coupled to both. Each block's supernode holds the rest of its block and the
/// separator below it. L is lower triangular with a positive diagonal on that pattern, so it
/// is the Cholesky factor of L L' (the factor is unique: Golub and Van Loan, Matrix
/// Computations, 4th ed., theorem 4.2.7; from memory).
struct HandFactor {
  std::vector<int> first_column{0, 5, 10, 15, 20, 22};
  std::vector<int> row_start{0};
  std::vector<int> value_start{0};
  std::vector<int> rows;
  std::vector<double> values;
  std::vector<int> permutation;
  Eigen::MatrixXd l = Eigen::MatrixXd::Zero(22, 22);

  HandFactor() {
    for (int s = 0; s < 5; ++s) {
      const int k1 = first_column[s], k2 = first_column[s + 1];
      std::vector<int> r;
      const int block_end = s < 4 ? (s < 2 ? 10 : 20) : 22;
      for (int i = k1; i < block_end; ++i) r.push_back(i);
      if (s < 4) r.insert(r.end(), {20, 21});
      for (int j = k1; j < k2; ++j)
        for (int i : r) {
          if (i < j) {
            values.push_back(0.0);  // above the diagonal in the diagonal block: not read
            continue;
          }
          const double v = i == j ? 2.0 + 0.1 * j : 0.3 * std::sin(1.0 + i + 7.0 * j);
          l(i, j) = v;
          values.push_back(v);
        }
      rows.insert(rows.end(), r.begin(), r.end());
      row_start.push_back(static_cast<int>(rows.size()));
      value_start.push_back(static_cast<int>(values.size()));
    }
    for (int k = 0; k < 22; ++k) permutation.push_back((7 * k + 3) % 22);  // 7 is prime to 22
  }
  SupernodalFactor view() const {
    return {22,
            5,
            first_column.data(),
            row_start.data(),
            value_start.data(),
            rows.data(),
            values.data(),
            permutation.data()};
  }
  /// A with P A P' = L L', (P b)[k] = b[permutation[k]].
  Eigen::MatrixXd matrix() const {
    const Eigen::MatrixXd lower = l * l.transpose();
    Eigen::MatrixXd a(22, 22);
    for (int i = 0; i < 22; ++i)
      for (int j = 0; j < 22; ++j) a(permutation[i], permutation[j]) = lower(i, j);
    return a;
  }
};

}  // namespace

TEST_CASE("supernodal substitution solves L L' with subtrees on two threads",
          "[linear][supernodal]") {
  const HandFactor h;
  const Eigen::MatrixXd a = h.matrix();
  Eigen::VectorXd b(22);
  for (int i = 0; i < 22; ++i) b[i] = std::cos(0.5 * i) + 1.0;
  // The residual is the definition of a solution; a dense LU of A is the outside reference.
  const Eigen::VectorXd reference = a.partialPivLu().solve(b);
  for (int threads : {1, 2}) {
    INFO(threads << " threads");
    SupernodalSolve plan(h.view(), threads);
    if (threads == 2) {
      // Root separator (4 of 194 entries) on one thread, the two blocks (95 each) in parallel.
      CHECK(plan.groups() == 2);
      CHECK(plan.serial_share() == Approx(4.0 / 194.0));
    } else {
      CHECK(plan.serial_share() == 1.0);
    }
    Eigen::VectorXd x(22);
    for (int repeat = 0; repeat < 2; ++repeat) {  // the kept workspace starts clean again
      plan.solve(h.view(), b.data(), x.data());
      CHECK((a * x - b).norm() <= 1e-13 * b.norm());
      CHECK((x - reference).cwiseAbs().maxCoeff() <= 1e-12 * reference.cwiseAbs().maxCoeff());
    }
    Eigen::VectorXd y = b;
    plan.solve(h.view(), y.data(), y.data());  // in place
    CHECK((y - x).cwiseAbs().maxCoeff() == 0.0);
  }
}

TEST_CASE("kept Cholesky: our substitution and CHOLMOD's own solve agree at 1e5 unknowns",
          "[linear][supernodal]") {
  // A 5-point grid with storage: the confined system, large enough for a supernodal factor.
  // LinearSolver::solve takes our substitution, one-column solve_columns CHOLMOD's
  // cholmod_solve2: both against the residual and against each other.
  const int n = 320;
  std::vector<Eigen::Triplet<double>> t;
  for (int i = 0; i < n; ++i)
    for (int j = 0; j < n; ++j) {
      const int c = i * n + j;
      double diagonal = 1e-2 * (1.0 + 0.5 * std::sin(0.1 * c));
      // Symmetric conductances: the same value from both sides of a face.
      const int faces[4][2] = {{i - 1, j}, {i + 1, j}, {i, j - 1}, {i, j + 1}};
      for (const auto& [r, k] : faces) {
        if (r < 0 || r >= n || k < 0 || k >= n) continue;
        const int d = r * n + k;
        const double conductance =
            1.0 + 0.5 * std::cos(0.01 * (std::min(c, d) + 3.0 * std::max(c, d)));
        t.emplace_back(c, d, -conductance);
        diagonal += conductance;
      }
      t.emplace_back(c, c, diagonal);
    }
  SparseMatrix a(n * n, n * n);
  a.setFromTriplets(t.begin(), t.end());
  a.makeCompressed();
  Eigen::VectorXd b(a.rows());
  for (Eigen::Index i = 0; i < b.size(); ++i) b[i] = std::sin(0.001 * static_cast<double>(i)) + 0.5;
  const int threads_before = omp_get_max_threads();
  for (int threads : {1, 2}) {
    INFO(threads << " threads");
    omp_set_num_threads(threads);
    const auto solver = make_cholmod_solver();
    Eigen::VectorXd ours = Eigen::VectorXd::Zero(b.size());
    REQUIRE(solver->solve(a, b, ours));
    REQUIRE(solver->solve(a, b, ours));  // the kept plan and factor
    Eigen::MatrixXd theirs = Eigen::MatrixXd::Zero(b.size(), 1);
    REQUIRE(solver->solve_columns(a, Eigen::MatrixXd(b), theirs));
    CHECK(solver->factorizations() == 1);
    CHECK((a * ours - b).norm() <= 1e-12 * b.norm());
    CHECK((ours - theirs.col(0)).cwiseAbs().maxCoeff() <= 1e-10 * ours.cwiseAbs().maxCoeff());
  }
  omp_set_num_threads(threads_before);
}
