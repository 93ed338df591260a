// The multigrid backend: hypre's PFMG (semicoarsening geometric multigrid of a structured
// grid, Ashby and Falgout, Nucl. Sci. Eng. 124 (1996) 145-159; Falgout and Jones, Multigrid
// Methods VI (2000) 37-44) as the preconditioner of BiCGSTAB (non-symmetric systems) or
// conjugate gradients (symmetric ones). The only file that includes hypre's headers; built
// with -DAQUILEDGER_WITH_HYPRE=ON. Debian's hypre is built with MPI: a serial run starts MPI
// itself as a singleton (no mpirun) and stops it at exit.
#include <HYPRE.h>
#include <HYPRE_struct_ls.h>
#include <mpi.h>

#include <cmath>
#include <cstdlib>
#include <stdexcept>
#include <vector>

#include "solver/linear_solver.hpp"

namespace aquiledger {

namespace {

bool mpi_started_here = false;

void stop_hypre_and_mpi() {
  HYPRE_Finalize();
  int finalized = 0;
  MPI_Finalized(&finalized);
  if (mpi_started_here && !finalized) MPI_Finalize();
}

/// Starts MPI (when nobody did) and hypre once per process.
void start_hypre() {
  static const bool started = [] {
    int initialized = 0, finalized = 0;
    MPI_Initialized(&initialized);
    MPI_Finalized(&finalized);
    if (finalized)
      throw std::runtime_error("multigrid solver: MPI was already stopped in this process");
    if (!initialized) {
      int provided = 0;
      MPI_Init_thread(nullptr, nullptr, MPI_THREAD_FUNNELED, &provided);
      mpi_started_here = true;
    }
    HYPRE_Init();
    std::atexit(stop_hypre_and_mpi);
    return true;
  }();
  (void)started;
}

/// One PFMG V-cycle from a zero start per call: Galerkin coarse operators, one red-black
/// Gauss-Seidel sweep before and after (the settings measured in docs/performance.md).
HYPRE_StructSolver make_vcycle(MPI_Comm comm) {
  HYPRE_StructSolver pfmg = nullptr;
  HYPRE_StructPFMGCreate(comm, &pfmg);
  HYPRE_StructPFMGSetMaxIter(pfmg, 1);
  HYPRE_StructPFMGSetTol(pfmg, 0.0);
  HYPRE_StructPFMGSetZeroGuess(pfmg);
  HYPRE_StructPFMGSetRAPType(pfmg, 0);    // Galerkin coarse operators
  HYPRE_StructPFMGSetRelaxType(pfmg, 2);  // red-black Gauss-Seidel
  HYPRE_StructPFMGSetNumPreRelax(pfmg, 1);
  HYPRE_StructPFMGSetNumPostRelax(pfmg, 1);
  return pfmg;
}

/// Stencil entries: the cell, then its west, east, north and south neighbours (grid index
/// (col, row), rows counted from the north as in RectilinearGrid).
constexpr int stencil_size = BandMultigrid::stencil_size;
constexpr int offsets[stencil_size][2] = {{0, 0}, {-1, 0}, {1, 0}, {0, -1}, {0, 1}};

constexpr int max_krylov_iterations = 200;

class PfmgKrylov final : public LinearSolver {
 public:
  PfmgKrylov(const StructuredUnknowns& grid, bool symmetric)
      : nx_(grid.n_cols),
        ny_(grid.n_rows),
        symmetric_(symmetric),
        unknown_of_cell_(grid.unknown_of_cell) {
    start_hypre();
    tolerance_ = iterative_tolerance;
  }
  ~PfmgKrylov() override { release(); }
  PfmgKrylov(const PfmgKrylov&) = delete;
  PfmgKrylov& operator=(const PfmgKrylov&) = delete;

