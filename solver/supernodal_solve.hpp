#pragma once
// Forward and back substitution with a supernodal Cholesky factor held elsewhere (CHOLMOD's
// layout; solver/sparse_direct.cpp hands it over), on several threads over independent
// subtrees of the supernodal elimination tree. No SuiteSparse types: plain arrays.
//
// Why our own loops: CHOLMOD 3.0 solves supernode by supernode with one BLAS call (dtrsv,
// dgemv) each, and on the small supernodes of a 2D grid the calls' set-up (OpenBLAS locks a
// mutex per call for its buffer) and the single thread, not the memory traffic, set the time:
// at 1e6 confined cells its solve pair took 0.11 s against the 0.022 to 0.032 s in which the
// triad bandwidth streams the factor's 0.42 GB twice (docs/performance.md, "Eighth pass").
#include <cstdint>
#include <vector>

namespace aquiledger {

/// A supernodal factor L with P A P' = L L' (CHOLMOD User Guide, cholmod_factor; from memory):
/// supernode s holds the columns first_column[s] .. first_column[s + 1] - 1; its row indices
/// are rows[row_start[s] .. row_start[s + 1] - 1] (ascending, the supernode's own columns
/// first) and its values a dense column-major block of as many rows at values + value_start[s].
/// (P b)[k] = b[permutation[k]].
struct SupernodalFactor {
  int n = 0;
  int n_supernodes = 0;
  const int* first_column = nullptr;
  const int* row_start = nullptr;
  const int* value_start = nullptr;
  const int* rows = nullptr;
  const double* values = nullptr;
  const int* permutation = nullptr;
};

/// The substitution plan of one factor's pattern: supernodes split into `threads` groups of
/// whole subtrees of about equal work (entries of L), and the rest (their ancestors, the top
/// separators of a nested-dissection ordering) solved on one thread. Subtrees of the
/// elimination tree touch disjoint columns and can be eliminated in any order among themselves
/// (Liu, SIAM J. Matrix Anal. Appl. 11 (1990) 134-172, the role of elimination trees; from
/// memory); the split is the subtree-to-processor mapping of Geist and Ng, Int. J. Parallel
/// Programming 18 (1989) 291-314 (from memory): the heaviest subtree is replaced by its
/// children until a largest-first assignment balances the groups.
class SupernodalSolve {
 public:
  /// The plan of f's pattern (values are not read) for `threads` threads.
  SupernodalSolve(const SupernodalFactor& f, int threads);
  /// x = A^-1 b with the factor f (the pattern of the plan, any values). b and x may alias.
  void solve(const SupernodalFactor& f, const double* b, double* x);
  /// Share of the factor's entries in the part solved on one thread.
  double serial_share() const { return serial_share_; }
  int groups() const { return static_cast<int>(groups_.size()); }

 private:
  /// A supernode of a group's subtree and the last column of the subtree's root: its rows
  /// beyond that column belong to the serial part.
  struct Entry {
    int supernode;
    int subtree_end;
  };
  void forward(const SupernodalFactor& f, int supernode, int subtree_end, double* work,
               double* delta);
  void backward(const SupernodalFactor& f, int supernode, double* work);
  /// Position of serial-part column c in the serial part's columns.
  int serial_position(int c) const;

  std::vector<std::vector<Entry>> groups_;  ///< in ascending (elimination) order
  std::vector<int> serial_;                 ///< serial supernodes, ascending
  std::vector<int> serial_first_;           ///< their first columns
  std::vector<int> serial_offset_;          ///< their columns' positions, prefix sums
  int serial_columns_ = 0;
  int max_rows_ = 0;
  double serial_share_ = 1.0;
  std::vector<double> y_;                   ///< P b, then the solution in the factor's order
  std::vector<std::vector<double>> work_;   ///< per group: the rows of one supernode
  std::vector<std::vector<double>> delta_;  ///< per group: its updates of serial columns
};

}  // namespace aquiledger
