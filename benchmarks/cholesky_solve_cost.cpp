// The triangular solves of a kept supernodal Cholesky factor: our substitution
// (solver/supernodal_solve.hpp, LinearSolver::solve) against CHOLMOD's own (cholmod_solve2,
// which the one-column LinearSolver::solve_columns still calls), alternating, on the 5-point
// matrix of an n x n grid with storage, the confined system. Prints the median wall and
// process CPU time of a solve pair and how far the two solutions are apart.
//   cholesky_solve_cost [--cells 1e6] [--repeats 15]      (threads: OMP_NUM_THREADS)
#include <omp.h>

#include <CLI/CLI.hpp>
#include <cmath>
#include <cstdio>
#include <ctime>
#include <vector>

#include "benchmarks/bench_support.hpp"
#include "benchmarks/grid_matrix.hpp"
#include "solver/linear_solver.hpp"

using namespace aquiledger;

namespace {

double process_cpu_seconds() {
  timespec t{};
  clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t);
  return static_cast<double>(t.tv_sec) + 1e-9 * static_cast<double>(t.tv_nsec);
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"Supernodal triangular solves: our substitution against CHOLMOD's"};
  double cells = 1e6;
  int repeats = 15;
  app.add_option("--cells", cells, "cells of the square grid");
  app.add_option("--repeats", repeats, "solves of each kind (median)");
  CLI11_PARSE(app, argc, argv);
  const int n = static_cast<int>(std::lround(std::sqrt(cells)));
  const SparseMatrix a = bench::storage_grid_matrix(n, 1e-2);
  Eigen::VectorXd b(a.rows());
  for (Eigen::Index i = 0; i < b.size(); ++i) b[i] = std::sin(0.001 * static_cast<double>(i));
  const std::unique_ptr<LinearSolver> solver = make_cholmod_solver();
  Eigen::VectorXd ours = Eigen::VectorXd::Zero(b.size());
  const auto t0 = bench::Clock::now();
  if (!solver->solve(a, b, ours)) return 1;  // analysis, factorisation and a first solve
  std::printf("%d unknowns, %d threads: analysis, factorisation and first solve %.2f s\n",
              static_cast<int>(a.rows()), omp_get_max_threads(), bench::seconds_since(t0));
  Eigen::MatrixXd cholmod = Eigen::MatrixXd::Zero(b.size(), 1);
  const Eigen::MatrixXd b_column = b;
  std::vector<double> wall[2], cpu[2];
  for (int r = 0; r < repeats; ++r)
    for (int kind = 0; kind < 2; ++kind) {
      const auto w0 = bench::Clock::now();
      const double c0 = process_cpu_seconds();
      const bool ok =
          kind == 0 ? solver->solve(a, b, ours) : solver->solve_columns(a, b_column, cholmod);
      cpu[kind].push_back(process_cpu_seconds() - c0);
      wall[kind].push_back(bench::seconds_since(w0));
      if (!ok) return 1;
    }
  const double difference = (ours - cholmod.col(0)).cwiseAbs().maxCoeff();
  std::printf("%-28s %10s %10s %14s\n", "solve pair", "wall s", "CPU s", "|Ax-b|/|b|");
  std::printf("%-28s %10.4f %10.4f %14.3e\n", "ours (supernodal_solve)", bench::median(wall[0]),
              bench::median(cpu[0]), (a * ours - b).norm() / b.norm());
  std::printf("%-28s %10.4f %10.4f %14.3e\n", "CHOLMOD (cholmod_solve2)", bench::median(wall[1]),
              bench::median(cpu[1]), (a * cholmod.col(0) - b).norm() / b.norm());
  std::printf("largest difference of the solutions: %.3e (largest |x| %.3e)\n", difference,
              ours.cwiseAbs().maxCoeff());
}