  bool solve(const SparseMatrix& a, const Eigen::VectorXd& b, Eigen::VectorXd& x) override {
    if (!built_) build(a);
    const bool changed = values_changed(a);
    if (changed) load_values(a);
    // Every solve starts from zero, not from the last Newton update: the next update is orders
    // smaller (its right-hand side is the residual the last one left), so the last one would
    // start the Krylov solve at a residual about |F_k-1| instead of |F_k|, and the solve,
    // stopped relative to |b| = |F_k|, would first have to remove that (measured:
    // docs/performance.md, "Third pass").
    if (x.size() != b.size()) x.resize(b.size());
    for (std::size_t c = 0; c < cells(); ++c) {
      const int u = unknown_of_cell_[c];
      rhs_[c] = u >= 0 ? b[u] : 0.0;
      sol_[c] = 0.0;
    }
    HYPRE_StructVectorSetBoxValues(b_, lower_, upper_, rhs_.data());
    HYPRE_StructVectorAssemble(b_);
    bool rebuild = !set_up_ || (changed && rebuild_next_);
    int iterations = 0, spent = 0;
    double reached = 0.0;
    for (int attempt = 0; attempt < 2; ++attempt) {
      HYPRE_StructVectorSetBoxValues(x_, lower_, upper_, sol_.data());
      HYPRE_StructVectorAssemble(x_);
      if (rebuild) set_up();
      count_factorization(!rebuild);
      // A kept preconditioner of BiCGSTAB gets only the iterations it is worth (then a fresh
      // one); the limit's rate was measured with BiCGSTAB, so conjugate gradients keep theirs.
      krylov_solve(rebuild || symmetric_ ? max_krylov_iterations
                                         : multigrid_kept_iteration_limit(tolerance_),
                   iterations, reached);
      spent += iterations;
      if (reached <= tolerance_ && std::isfinite(reached)) break;
      if (rebuild) {  // a fresh preconditioner did not reach the tolerance
        count_iterations(spent);
        return false;
      }
      rebuild = true;
    }
    count_iterations(spent);
    rebuild_next_ = multigrid_rebuild_pays(iterations, reached);
    HYPRE_StructVectorGetBoxValues(x_, lower_, upper_, sol_.data());
    for (std::size_t c = 0; c < cells(); ++c)
      if (unknown_of_cell_[c] >= 0) x[unknown_of_cell_[c]] = sol_[c];
    return reached <= tolerance_ && x.allFinite();
  }
  std::string name() const override {
    return symmetric_ ? "multigrid (pcg + pfmg)" : "multigrid (bicgstab + pfmg)";
  }
  void set_relative_tolerance(double t) override { tolerance_ = t; }

 private:
  std::size_t cells() const {
    return static_cast<std::size_t>(nx_) * static_cast<std::size_t>(ny_);
  }

  /// Grid, stencil, matrix and vectors; the place of every matrix value in the stencil values.
  void build(const SparseMatrix& a) {
    upper_[0] = nx_ - 1;
    upper_[1] = ny_ - 1;
    HYPRE_StructGridCreate(MPI_COMM_SELF, 2, &grid_);
    HYPRE_StructGridSetExtents(grid_, lower_, upper_);
    HYPRE_StructGridAssemble(grid_);
    HYPRE_StructStencilCreate(2, stencil_size, &stencil_);
    for (int e = 0; e < stencil_size; ++e)
      HYPRE_StructStencilSetElement(stencil_, e, const_cast<int*>(offsets[e]));
    HYPRE_StructMatrixCreate(MPI_COMM_SELF, grid_, stencil_, &matrix_);
    HYPRE_StructMatrixInitialize(matrix_);
    HYPRE_StructVectorCreate(MPI_COMM_SELF, grid_, &b_);
    HYPRE_StructVectorInitialize(b_);
    HYPRE_StructVectorCreate(MPI_COMM_SELF, grid_, &x_);
    HYPRE_StructVectorInitialize(x_);
    // Cells without an unknown are identity rows with a zero right-hand side; no unknown's
    // row has an entry towards them, so they stay decoupled.
    values_.assign(stencil_size * cells(), 0.0);
    rhs_.assign(cells(), 0.0);
    sol_.assign(cells(), 0.0);
    std::vector<int> cell_of(static_cast<std::size_t>(a.rows()), -1);
    for (std::size_t c = 0; c < cells(); ++c) {
      if (unknown_of_cell_[c] >= 0)
        cell_of[unknown_of_cell_[c]] = static_cast<int>(c);
      else
        values_[stencil_size * c] = 1.0;
    }
    slot_.resize(static_cast<std::size_t>(a.nonZeros()));
    for (int col = 0; col < a.outerSize(); ++col)
      for (int k = a.outerIndexPtr()[col]; k < a.outerIndexPtr()[col + 1]; ++k) {
        const int row = a.innerIndexPtr()[k];
        const int d = cell_of[col] - cell_of[row];
        int e = -1;
        for (int s = 0; s < stencil_size; ++s)
          if (d == offsets[s][0] + offsets[s][1] * nx_) e = s;
        if (e < 0 || cell_of[row] < 0 || cell_of[col] < 0)
          throw std::logic_error("multigrid solver: matrix entry outside the 5-point stencil");
        slot_[k] = stencil_size * cell_of[row] + e;
      }
    built_ = true;
  }

