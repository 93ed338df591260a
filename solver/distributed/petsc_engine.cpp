#include "solver/distributed/petsc_engine.hpp"

#include <mpi.h>
#include <omp.h>
#include <petscdmda.h>
#include <petscksp.h>

#include <algorithm>
#include <climits>
#include <cmath>
#include <stdexcept>
#include <string>
#include <vector>

#include "solver/cell_balance.hpp"
#include "solver/face_table.hpp"
#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"
#include "solver/newton_iteration.hpp"
#include "solver/preconsolidation_heads.hpp"
#include "solver/storage_function.hpp"
#include "solver/stress_flows.hpp"
#include "solver/stress_kernels.hpp"
#include "solver/system_layout.hpp"
#include "solver/time_loop.hpp"

namespace aquiledger {

std::vector<RowBand> row_split(int n_rows, int n_ranks) {
  std::vector<RowBand> bands;
  int first = 0;
  for (int r = 0; r < n_ranks; ++r) {
    const int count = n_rows / n_ranks + (r < n_rows % n_ranks ? 1 : 0);
    bands.push_back({first, count});
    first += count;
  }
  return bands;
}

GridPart rank_part(int n_rows, int n_cols, int n_ranks, int rank) {
  const RowBand owned = row_split(n_rows, n_ranks)[static_cast<std::size_t>(rank)];
  const int first = std::max(owned.first - 1, 0);
  const int end = std::min(owned.end() + 1, n_rows);
  return {n_cols, owned, {first, end - first}};
}

namespace {

/// PETSc reports errors by code; an engine that cannot set up or solve throws.
void check(PetscErrorCode code, const char* what) {
  if (code != 0) throw std::runtime_error(std::string("PETSc failed: ") + what);
}

void check_mpi(int code, const char* what) {
  if (code != MPI_SUCCESS) throw std::runtime_error(std::string("MPI failed: ") + what);
}

constexpr int max_neighbours = max_cell_neighbours;

struct Neighbour {
  CellIndex cell;
  double factor = 0.0;   ///< see Face::factor
  bool unknown = false;  ///< the neighbour is an unknown (not fixed): a matrix entry
};

}  // namespace

struct DistributedEngine::Impl {
  const Model& model;
  SystemLayout layout;
  MPI_Comm comm = PETSC_COMM_WORLD;
  DM da = nullptr;
  Mat matrix = nullptr;  ///< -dR/dh; identity rows for inactive and fixed cells
  KSP ksp = nullptr;
  Vec head = nullptr;        ///< Newton iterate, owned cells (global vector)
  Vec head_local = nullptr;  ///< the same with ghost rows
  Vec residual = nullptr, update = nullptr, base = nullptr;
  GridPart part;
  bool confined = true;
  /// The structured-grid V-cycle (hypre PFMG) as the Krylov solver's preconditioner, set up
  /// again only when the last solve says it pays (multigrid_rebuild_pays), as in the serial
  /// engine's multigrid backend; null: PETSc's algebraic multigrid (GAMG), set up again
  /// whenever the matrix changed.
  std::unique_ptr<BandMultigrid> vcycle;
  std::string choice_reason;
  bool rebuild_next = false;

  // Per owned cell (index cell - first_owned).
  std::vector<Neighbour> neighbours;  ///< max_neighbours per owned cell
  std::vector<CellStorage> storage;
  std::vector<double> stress_q, stress_dq;
  std::vector<std::uint8_t> parallel_recharge;
  std::vector<double> last_values;  ///< matrix row values of the last assembly (reuse test)
  bool values_changed = true;
  /// Set at a checkpoint: the solver is made anew and the next solve builds the multigrid
  /// hierarchy from nothing, as a run resumed there does. Without this the hierarchy would
  /// carry its history (GAMG reuses its interpolation across set-ups, the smoothers their
  /// eigenvalue estimates), and a resumed run would differ from the uninterrupted one in the
  /// last digits.
  bool fresh_setup = false;

  void forget_preconditioner() {
    check(KSPDestroy(&ksp), "KSPDestroy");
    make_solver();
    fresh_setup = true;
    rebuild_next = false;
  }
  // Per held cell.
  std::vector<ValueSlope> thickness;
  std::vector<CellIndex> fixed_owned;  ///< fixed cells this rank owns

