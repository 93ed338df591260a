#pragma once
// The 5-point matrix of an n x n grid with unit conductance between neighbours and storage s on
// the diagonal: the confined system, for the benchmarks of the Cholesky factor alone.
#include <Eigen/SparseCore>
#include <vector>

namespace aquiledger::bench {

inline Eigen::SparseMatrix<double> storage_grid_matrix(int n, double storage) {
  std::vector<Eigen::Triplet<double>> entries;
  const auto cell = [n](int i, int j) { return i * n + j; };
  for (int i = 0; i < n; ++i)
    for (int j = 0; j < n; ++j) {
      double diagonal = storage;
      const int neighbours[4][2] = {{i - 1, j}, {i + 1, j}, {i, j - 1}, {i, j + 1}};
      for (const auto& [r, c] : neighbours) {
        if (r < 0 || r >= n || c < 0 || c >= n) continue;
        entries.emplace_back(cell(i, j), cell(r, c), -1.0);
        diagonal += 1.0;
      }
      entries.emplace_back(cell(i, j), cell(i, j), diagonal);
    }
  Eigen::SparseMatrix<double> a(n * n, n * n);
  a.setFromTriplets(entries.begin(), entries.end());
  a.makeCompressed();
  return a;
}

}  // namespace aquiledger::bench
