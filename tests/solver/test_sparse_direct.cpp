#include <omp.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "solver/linear_solver.hpp"

using namespace aquiledger;

namespace {

/// An n x n grid whose cells outside an ellipse and inside a round lake have no unknown
/// (`holes`), or all cells; unknowns in raster order.
StructuredUnknowns grid_unknowns(int n, bool holes) {
  StructuredUnknowns g{n, n, std::vector<std::int32_t>(static_cast<std::size_t>(n) * n, -1)};
  int next = 0;
  for (int r = 0; r < n; ++r)
    for (int c = 0; c < n; ++c) {
      const double x = (c + 0.5) / n, y = (r + 0.5) / n;
      const bool in =
          !holes || (std::pow((x - 0.5) / 0.48, 2) + std::pow((y - 0.5) / 0.45, 2) <= 1.0 &&
                     std::hypot(x - 0.6, y - 0.4) >= 0.12);
      if (in) g.unknown_of_cell[static_cast<std::size_t>(r) * n + c] = next++;
    }
  return g;
}

/// The confined system's 5-point matrix over the grid's unknowns: conductances varying from
/// face to face, storage 1e-3 on the diagonal.
SparseMatrix grid_system(const StructuredUnknowns& g) {
  std::vector<Eigen::Triplet<double>> t;
  int n_unknowns = 0;
  for (int r = 0; r < g.n_rows; ++r)
    for (int c = 0; c < g.n_cols; ++c) {
      const int u = g.unknown_of_cell[static_cast<std::size_t>(r) * g.n_cols + c];
      if (u < 0) continue;
      ++n_unknowns;
      double diagonal = 1e-3;
      const int nb[4][2] = {{r - 1, c}, {r + 1, c}, {r, c - 1}, {r, c + 1}};
      for (const auto& [rr, cc] : nb) {
        if (rr < 0 || rr >= g.n_rows || cc < 0 || cc >= g.n_cols) continue;
        const int v = g.unknown_of_cell[static_cast<std::size_t>(rr) * g.n_cols + cc];
        if (v < 0) continue;
        const double k = 1.0 + 0.5 * std::sin(0.37 * (std::min(u, v) + 2.0 * std::max(u, v)));
        t.emplace_back(u, v, -k);
        diagonal += k;
      }
      t.emplace_back(u, u, diagonal);
    }
  SparseMatrix a(n_unknowns, n_unknowns);
  a.setFromTriplets(t.begin(), t.end());
  a.makeCompressed();
  return a;
}

}  // namespace

TEST_CASE("the grid's nested dissection fills less than METIS and AMD", "[solver]") {
  // Reference: CHOLMOD's own analysis (SuiteSparse) of the same matrix under METIS
  // nested dissection and approximate minimum degree; nnz(L) and flops are its counts.
  for (const bool holes : {false, true})
    for (const int n : {40, 150}) {
      INFO(n << " x " << n << (holes ? " with holes" : ""));
      const StructuredUnknowns g = grid_unknowns(n, holes);
      const SparseMatrix a = grid_system(g);
      const std::vector<int> order = grid_elimination_order(g);
      REQUIRE(order.size() == static_cast<std::size_t>(a.rows()));
      const CholeskyAnalysis grid = analyse_cholesky(a, CholmodOrdering::metis, order, true);
      const CholeskyAnalysis metis = analyse_cholesky(a, CholmodOrdering::metis, {}, false);
      const CholeskyAnalysis amd = analyse_cholesky(a, CholmodOrdering::amd, {}, false);
      REQUIRE(grid.ok);
      REQUIRE(metis.ok);
      REQUIRE(amd.ok);
      CHECK(grid.nonzeros <= metis.nonzeros);
      CHECK(grid.flops <= metis.flops);
      CHECK(grid.nonzeros <= amd.nonzeros);
      CHECK(grid.flops <= amd.flops);
      CHECK(grid.residual <= 1e-12);
    }
}

TEST_CASE("Cholesky in the grid's order solves as in CHOLMOD's own", "[solver]") {
  // Simplicial (3,000 unknowns) and supernodal (over 1e5) factors, the latter solved by our
  // substitution on 1 and 2 threads; references: the residual, and the solution with
  // CHOLMOD's automatic ordering.
  const int threads_before = omp_get_max_threads();
  for (const int n : {70, 330}) {
    const StructuredUnknowns g = grid_unknowns(n, true);
    const SparseMatrix a = grid_system(g);
    Eigen::VectorXd b(a.rows());
    for (Eigen::Index i = 0; i < b.size(); ++i) b[i] = std::cos(0.01 * static_cast<double>(i));
    const auto own = make_cholmod_solver();
    Eigen::VectorXd reference = Eigen::VectorXd::Zero(b.size());
    REQUIRE(own->solve(a, b, reference));
    for (const int threads : {1, 2}) {
      INFO(n << " x " << n << ", " << threads << " threads");
      omp_set_num_threads(threads);
      const auto solver = make_cholmod_solver(g);
      CHECK(solver->name() == "cholmod");
      Eigen::VectorXd x = Eigen::VectorXd::Zero(b.size());
      REQUIRE(solver->solve(a, b, x));
      REQUIRE(solver->solve(a, b, x));  // the kept factor
      CHECK(solver->factorizations() == 1);
      CHECK((a * x - b).norm() <= 1e-12 * b.norm());
      CHECK((x - reference).cwiseAbs().maxCoeff() <= 1e-10 * reference.cwiseAbs().maxCoeff());
    }
  }
  omp_set_num_threads(threads_before);
}

TEST_CASE("a grid whose unknowns are not numbered once each falls back to CHOLMOD's ordering",
          "[solver]") {
  StructuredUnknowns g = grid_unknowns(12, false);
  const SparseMatrix a = grid_system(g);
  g.unknown_of_cell[5] = 7;  // unknown 7 twice, unknown 5 never
  CHECK(grid_elimination_order(g).empty());
  const auto solver = make_cholmod_solver(g);
  const Eigen::VectorXd b = Eigen::VectorXd::Ones(a.rows());
  Eigen::VectorXd x = Eigen::VectorXd::Zero(a.rows());
  REQUIRE(solver->solve(a, b, x));
  CHECK((a * x - b).norm() <= 1e-12 * b.norm());
  CHECK(grid_elimination_order(StructuredUnknowns{3, 4, std::vector<std::int32_t>(11, 0)}).empty());
}
