// CHOLMOD's two kinds of Cholesky factor on the 5-point matrix of an n x n grid with storage:
// supernodal (dense blocks through BLAS, an OpenMP region per supernode) against simplicial
// (column by column). Prints the median time of a numeric factorisation plus one solve for
// each kind and size; solver/sparse_direct.cpp picks the kind by size from these figures.
//   cholesky_kinds [--sizes 2500,1e4,1e5,...] [--repeats R]
#include <CLI/CLI.hpp>
#include <Eigen/CholmodSupport>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "benchmarks/bench_support.hpp"
#include "benchmarks/grid_matrix.hpp"

namespace {

using Matrix = Eigen::SparseMatrix<double>;

/// Median seconds of factorise-and-solve, the values changed a little each time as a time
/// step's would be.
template <class Factor>
double factorise_and_solve(Matrix a, int repeats) {
  Factor f;
  f.analyzePattern(a);
  const Eigen::VectorXd b = Eigen::VectorXd::Ones(a.rows());
  std::vector<double> seconds;
  for (int r = 0; r < repeats; ++r) {
    a.coeffs() *= 1.0001;
    const auto t0 = aquiledger::bench::Clock::now();
    f.factorize(a);
    const Eigen::VectorXd x = f.solve(b);
    seconds.push_back(aquiledger::bench::seconds_since(t0));
    if (!x.allFinite()) std::fprintf(stderr, "a solve failed\n");
  }
  return aquiledger::bench::median(seconds);
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"CHOLMOD supernodal against simplicial Cholesky on 5-point grid matrices"};
  std::vector<double> sizes{2500, 5041, 1e4, 2.25e4, 4.84e4, 1e5, 2e5, 4.9e5};
  int repeats = 7;
  app.add_option("--sizes", sizes, "cells of each square grid")->delimiter(',');
  app.add_option("--repeats", repeats, "factorisations per kind and size (median)");
  CLI11_PARSE(app, argc, argv);
  std::printf("%10s %16s %16s %8s\n", "cells", "supernodal_ms", "simplicial_ms", "ratio");
  for (const double cells : sizes) {
    const int n = static_cast<int>(std::lround(std::sqrt(cells)));
    const Matrix a = aquiledger::bench::storage_grid_matrix(n, 1e-2);
    const double super =
        factorise_and_solve<Eigen::CholmodSupernodalLLT<Matrix, Eigen::Lower>>(a, repeats);
    const double simple =
        factorise_and_solve<Eigen::CholmodSimplicialLLT<Matrix, Eigen::Lower>>(a, repeats);
    std::printf("%10d %16.2f %16.2f %8.2f\n", n * n, 1e3 * super, 1e3 * simple, simple / super);
    std::fflush(stdout);
  }
}