  // The step being solved.
  std::size_t period = 0;
  bool steady = true;
  double dt = 1.0;
  std::vector<double> head_old;  ///< held cells
  double throughflow = 0.0, rounding_floor = 0.0, residual_sum = 0.0;

  // Counters.
  long linear_total = 0;
  long setups = 0, reuses = 0;

  explicit Impl(const Model& m) : model(m), layout(make_system_layout(m)) {
    const RectilinearGrid& g = m.grid;
    confined = m.aquifer.condition == Condition::confined;
    // Bands of whole rows (one process across x): PETSc's ordering is then the raster order,
    // and a band's cells are one run of grid cells. The rows of each band are given (row_split).
    int size = 1, rank = 0;
    check_mpi(MPI_Comm_size(comm, &size), "MPI_Comm_size");
    check_mpi(MPI_Comm_rank(comm, &rank), "MPI_Comm_rank");
    if (size > g.n_rows()) throw std::runtime_error("more ranks than grid rows");
    const std::vector<RowBand> split = row_split(g.n_rows(), size);
    std::vector<PetscInt> rows_per_rank;
    for (const RowBand& b : split) rows_per_rank.push_back(b.count);
    check(DMDACreate2d(comm, DM_BOUNDARY_NONE, DM_BOUNDARY_NONE, DMDA_STENCIL_STAR, g.n_cols(),
                       g.n_rows(), 1, size, 1, 1, nullptr, rows_per_rank.data(), &da),
          "DMDACreate2d (more ranks than grid rows?)");
    check(DMSetFromOptions(da), "DMSetFromOptions");
    check(DMSetUp(da), "DMSetUp");
    PetscInt xs, ys, xm, ym, gxs, gys, gxm, gym;
    check(DMDAGetCorners(da, &xs, &ys, nullptr, &xm, &ym, nullptr), "DMDAGetCorners");
    check(DMDAGetGhostCorners(da, &gxs, &gys, nullptr, &gxm, &gym, nullptr), "DMDAGetGhostCorners");
    if (xs != 0 || xm != g.n_cols() || gxm != g.n_cols())
      throw std::runtime_error("the distributed engine needs bands of whole rows");
    if (ys != split[static_cast<std::size_t>(rank)].first ||
        ym != split[static_cast<std::size_t>(rank)].count)
      throw std::runtime_error("PETSc's band of rows differs from the engine's row split");
    part.n_cols = g.n_cols();
    part.owned = {static_cast<int>(ys), static_cast<int>(ym)};
    part.window = {static_cast<int>(gys), static_cast<int>(gym)};
    if (m.aquifer.interbeds && m.aquifer.interbeds->delay)
      throw std::runtime_error("delay beds are solved by the serial engine only");
    // A model read by band must hold this rank's rows (and no fewer than its ghost rows).
    if (m.band &&
        (m.band->owned.first != part.owned.first || m.band->owned.count != part.owned.count ||
         m.band->window.first > part.window.first || m.band->window.end() < part.window.end()))
      throw std::runtime_error("the model was read for other rows than this rank's band");

    check(DMCreateGlobalVector(da, &head), "DMCreateGlobalVector");
    check(DMCreateLocalVector(da, &head_local), "DMCreateLocalVector");
    check(VecDuplicate(head, &residual), "VecDuplicate");
    check(VecDuplicate(head, &update), "VecDuplicate");
    check(VecDuplicate(head, &base), "VecDuplicate");
    check(VecSet(update, 0.0), "VecSet");
    check(DMCreateMatrix(da, &matrix), "DMCreateMatrix");
    check(MatSetOption(matrix, MAT_NEW_NONZERO_ALLOCATION_ERR, PETSC_TRUE), "MatSetOption");

    const std::size_t n_owned = part.n_owned();
    const auto first = static_cast<std::size_t>(part.first_owned());
    neighbours.assign(n_owned * max_neighbours, Neighbour{});
    storage.resize(n_owned);
    for (std::size_t k = 0; k < n_owned; ++k) {
      const CellIndex c{static_cast<std::int32_t>(first + k)};
      if (layout.unknown_of_cell[at(c)] < 0) {
        if (g.is_active(c) && layout.fixed[at(c)]) fixed_owned.push_back(c);
        continue;
      }
      storage[k] = cell_storage(m, c);
      int slot = 0;
      for_each_active_neighbour(m, c, [&](CellIndex nb, double factor) {
        neighbours[k * max_neighbours + slot++] = {nb, factor, layout.unknown_of_cell[at(nb)] >= 0};
      });
    }
    stress_q.assign(n_owned, 0.0);
    stress_dq.assign(n_owned, 0.0);
    parallel_recharge = recharges_with_distinct_cells(m);
    if (!confined) thickness.resize(part.n_held());
    last_values.assign(n_owned * (max_neighbours + 1), std::nan(""));

    choose_preconditioner(m);
    make_solver();
  }

