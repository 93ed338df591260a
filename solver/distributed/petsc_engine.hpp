#pragma once
// The distributed engine: the same model, the same kernels and the same Newton and time
// control as the serial engine (run_simulation), on PETSc's distributed structured arrays
// over MPI. The grid is split into bands of whole rows, one per rank, each holding one ghost
// row on either side (a star stencil of width 1); each rank assembles its own rows of the
// residual and of -dR/dh, and PETSc's Krylov solvers with algebraic multigrid solve for the
// Newton update. No PETSc or MPI type appears here: callers need neither header.
#include <memory>
#include <vector>

#include "mesh/grid_part.hpp"
#include "solver/result_reduction.hpp"
#include "solver/simulation.hpp"

namespace aquiledger {

/// PETSc (and MPI) for the life of the object; one per process, before any engine.
class PetscRuntime {
 public:
  PetscRuntime(int* argc, char*** argv);
  ~PetscRuntime();
  PetscRuntime(const PetscRuntime&) = delete;
  PetscRuntime& operator=(const PetscRuntime&) = delete;
  int rank() const { return rank_; }
  int n_ranks() const { return n_ranks_; }
  /// Sums and flags over every rank of the run.
  ResultReduction& reduction() { return *reduction_; }
  /// Ends every rank of the run at once with this exit status (MPI_Abort): for a failure on
  /// some ranks only, where the others would wait for them in a collective call forever.
  [[noreturn]] static void abort_all(int status);

 private:
  int rank_ = 0;
  int n_ranks_ = 1;
  std::unique_ptr<ResultReduction> reduction_;
};

/// The engine's split of n_rows grid rows into n_ranks bands, rank 0 the northern band: the
/// first n_rows % n_ranks bands one row longer than the others (PETSc's own default split
/// for a DMDA). Given to the DMDA explicitly, so that a reader that keeps only a rank's band
/// of the inputs (ReaderContext::band) and PETSc cannot disagree. Needs 1 <= n_ranks <= n_rows.
std::vector<RowBand> row_split(int n_rows, int n_ranks);

/// The part of rank `rank`: its band of row_split (owned) and the rows it holds (window: one
/// ghost row more on each side, within the grid), as the engine's DMDA gives them. The rows
/// whose per-cell inputs the rank reads (read_model_file's band_of).
GridPart rank_part(int n_rows, int n_cols, int n_ranks, int rank);

class DistributedEngine {
 public:
  /// Collective: every rank passes the same model. Splits the grid and builds the matrix.
  explicit DistributedEngine(const Model& model);
  ~DistributedEngine();
  /// The rows this rank owns and holds; the observer's heads are over part().window.
  const GridPart& part() const;
  /// Collective: runs every period as run_simulation does (same convergence test, cutbacks
  /// and failure reports); the observer gets each rank's window of heads. options.start and
  /// options.checkpoint work as in run_simulation, with every head vector of StartState (head,
  /// previous_head) holding this rank's held rows (part().first_held() on) and linear_start
  /// unused (each Krylov solve starts from zero).
  RunResult run(SimulationObserver& observer, const SimulationOptions& options = {});

  struct Impl;  ///< PETSc's objects and the rank's tables (petsc_engine.cpp)

 private:
  std::unique_ptr<Impl> impl_;
};

}  // namespace aquiledger
