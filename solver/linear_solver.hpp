#pragma once
// One interface over the sparse linear solvers: CHOLMOD and UMFPACK (direct, in
// sparse_direct.cpp, the only file that includes SuiteSparse headers) and Eigen's
// preconditioned conjugate gradients and BiCGSTAB (iterative, in linear_solver.cpp).
#include <Eigen/SparseCore>
#include <cstdint>
#include <memory>
#include <span>
#include <string>
#include <vector>

#include "solver/flow_system.hpp"
#include "solver/model.hpp"

namespace aquiledger {

class LinearSolver {
 public:
  virtual ~LinearSolver() = default;
  /// Solves a x = b. On entry x holds the previous solution (the start of an iterative
  /// solver). The pattern of a must not change between calls (symbolic analysis runs once).
  /// Returns false when the solver failed (singular matrix, no convergence).
  virtual bool solve(const SparseMatrix& a, const Eigen::VectorXd& b, Eigen::VectorXd& x) = 0;
  /// Solves a X = B for every column of B with one matrix (several right-hand sides, e.g. the
  /// sensitivities of independent parameters). On entry X holds the previous solutions
  /// (b.rows() x b.cols()). By default one solve() per column, in order; the direct backends
  /// solve the columns together with one factorisation (sparse_direct.cpp).
  virtual bool solve_columns(const SparseMatrix& a, const Eigen::MatrixXd& b, Eigen::MatrixXd& x);
  virtual std::string name() const = 0;
  /// True when solve() returns the solution to rounding (a direct factorisation), so that for
  /// an unchanged matrix a second Newton update could only be rounding noise.
  virtual bool exact() const { return false; }
  /// Relative residual |b - a x| / |b| the next solves of an iterative solver stop at
  /// (Newton's forcing term); direct solvers ignore it. Starts at iterative_tolerance.
  virtual void set_relative_tolerance(double) {}
  /// True when a's values are those the last solve factorised (nothing is recorded).
  bool factorized(const SparseMatrix& a) const;

  int last_iterations() const { return last_iterations_; }
  long total_iterations() const { return total_iterations_; }
  /// Numeric factorisations (or preconditioner set-ups) computed, and those skipped because
  /// the matrix values were unchanged.
  long factorizations() const { return factorizations_; }
  long reuses() const { return reuses_; }

 protected:
  /// True when a's values differ from those of the last factorisation (and records them).
  bool values_changed(const SparseMatrix& a);
  void count_factorization(bool reused) { reused ? ++reuses_ : ++factorizations_; }
  void count_iterations(int n) {
    last_iterations_ = n;
    total_iterations_ += n;
  }