  /// linear = "multigrid", or "auto" for a system of multigrid_auto_from unknowns or more,
  /// takes the structured V-cycle when the program is built with it; every other case PETSc's
  /// GAMG (the engine's Krylov solvers are the same for every choice). Unlike the serial
  /// engine, whose confined systems keep a Cholesky factor, "auto" takes the V-cycle for
  /// confined systems too: on the generated confined basin, 1.6e5 cells, GAMG's set-up held
  /// about 22 MB on every rank whatever the rank count (its coarsening, MatCoarsenApply; a
  /// heap profile, docs/distributed.md), about 270 bytes per cell of the whole grid, where
  /// the V-cycle's memory divides among the ranks; and it ran faster on 1 rank.
  void choose_preconditioner(const Model& m) {
    const int n = layout.n_unknowns();
    const bool asked = m.solver.linear == LinearChoice::multigrid;
    const bool automatic = m.solver.linear == LinearChoice::automatic && n >= multigrid_auto_from;
    if (!asked && !automatic) {
      choice_reason = "distributed engine: Krylov solver with algebraic multigrid (GAMG)";
      return;
    }
    if (!multigrid_available()) {
      if (asked) make_band_multigrid(0, 0, 0, 0);  // throws: not built
      choice_reason =
          "distributed engine: Krylov solver with algebraic multigrid (GAMG; built without "
          "the structured multigrid)";
      return;
    }
    vcycle = make_band_multigrid(static_cast<int>(MPI_Comm_c2f(comm)), part.n_cols,
                                 part.owned.first, part.owned.count);
    choice_reason = std::string("distributed engine: Krylov solver with structured multigrid (") +
                    (asked ? "multigrid requested" : "auto: " + std::to_string(n) + " unknowns") +
                    ")";
  }

  static PetscErrorCode apply_vcycle(PC pc, Vec r, Vec z) {
    Impl* e = nullptr;
    PetscCall(PCShellGetContext(pc, &e));
    const PetscScalar* in;
    PetscScalar* out;
    PetscCall(VecGetArrayRead(r, &in));
    PetscCall(VecGetArray(z, &out));
    e->vcycle->apply(in, out);
    PetscCall(VecRestoreArray(z, &out));
    PetscCall(VecRestoreArrayRead(r, &in));
    return 0;
  }

  /// The Krylov solver and its multigrid preconditioner, as configured from nothing.
  void make_solver() {
    check(KSPCreate(comm, &ksp), "KSPCreate");
    // Confined: symmetric positive definite, CG. Otherwise upstream weighting makes the matrix
    // non-symmetric: GMRES, right-preconditioned so that the test is on the true residual.
    const bool symmetric = confined;
    check(KSPSetType(ksp, symmetric ? KSPCG : KSPGMRES), "KSPSetType");
    if (symmetric) {
      check(KSPSetNormType(ksp, KSP_NORM_UNPRECONDITIONED), "KSPSetNormType");
      check(MatSetOption(matrix, MAT_SPD, PETSC_TRUE), "MatSetOption SPD");
    } else {
      check(KSPSetPCSide(ksp, PC_RIGHT), "KSPSetPCSide");
      check(KSPGMRESSetRestart(ksp, 100), "KSPGMRESSetRestart");
    }
    check(KSPSetTolerances(ksp, iterative_tolerance, 1e-300, PETSC_DEFAULT, 5000),
          "KSPSetTolerances");
    // Each Newton update starts from zero: the last update is no guess for the next one
    // (whose right-hand side is many orders smaller), and the test stays relative to it.
    check(KSPSetInitialGuessNonzero(ksp, PETSC_FALSE), "KSPSetInitialGuessNonzero");
    PC pc;
    check(KSPGetPC(ksp, &pc), "KSPGetPC");
    if (vcycle) {
      check(PCSetType(pc, PCSHELL), "PCSetType");
      check(PCShellSetContext(pc, this), "PCShellSetContext");
      check(PCShellSetApply(pc, apply_vcycle), "PCShellSetApply");
      check(PCShellSetName(pc, "pfmg"), "PCShellSetName");
    } else {
      check(PCSetType(pc, PCGAMG), "PCSetType");
    }
    check(KSPSetFromOptions(ksp), "KSPSetFromOptions");
  }