  void load_values(const SparseMatrix& a) {
    const double* v = a.valuePtr();
    for (std::size_t k = 0; k < slot_.size(); ++k) values_[slot_[k]] = v[k];
    int entries[stencil_size] = {0, 1, 2, 3, 4};
    HYPRE_StructMatrixSetBoxValues(matrix_, lower_, upper_, stencil_size, entries, values_.data());
    HYPRE_StructMatrixAssemble(matrix_);
  }

  /// A new preconditioner (and Krylov solver) for the current matrix values.
  void set_up() {
    destroy_solvers();
    pfmg_ = make_vcycle(MPI_COMM_SELF);
    if (symmetric_) {
      HYPRE_StructPCGCreate(MPI_COMM_SELF, &krylov_);
      HYPRE_StructPCGSetTwoNorm(krylov_, 1);
      HYPRE_StructPCGSetMaxIter(krylov_, max_krylov_iterations);
      HYPRE_StructPCGSetPrecond(krylov_, HYPRE_StructPFMGSolve, HYPRE_StructPFMGSetup, pfmg_);
      HYPRE_StructPCGSetup(krylov_, matrix_, b_, x_);
    } else {
      HYPRE_StructBiCGSTABCreate(MPI_COMM_SELF, &krylov_);
      HYPRE_StructBiCGSTABSetMaxIter(krylov_, max_krylov_iterations);
      HYPRE_StructBiCGSTABSetPrecond(krylov_, HYPRE_StructPFMGSolve, HYPRE_StructPFMGSetup, pfmg_);
      HYPRE_StructBiCGSTABSetup(krylov_, matrix_, b_, x_);
    }
    set_up_ = true;
  }

  void krylov_solve(int max_iterations, int& iterations, double& reached) {
    if (symmetric_) {
      HYPRE_StructPCGSetMaxIter(krylov_, max_iterations);
      HYPRE_StructPCGSetTol(krylov_, tolerance_);
      HYPRE_StructPCGSolve(krylov_, matrix_, b_, x_);
      HYPRE_StructPCGGetNumIterations(krylov_, &iterations);
      HYPRE_StructPCGGetFinalRelativeResidualNorm(krylov_, &reached);
    } else {
      HYPRE_StructBiCGSTABSetMaxIter(krylov_, max_iterations);
      HYPRE_StructBiCGSTABSetTol(krylov_, tolerance_);
      HYPRE_StructBiCGSTABSolve(krylov_, matrix_, b_, x_);
      HYPRE_StructBiCGSTABGetNumIterations(krylov_, &iterations);
      HYPRE_StructBiCGSTABGetFinalRelativeResidualNorm(krylov_, &reached);
    }
    // hypre clears its error flag per call; a solve that stopped at the iteration limit sets it.
    HYPRE_ClearAllErrors();
  }

  void destroy_solvers() {
    if (krylov_)
      symmetric_ ? HYPRE_StructPCGDestroy(krylov_) : HYPRE_StructBiCGSTABDestroy(krylov_);
    if (pfmg_) HYPRE_StructPFMGDestroy(pfmg_);
    krylov_ = pfmg_ = nullptr;
  }

  void release() {
    destroy_solvers();
    if (!built_) return;
    HYPRE_StructVectorDestroy(b_);
    HYPRE_StructVectorDestroy(x_);
    HYPRE_StructMatrixDestroy(matrix_);
    HYPRE_StructStencilDestroy(stencil_);
    HYPRE_StructGridDestroy(grid_);
  }