 private:
  Eigen::VectorXd last_values_;
  int last_iterations_ = 0;
  long total_iterations_ = 0;
  long factorizations_ = 0;
  long reuses_ = 0;
};

/// Relative residual the iterative solvers reach; tight so that budgets still close.
inline constexpr double iterative_tolerance = 1.0e-12;
/// Size limits of the direct solvers under linear = "auto" (memory and fill-in on 2D grids).
/// Under linear = "auto" a symmetric system is factorised (CHOLMOD) when about this many
/// bytes per unknown, for the whole run, fit in three quarters of the memory the caller says
/// the run may use; PCG otherwise. Measured peaks of the confined basin: 978 bytes per cell at
/// 1e6 cells, 997 at 4e6, 991 at 1e7 (docs/performance.md).
inline constexpr double cholmod_bytes_per_unknown = 1200.0;
/// Without a memory figure, symmetric systems up to this size are factorised.
inline constexpr int cholmod_auto_limit = 5'000'000;
inline constexpr int umfpack_auto_limit = 300'000;
/// Under linear = "auto", non-symmetric systems from 1e4 unknowns go to the multigrid backend
/// when it is built (linear_solver.cpp, multigrid_auto_from): measured faster per step than
/// LU at 1e4 and 1e5 switching cells and than the kept-Cholesky BiCGSTAB at 1e6
/// (docs/performance.md). Below, LU is exact and the process starts no MPI. The distributed
/// engine takes the same size for its own multigrid choice.
inline constexpr int multigrid_auto_from = 10'000;

std::unique_ptr<LinearSolver> make_cholmod_solver();
/// Fill-reducing ordering of the Cholesky factorisation: CHOLMOD's own choice, or forced.
enum class CholmodOrdering { automatic, amd, metis };
std::unique_ptr<LinearSolver> make_cholmod_solver(CholmodOrdering ordering);
std::unique_ptr<LinearSolver> make_umfpack_solver();
std::unique_ptr<LinearSolver> make_pcg_solver();
std::unique_ptr<LinearSolver> make_bicgstab_solver();
/// BiCGSTAB preconditioned by a Cholesky factor of the fixed-thickness (Picard) matrix, kept
/// while it works (non-symmetric upstream-weighted systems too large for LU).
std::unique_ptr<LinearSolver> make_picard_krylov_solver();

/// The structured grid behind the unknowns: n_rows x n_cols cells in raster order, the
/// unknown of each (-1: none, a fixed or inactive cell).
struct StructuredUnknowns {
  int n_rows = 0;
  int n_cols = 0;
  std::vector<std::int32_t> unknown_of_cell;
};
/// Cholesky whose fill-reducing ordering is the nested dissection of the grid behind the
/// unknowns (grid_elimination_order), given to CHOLMOD instead of its own choice; CHOLMOD's
/// automatic choice when the grid's order does not cover the matrix's unknowns. The automatic
/// choice of solver (choose_linear_solver) takes it from 1e5 unknowns only (linear_solver.cpp).
std::unique_ptr<LinearSolver> make_cholmod_solver(const StructuredUnknowns& grid);
/// The unknowns in the elimination order of the grid's nested dissection
/// (mesh/nested_dissection.hpp): entry k is the unknown eliminated k-th. Empty when the grid
/// holds no unknowns or its unknowns are not numbered 0 .. n - 1 once each.
std::vector<int> grid_elimination_order(const StructuredUnknowns& grid);

/// What CHOLMOD's analysis (and, when asked, one numeric factorisation and solve) gives for
/// a Cholesky factor of the symmetric a (both triangles stored, as the solvers take it), set
/// up as make_cholmod_solver sets it up: with the ordering, or with `given` (a permutation
/// of the unknowns, entry k eliminated k-th) when that is not empty. For benchmarks/ordering_cost
/// and the ordering's tests.
struct CholeskyAnalysis {
  double nonzeros = 0.0;  ///< in L, as CHOLMOD's analysis counts them (Common->lnz)
  double flops = 0.0;     ///< of the numeric factorisation (Common->fl)
  double stored = 0.0;    ///< values the factor stores (a supernodal one: with the zeros of
                          ///< merged supernodes)
  double analyse_seconds = 0.0;
  double factorize_seconds = 0.0;  ///< 0 unless factorised
  double residual = 0.0;           ///< |A x - b| / |b| of one solve with b = 1, if factorised
  bool ok = false;
};
CholeskyAnalysis analyse_cholesky(const SparseMatrix& a, CholmodOrdering ordering,
                                  std::span<const int> given, bool factorize);

/// True when the program was built with the multigrid backend (-DAQUILEDGER_WITH_HYPRE=ON,
/// which defines AQUILEDGER_HAVE_MULTIGRID for every target linking the solver library).
constexpr bool multigrid_available() {
#ifdef AQUILEDGER_HAVE_MULTIGRID
  return true;
#else
  return false;
#endif
}
/// Krylov (conjugate gradients when symmetric, BiCGSTAB otherwise) preconditioned by
/// structured-grid multigrid (solver/multigrid_solver.cpp); the preconditioner is kept across
/// solves while it converges fast. Throws std::runtime_error when not built.
std::unique_ptr<LinearSolver> make_multigrid_solver(const StructuredUnknowns& grid, bool symmetric);

/// Whether the next solve should first set up its multigrid preconditioner anew, given the
/// last solve's Krylov iterations and the relative residual it reached: the rule both engines'
/// multigrid paths keep a preconditioner by (solver/multigrid_solver.cpp, where it is measured).
bool multigrid_rebuild_pays(int iterations, double reached);
/// The most Krylov iterations worth spending with a kept multigrid preconditioner for a solve
/// to the relative tolerance: twice what a fresh one needs (beyond that a new set-up pays, by
/// the same measurement as multigrid_rebuild_pays); a kept one that has not converged by then
/// is set up anew and the solve restarted.
int multigrid_kept_iteration_limit(double tolerance);

/// One multigrid V-cycle (hypre PFMG, set as in make_multigrid_solver) over a structured grid
/// of n_cols columns whose rows are split in bands over the ranks of an MPI communicator: the
/// distributed engine's preconditioner. Each rank gives the 5-point stencil of its band's
/// cells (identity rows for cells without an unknown). The communicator is passed by its
/// Fortran handle (MPI_Comm_c2f), so that this header needs no MPI. Every call but values()
/// is collective. Throws std::runtime_error when the multigrid backend is not built.
class BandMultigrid {
 public:
  /// Stencil entries per cell, in this order: the cell, its west, east, north and south
  /// neighbours (rows counted from the north, as in RectilinearGrid).
  static constexpr int stencil_size = 5;
  virtual ~BandMultigrid() = default;
  /// The band's stencil values, stencil_size per cell in raster order, to be written by the
  /// caller before load_values().
  virtual std::span<double> values() = 0;
  /// Hands the values to the V-cycle: a kept set-up smooths with them on the finest grid.
  virtual void load_values() = 0;
  /// Builds the coarse grids and operators for the loaded values.
  virtual void set_up() = 0;
  /// z = one V-cycle from zero applied to r, both over the band's cells in raster order.
  virtual void apply(const double* r, double* z) = 0;
};
std::unique_ptr<BandMultigrid> make_band_multigrid(int comm_handle, int n_cols, int first_row,
                                                   int n_rows);

struct LinearSolverChoice {
  std::unique_ptr<LinearSolver> solver;
  std::string reason;  ///< one line: why this backend
};

/// The backend for a system of n_unknowns equations, symmetric or not, as the user asked,
/// for a run that may use memory_bytes (0: not known). Without a grid (nullptr) the
/// multigrid backend is not a candidate.
LinearSolverChoice choose_linear_solver(LinearChoice choice, bool symmetric, int n_unknowns,
                                        double memory_bytes = 0.0,
                                        const StructuredUnknowns* grid = nullptr);

}  // namespace aquiledger