  ~Impl() {
    // Codes of the destroy calls are not checked: a destructor cannot throw, and a run that
    // ends has nothing left to protect.
    KSPDestroy(&ksp);
    MatDestroy(&matrix);
    VecDestroy(&base);
    VecDestroy(&update);
    VecDestroy(&residual);
    VecDestroy(&head_local);
    VecDestroy(&head);
    DMDestroy(&da);
  }

  std::string solver_name() const {
    KSPType type;
    PC pc;
    PCType pc_type;
    check(KSPGetType(ksp, &type), "KSPGetType");
    check(KSPGetPC(ksp, &pc), "KSPGetPC");
    check(PCGetType(pc, &pc_type), "PCGetType");
    int size = 1;
    check_mpi(MPI_Comm_size(comm, &size), "MPI_Comm_size");
    return std::string("PETSc ") + type + " + " + (vcycle ? "hypre pfmg" : pc_type) + " (" +
           std::to_string(size) + (size == 1 ? " rank)" : " ranks)");
  }

  /// The held heads of the current iterate (ghost rows updated).
  /// The interbeds' preconsolidation heads at the step start (L, per held cell).
  void set_preconsolidation(std::span<const double> held) {
    const auto offset = static_cast<std::size_t>(part.first_owned() - part.first_held());
    for (std::size_t k = 0; k < storage.size(); ++k) storage[k].preconsolidation = held[offset + k];
  }

  void update_ghosts() {
    check(DMGlobalToLocalBegin(da, head, INSERT_VALUES, head_local), "DMGlobalToLocal");
    check(DMGlobalToLocalEnd(da, head, INSERT_VALUES, head_local), "DMGlobalToLocal");
  }

  /// Copies the owned cells of a held window into the iterate.
  void set_iterate(const std::vector<double>& held) {
    PetscScalar* x;
    check(VecGetArray(head, &x), "VecGetArray");
    const std::size_t offset = static_cast<std::size_t>(part.first_owned() - part.first_held());
    std::copy_n(held.begin() + static_cast<std::ptrdiff_t>(offset), part.n_owned(), x);
    check(VecRestoreArray(head, &x), "VecRestoreArray");
    update_ghosts();
  }

  /// The held heads of the current iterate.
  void get_iterate(std::vector<double>& held) {
    const PetscScalar* x;
    check(VecGetArrayRead(head_local, &x), "VecGetArrayRead");
    held.assign(x, x + part.n_held());
    check(VecRestoreArrayRead(head_local, &x), "VecRestoreArrayRead");
  }