  int nx_, ny_;
  bool symmetric_;
  std::vector<std::int32_t> unknown_of_cell_;
  int lower_[2] = {0, 0}, upper_[2] = {0, 0};
  HYPRE_StructGrid grid_ = nullptr;
  HYPRE_StructStencil stencil_ = nullptr;
  HYPRE_StructMatrix matrix_ = nullptr;
  HYPRE_StructVector b_ = nullptr, x_ = nullptr;
  HYPRE_StructSolver pfmg_ = nullptr, krylov_ = nullptr;
  std::vector<double> values_, rhs_, sol_;
  std::vector<int> slot_;  ///< per matrix value: its place in values_
  double tolerance_ = 0.0;
  bool built_ = false, set_up_ = false, rebuild_next_ = false;
};

/// The distributed engine's V-cycle: a hypre Struct grid of which each rank holds its band of
/// rows (hypre exchanges the ghost values of its smoothing and coarse grids itself).
class BandPfmg final : public BandMultigrid {
 public:
  BandPfmg(MPI_Comm comm, int n_cols, int first_row, int n_rows) : comm_(comm) {
    start_hypre();
    lower_[0] = 0;
    lower_[1] = first_row;
    upper_[0] = n_cols - 1;
    upper_[1] = first_row + n_rows - 1;
    const auto cells = static_cast<std::size_t>(n_cols) * static_cast<std::size_t>(n_rows);
    HYPRE_StructGridCreate(comm_, 2, &grid_);
    if (n_rows > 0) HYPRE_StructGridSetExtents(grid_, lower_, upper_);
    HYPRE_StructGridAssemble(grid_);
    HYPRE_StructStencilCreate(2, stencil_size, &stencil_);
    for (int e = 0; e < stencil_size; ++e)
      HYPRE_StructStencilSetElement(stencil_, e, const_cast<int*>(offsets[e]));
    HYPRE_StructMatrixCreate(comm_, grid_, stencil_, &matrix_);
    HYPRE_StructMatrixInitialize(matrix_);
    HYPRE_StructVectorCreate(comm_, grid_, &b_);
    HYPRE_StructVectorInitialize(b_);
    HYPRE_StructVectorCreate(comm_, grid_, &x_);
    HYPRE_StructVectorInitialize(x_);
    values_.assign(stencil_size * cells, 0.0);
    for (std::size_t c = 0; c < cells; ++c) values_[stencil_size * c] = 1.0;
  }
  ~BandPfmg() override {
    if (pfmg_) HYPRE_StructPFMGDestroy(pfmg_);
    HYPRE_StructVectorDestroy(b_);
    HYPRE_StructVectorDestroy(x_);
    HYPRE_StructMatrixDestroy(matrix_);
    HYPRE_StructStencilDestroy(stencil_);
    HYPRE_StructGridDestroy(grid_);
  }
  BandPfmg(const BandPfmg&) = delete;
  BandPfmg& operator=(const BandPfmg&) = delete;

  std::span<double> values() override { return values_; }
  void load_values() override {
    int entries[stencil_size] = {0, 1, 2, 3, 4};
    HYPRE_StructMatrixSetBoxValues(matrix_, lower_, upper_, stencil_size, entries, values_.data());
    HYPRE_StructMatrixAssemble(matrix_);
  }
  void set_up() override {
    if (pfmg_) HYPRE_StructPFMGDestroy(pfmg_);
    pfmg_ = make_vcycle(comm_);
    HYPRE_StructPFMGSetup(pfmg_, matrix_, b_, x_);
  }
  void apply(const double* r, double* z) override {
    HYPRE_StructVectorSetBoxValues(b_, lower_, upper_, const_cast<double*>(r));
    HYPRE_StructVectorAssemble(b_);
    HYPRE_StructPFMGSolve(pfmg_, matrix_, b_, x_);
    HYPRE_StructVectorGetBoxValues(x_, lower_, upper_, z);
    // One cycle with no tolerance reports "not converged"; that is the intent.
    HYPRE_ClearAllErrors();
  }

 private:
  MPI_Comm comm_;
  int lower_[2] = {0, 0}, upper_[2] = {0, 0};
  HYPRE_StructGrid grid_ = nullptr;
  HYPRE_StructStencil stencil_ = nullptr;
  HYPRE_StructMatrix matrix_ = nullptr;
  HYPRE_StructVector b_ = nullptr, x_ = nullptr;
  HYPRE_StructSolver pfmg_ = nullptr;
  std::vector<double> values_;
};

}  // namespace

std::unique_ptr<BandMultigrid> make_band_multigrid(int comm_handle, int n_cols, int first_row,
                                                   int n_rows) {
  return std::make_unique<BandPfmg>(MPI_Comm_f2c(comm_handle), n_cols, first_row, n_rows);
}

std::unique_ptr<LinearSolver> make_multigrid_solver(const StructuredUnknowns& grid,
                                                    bool symmetric) {
  return std::make_unique<PfmgKrylov>(grid, symmetric);
}

}  // namespace aquiledger
