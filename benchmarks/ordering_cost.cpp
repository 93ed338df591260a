// The fill-reducing ordering of the confined system's Cholesky factor: CHOLMOD's METIS and
// AMD orderings (as solver/sparse_direct.cpp sets them up) against the grid's own nested
// dissection (mesh/nested_dissection.hpp, handed to CHOLMOD as a given permutation), on the
// 5-point matrix of an n x n grid with storage, whole or with holes (an elliptic outline and
// five round lakes, the cells outside them without an unknown). Per size and ordering: the
// seconds of the grid's ordering and of the whole analysis, nnz(L) and the flops of the
// factorisation as CHOLMOD's analysis counts them, the supernodal factor's stored values, one
// numeric factorisation's seconds and the relative residual of a solve.
//   ordering_cost [--sizes 1e5,1e6,4e6] [--holes] [--factorize 0|1] [--amd] [--grid-only]
//   (threads of the factorisation: OMP_NUM_THREADS)
#include <omp.h>

#include <CLI/CLI.hpp>
#include <cmath>
#include <cstdio>
#include <vector>

#include "benchmarks/bench_support.hpp"
#include "solver/linear_solver.hpp"

using namespace aquiledger;

namespace {

/// Cells with an unknown: all, or those inside an ellipse reaching 96 % and 90 % of the grid's
/// width and height and outside five lakes of radius 0.06 n (invented shapes).
std::vector<std::uint8_t> basin_mask(int n, bool holes) {
  std::vector<std::uint8_t> in(static_cast<std::size_t>(n) * n, 1);
  if (!holes) return in;
  const double lakes[5][2] = {{0.3, 0.3}, {0.7, 0.35}, {0.5, 0.55}, {0.25, 0.7}, {0.72, 0.75}};
  for (int r = 0; r < n; ++r)
    for (int c = 0; c < n; ++c) {
      const double x = (c + 0.5) / n, y = (r + 0.5) / n;
      bool inside = std::pow((x - 0.5) / 0.48, 2) + std::pow((y - 0.5) / 0.45, 2) <= 1.0;
      for (const auto& l : lakes)
        if (std::hypot(x - l[0], y - l[1]) < 0.06) inside = false;
      in[static_cast<std::size_t>(r) * n + c] = inside ? 1 : 0;
    }
  return in;
}

/// The 5-point matrix over the included cells (unknowns in raster order): unit conductances,
/// storage 1e-2 on the diagonal.
SparseMatrix masked_grid_matrix(int n, const StructuredUnknowns& grid) {
  const auto unknown = [&](int r, int c) {
    return grid.unknown_of_cell[static_cast<std::size_t>(r) * n + c];
  };
  std::vector<Eigen::Triplet<double>> entries;
  int m = 0;
  for (int r = 0; r < n; ++r)
    for (int c = 0; c < n; ++c) {
      const int u = unknown(r, c);
      if (u < 0) continue;
      ++m;
      double diagonal = 1e-2;
      const int nb[4][2] = {{r - 1, c}, {r + 1, c}, {r, c - 1}, {r, c + 1}};
      for (const auto& [rr, cc] : nb) {
        if (rr < 0 || rr >= n || cc < 0 || cc >= n || unknown(rr, cc) < 0) continue;
        diagonal += 1.0;
        entries.emplace_back(u, unknown(rr, cc), -1.0);
      }
      entries.emplace_back(u, u, diagonal);
    }
  SparseMatrix a(m, m);
  a.setFromTriplets(entries.begin(), entries.end());
  a.makeCompressed();
  return a;
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{
      "Ordering of the confined Cholesky factor: METIS against the grid's nested dissection"};
  std::vector<double> sizes{1e5, 1e6, 4e6};
  bool holes = false, amd = false, grid_only = false;
  int factorize = 1;
  app.add_option("--sizes", sizes, "cells of each square grid")->delimiter(',');
  app.add_flag("--holes", holes, "an elliptic outline and five lakes without unknowns");
  app.add_flag("--amd", amd, "also CHOLMOD's AMD ordering");
  app.add_flag("--grid-only", grid_only, "only the grid's nested dissection");
  app.add_option("--factorize", factorize, "1: also factorise and solve once per ordering");
  CLI11_PARSE(app, argc, argv);
  std::printf("%d OpenMP threads%s\n", omp_get_max_threads(), holes ? ", outline and lakes" : "");
  std::printf("%9s %-8s %9s %9s %12s %12s %12s %10s %10s\n", "unknowns", "ordering", "order s",
              "analyse s", "nnz(L)", "flops", "stored", "factor s", "residual");
  for (const double cells : sizes) {
    const int n = static_cast<int>(std::lround(std::sqrt(cells)));
    const std::vector<std::uint8_t> in = basin_mask(n, holes);
    StructuredUnknowns grid{n, n, std::vector<std::int32_t>(in.size(), -1)};
    int m = 0;
    for (std::size_t i = 0; i < in.size(); ++i)
      if (in[i]) grid.unknown_of_cell[i] = m++;
    const SparseMatrix a = masked_grid_matrix(n, grid);
    for (int kind = grid_only ? 2 : amd ? 0 : 1; kind < 3; ++kind) {
      std::vector<int> order;
      double order_s = 0.0;
      if (kind == 2) {
        const auto t0 = bench::Clock::now();
        order = grid_elimination_order(grid);
        order_s = bench::seconds_since(t0);
      }
      const CholeskyAnalysis f = analyse_cholesky(
          a, kind == 0 ? CholmodOrdering::amd : CholmodOrdering::metis, order, factorize != 0);
      std::printf("%9d %-8s %9.3f %9.3f %12.4e %12.4e %12.4e %10.3f %10.2e%s\n",
                  static_cast<int>(a.rows()),
                  kind == 0   ? "AMD"
                  : kind == 1 ? "METIS"
                              : "grid ND",
                  order_s, f.analyse_seconds + order_s, f.nonzeros, f.flops, f.stored,
                  f.factorize_seconds, f.residual, f.ok ? "" : "  (failed)");
      std::fflush(stdout);
    }
  }
}