  template <bool Confined>
  void assemble_rows(CellValues h, double& abs_sum, double& face_sum, double& quantum_sum,
                     double& sum) {
    const std::size_t n_owned = part.n_owned();
    const auto first = static_cast<std::size_t>(part.first_owned());
    const RowStep step = row_step(steady, dt, model.solver.face_thickness);
    const CellValues old(head_old, part.first_held());
    const auto first_held = static_cast<std::size_t>(part.first_held());
    auto head_at = [&](CellIndex c) { return h[at(c)]; };
    auto thickness_at = [&](CellIndex c) { return thickness[at(c) - first_held]; };
    PetscScalar* r;
    check(VecGetArray(residual, &r), "VecGetArray");
    bool changed = false;
    const std::span<double> stencil = vcycle ? vcycle->values() : std::span<double>();
    const auto n_cols = static_cast<std::ptrdiff_t>(part.n_cols);
    for (std::size_t k = 0; k < n_owned; ++k) {
      const std::size_t i = first + k;
      const auto row = static_cast<PetscInt>(i);
      PetscInt cols[max_neighbours + 1];
      PetscScalar vals[max_neighbours + 1];
      int n = 0;
      if (layout.unknown_of_cell[i] < 0) {
        // Inactive and fixed cells: identity rows, never updated.
        r[k] = 0.0;
        cols[n] = row;
        vals[n++] = 1.0;
      } else {
        const Neighbour* nbs = &neighbours[k * max_neighbours];
        const CellRowInput in = row_input<Confined>(
            step, CellIndex{static_cast<std::int32_t>(i)}, head_at, thickness_at, stress_q[k],
            stress_dq[k], storage[k], old[i], layout.area[i]);
        auto faces = neighbour_faces<Confined>(nbs, head_at, thickness_at);
        auto off = [&](int s, double value) {
          if (!nbs[s].unknown) return;
          cols[n] = static_cast<PetscInt>(nbs[s].cell.value);
          vals[n++] = value;
        };
        const CellRow cr = cell_row<Confined>(in, faces, off, face_sum);
        cols[n] = row;
        vals[n++] = -cr.diagonal;
        r[k] = cr.residual;
        abs_sum += cr.budget_terms;
        quantum_sum += cr.head_quantum;
        sum += cr.residual;
      }
      if (vcycle) {
        // The row on the structured grid: the cell, west, east, north, south (the entry
        // towards a fixed or inactive neighbour is zero, as it is absent from the matrix).
        double* st = &stencil[k * BandMultigrid::stencil_size];
        std::fill_n(st, BandMultigrid::stencil_size, 0.0);
        for (int s = 0; s < n; ++s) {
          const std::ptrdiff_t d = cols[s] - row;
          const int e = d == 0 ? 0 : d == -1 ? 1 : d == 1 ? 2 : d == -n_cols ? 3 : 4;
          st[e] = vals[s];
        }
      }
      double* last = &last_values[k * (max_neighbours + 1)];
      for (int s = 0; s < n; ++s)
        if (last[s] != vals[s]) changed = true, last[s] = vals[s];
      check(MatSetValues(matrix, 1, &row, n, cols, vals, INSERT_VALUES), "MatSetValues");
    }
    check(VecRestoreArray(residual, &r), "VecRestoreArray");
    check(MatAssemblyBegin(matrix, MAT_FINAL_ASSEMBLY), "MatAssemblyBegin");
    check(MatAssemblyEnd(matrix, MAT_FINAL_ASSEMBLY), "MatAssemblyEnd");
    int any = changed ? 1 : 0;
    check_mpi(MPI_Allreduce(MPI_IN_PLACE, &any, 1, MPI_INT, MPI_LOR, comm),
              "MPI_Allreduce (matrix changed)");
    values_changed = any != 0;
  }

  /// Residual, matrix and budget sums at the current iterate.
  void assemble() {
    update_ghosts();
    const PetscScalar* x;
    check(VecGetArrayRead(head_local, &x), "VecGetArrayRead");
    const CellValues h(std::span<const double>(x, part.n_held()), part.first_held());
    std::fill(stress_q.begin(), stress_q.end(), 0.0);
    std::fill(stress_dq.begin(), stress_dq.end(), 0.0);
    add_stress_flows(model, layout, period, part, h,
                     CellWindow<double>(stress_q, part.first_owned()),
                     CellWindow<double>(stress_dq, part.first_owned()), parallel_recharge);
    if (!confined) {
      const auto first = static_cast<std::size_t>(part.first_held());
      for (std::size_t k = 0; k < thickness.size(); ++k) {
        const CellIndex c{static_cast<std::int32_t>(first + k)};
        if (model.grid.is_active(c)) thickness[k] = saturated_thickness(model, layout, c, h[at(c)]);
      }
    }
    double sums[4] = {0.0, 0.0, 0.0, 0.0};  // budget terms, face flows, head quanta, residuals
    if (confined)
      assemble_rows<true>(h, sums[0], sums[1], sums[2], sums[3]);
    else
      assemble_rows<false>(h, sums[0], sums[1], sums[2], sums[3]);
    // Fixed heads enter the budget as the net flow of each fixed cell to its neighbours.
    for (CellIndex c : fixed_owned) sums[0] += std::abs(fixed_cell_net_flow(model, layout, c, h));
    check(VecRestoreArrayRead(head_local, &x), "VecRestoreArrayRead");
    check_mpi(MPI_Allreduce(MPI_IN_PLACE, sums, 4, MPI_DOUBLE, MPI_SUM, comm),
              "MPI_Allreduce (budget sums)");
    throughflow = 0.5 * sums[0];
    rounding_floor = aquiledger::rounding_floor(sums[0], sums[1], sums[2]);
    residual_sum = sums[3];
  }

  ResidualNorms norms() const {
    const PetscScalar* r;
    check(VecGetArrayRead(residual, &r), "VecGetArrayRead");
    ResidualScan scan;  // this rank's owned unknowns, in increasing cell order
    const std::size_t n_owned = part.n_owned();
    for (std::size_t k = 0; k < n_owned; ++k) {
      const std::size_t i = static_cast<std::size_t>(part.first_owned()) + k;
      if (layout.unknown_of_cell[i] >= 0) scan.add(r[k], static_cast<int>(i));
    }
    check(VecRestoreArrayRead(residual, &r), "VecRestoreArrayRead");
    // Merged over the ranks: the sum, and the largest with ties to the lowest cell.
    struct {
      double value;
      int cell;
    } largest{scan.largest, scan.worst >= 0 ? scan.worst : INT_MAX};
    check_mpi(MPI_Allreduce(MPI_IN_PLACE, &scan.sum_sq, 1, MPI_DOUBLE, MPI_SUM, comm),
              "MPI_Allreduce (residual norm)");
    check_mpi(MPI_Allreduce(MPI_IN_PLACE, &largest, 1, MPI_DOUBLE_INT, MPI_MAXLOC, comm),
              "MPI_Allreduce (largest residual)");
    scan.largest = largest.value;
    scan.worst = largest.value >= 0.0 ? largest.cell : -1;
    return scan.norms();
  }

  /// The Krylov solve preconditioned by the structured V-cycle: the fine grid always smooths
  /// with the current matrix; the coarse grids are built anew when the last solve said it
  /// pays, after a checkpoint, or when a kept set-up fails to converge (then once more).
  bool solve_with_vcycle(int& iterations) {
    vcycle->load_values();
    check(KSPSetOperators(ksp, matrix, matrix), "KSPSetOperators");
    PetscReal b_norm = 0.0;
    check(VecNorm(residual, NORM_2, &b_norm), "VecNorm");
    bool rebuild = setups == 0 || fresh_setup || rebuild_next;
    fresh_setup = false;
    KSPConvergedReason reason = KSP_DIVERGED_ITS;
    PetscInt its = 0;
    for (int attempt = 0; attempt < 2; ++attempt) {
      if (rebuild) vcycle->set_up();
      rebuild ? ++setups : ++reuses;
      if (KSPSolve(ksp, residual, update) != 0) return false;
      check(KSPGetConvergedReason(ksp, &reason), "KSPGetConvergedReason");
      check(KSPGetIterationNumber(ksp, &its), "KSPGetIterationNumber");
      linear_total += its;
      if (reason > 0 || rebuild) break;
      rebuild = true;
    }
    iterations = static_cast<int>(its);
    PetscReal r_norm = 0.0;
    check(KSPGetResidualNorm(ksp, &r_norm), "KSPGetResidualNorm");
    rebuild_next = multigrid_rebuild_pays(iterations, b_norm > 0.0 ? r_norm / b_norm : 0.0);
    return reason > 0;
  }

  bool solve_linear(int& iterations) {
    if (vcycle) return solve_with_vcycle(iterations);
    // A matrix equal to the last one keeps its multigrid hierarchy (as the serial direct
    // solver keeps its factorisation).
    const bool reuse = !values_changed && setups > 0 && !fresh_setup;
    fresh_setup = false;
    check(KSPSetReusePreconditioner(ksp, reuse ? PETSC_TRUE : PETSC_FALSE),
          "KSPSetReusePreconditioner");
    check(KSPSetOperators(ksp, matrix, matrix), "KSPSetOperators");
    reuse ? ++reuses : ++setups;
    // A solve PETSc reports as failed is a failed linear solve (Newton cuts the step back),
    // as in the serial engine; its reason is read below.
    if (KSPSolve(ksp, residual, update) != 0) return false;
    KSPConvergedReason reason;
    PetscInt its;
    check(KSPGetConvergedReason(ksp, &reason), "KSPGetConvergedReason");
    check(KSPGetIterationNumber(ksp, &its), "KSPGetIterationNumber");
    iterations = static_cast<int>(its);
    linear_total += its;
    return reason > 0;
  }

  void save_base() { check(VecCopy(head, base), "VecCopy"); }

  /// heads = base + step * update, each stopped at its withdrawal's inflection point when
  /// `limit` (stopped_at_inflection, as the serial engine); returns the largest head change.
  double apply(double step, bool limit) {
    check(VecWAXPY(head, step, update, base), "VecWAXPY");
    if (!limit || confined) {
      PetscReal largest;
      check(VecNorm(update, NORM_INFINITY, &largest), "VecNorm");
      return std::abs(step) * largest;
    }
    PetscScalar* h = nullptr;
    const PetscScalar* h0 = nullptr;
    check(VecGetArray(head, &h), "VecGetArray");
    check(VecGetArrayRead(base, &h0), "VecGetArrayRead");
    const std::size_t first = static_cast<std::size_t>(part.first_owned());
    double largest = 0.0;
    for (std::size_t k = 0; k < part.n_owned(); ++k) {
      const std::size_t c = first + k;
      h[k] = stopped_at_inflection(
          h0[k], h[k],
          withdrawal_inflection_head(model.aquifer.bottom[c], layout.reduction_length[c]));
      if (std::isfinite(h[k] - h0[k])) largest = std::max(largest, std::abs(h[k] - h0[k]));
    }
    check(VecRestoreArrayRead(base, &h0), "VecRestoreArrayRead");
    check(VecRestoreArray(head, &h), "VecRestoreArray");
    check_mpi(MPI_Allreduce(MPI_IN_PLACE, &largest, 1, MPI_DOUBLE, MPI_MAX, comm),
              "MPI_Allreduce (largest head change)");
    return largest;
  }
};

namespace {

/// The Newton problem of newton_iteration.hpp over the engine's vectors.
class DistributedProblem {
 public:
  DistributedProblem(DistributedEngine::Impl& e, bool limit_at_inflection)
      : e_(e), limit_(limit_at_inflection) {}
  void assemble() { e_.assemble(); }
  ResidualNorms norms() const { return e_.norms(); }
  double throughflow() const { return e_.throughflow; }
  double rounding_floor() const { return e_.rounding_floor; }
  double residual_sum() const { return e_.residual_sum; }
  // Every Krylov solve goes to iterative_tolerance, with either preconditioner: Newton's
  // iterates are then those of the serial engine's direct solves, and the engines agree to
  // 1e-8 (tests/distributed). Newton's forcing term (set_linear_tolerance) was measured to
  // move heads by 2e-8 and small budget columns by up to 7e-5 relative on the test models,
  // the size of the Newton tolerance itself, so it is not offered here.
  bool solve_linear(int& iterations) { return e_.solve_linear(iterations); }
  void save_base() { e_.save_base(); }
  double apply(double step) { return e_.apply(step, limit_); }
  CellIndex cell_of(int worst) const { return CellIndex{worst}; }

 private:
  DistributedEngine::Impl& e_;
  bool limit_;
};

/// The time loop's stepper (time_loop.hpp): heads of the held rows.
class DistributedStepper {
 public:
  DistributedStepper(DistributedEngine::Impl& e, const NewtonSettings& settings,
                     SimulationObserver& observer, const SimulationOptions& options,
                     std::vector<double>& head, const RunResult& base)
      : e_(e),
        settings_(settings),
        observer_(observer),
        options_(options),
        head_(head),
        base_(base),
        trial_(head) {}

  bool resume(const StartState& start) {
    if (start.step_in_period > 0)
      history_.resume_after(start.period, start.previous_head, start.previous_dt);
    return preconsolidation_.resume(start.preconsolidation);
  }
  void start_interbeds() { preconsolidation_.start(head_); }
  NewtonResult solve_initial_steady() { return newton_from(0, true, 1.0, head_); }
  void apply_fixed_heads(std::size_t period) {
    aquiledger::apply_fixed_heads(e_.model, period, CellWindow<double>(head_, e_.part.first_held()),
                                  e_.part);
  }
  NewtonResult try_step(std::size_t period, bool steady, double dt) {
    // The same extrapolated start as the serial engine (StepHistory), cell by cell.
    history_.start(period, steady, dt, head_, trial_);
    return newton_from(period, steady, dt, trial_);
  }
  void accept(const StepInfo& info) {
    std::swap(head_, trial_);
    StepInfo told = info;
    told.preconsolidation = preconsolidation_.values();
    observer_.step_done(told, e_.head_old, head_);
    preconsolidation_.lower(head_);
    history_.accepted(info.period, info.dt, e_.head_old);  // e_.head_old is set anew next step
  }
  void period_done(std::size_t period) { observer_.period_done(period); }
  /// Collective: every rank hands its rows' state to options.checkpoint at the same step.
  void checkpoint(std::size_t period, int step_in_period, double time, const RunResult& so_far) {
    StartState state = history_.checkpoint_state(period, step_in_period, time, head_, so_far);
    state.preconsolidation.assign(preconsolidation_.values().begin(),
                                  preconsolidation_.values().end());
    options_.checkpoint(state);
    e_.forget_preconditioner();
  }
  RunResult finish(RunResult r) const {
    r.linear_iterations = base_.linear_iterations + e_.linear_total;
    r.factorizations = base_.factorizations + e_.setups;
    r.factorization_reuses = base_.factorization_reuses + e_.reuses;
    return r;
  }

 private:
  /// Newton for a step of `period` of length dt from head_, started at x; the result in x.
  NewtonResult newton_from(std::size_t period, bool steady, double dt, std::vector<double>& x) {
    e_.head_old = head_;
    if (preconsolidation_.active()) e_.set_preconsolidation(preconsolidation_.values());
    e_.period = period;
    e_.steady = steady;
    e_.dt = dt;
    e_.set_iterate(x);
    DistributedProblem problem(e_, settings_.limit_at_withdrawal_inflection);
    const NewtonResult nr = newton_iterate(problem, settings_);
    e_.update_ghosts();
    e_.get_iterate(x);
    return nr;
  }

  DistributedEngine::Impl& e_;
  const NewtonSettings& settings_;
  SimulationObserver& observer_;
  const SimulationOptions& options_;
  std::vector<double>& head_;
  const RunResult& base_;  ///< counters of the run before this call (a resumed run's)
  std::vector<double> trial_;
  StepHistory history_{trial_.size()};
  PreconsolidationHeads preconsolidation_{e_.model, e_.part};
};

}  // namespace

DistributedEngine::DistributedEngine(const Model& model) : impl_(std::make_unique<Impl>(model)) {}
DistributedEngine::~DistributedEngine() = default;

const GridPart& DistributedEngine::part() const { return impl_->part; }

RunResult DistributedEngine::run(SimulationObserver& observer, const SimulationOptions& options) {
  Impl& e = *impl_;
  const Model& model = e.model;
  // One thread per rank unless asked: ranks already share the cores.
  omp_set_num_threads(model.solver.threads > 0 ? model.solver.threads : 1);
  const StartState* start = options.start ? &*options.start : nullptr;
  RunResult result = starting_result(start, e.solver_name(), e.choice_reason);
  const RunResult base = result;  // counters before this call
  const NewtonSettings settings = newton_settings(model);
  std::vector<double> head(e.part.n_held(), std::nan(""));
  DistributedStepper stepper(e, settings, observer, options, head, base);
  return run_from_start(model, e.layout, e.part, stepper, head, start, result, observer,
                        options.checkpoint ? options.checkpoint_every : 0);
}

}  // namespace aquiledger
