// Candidate linear solvers for the Newton systems of the benchmark basin, timed on one and the
// same matrix: hypre BoomerAMG (algebraic multigrid) and hypre PFMG (structured-grid multigrid)
// as preconditioners of GMRES or BiCGSTAB, PETSc GAMG, and the serial engine's present
// backends (UMFPACK, BiCGSTAB with a Cholesky factor of the fixed-thickness matrix, CHOLMOD).
//
//   multigrid_candidates --write FILE [--cells 1e6] [--variant switching|confined] [--step 3]
//       runs the basin (30 steps per period) up to the end of step `step` of the pumping
//       period and writes the first Newton system of the next step: the Jacobian at heads
//       extrapolated along the last step, and the residual there (the right-hand side).
//   multigrid_candidates --solve FILE --method M [--tolerance 0.1]
//       M: amg-gmres, amg-bicgstab, amg-pcg, pfmg-gmres, pfmg-bicgstab, pfmg-pcg,
//          gamg-gmres, gamg-bicgstab, gamg-cg, umfpack, picard-bicgstab, cholmod
//       solves the system to the relative residual |b - A x| / |b| <= tolerance from a zero
//       start (tolerance 0.1 is the forcing term of a step's first Newton solve,
//       solver/newton_iteration.hpp) and prints set-up and solve seconds, iterations, the
//       true relative residual reached, and the memory the solver added (resident set).
// Each method runs in its own process (a shell loop; docs/performance.md), so that the
// memory figure is the solver's own and MPI starts as a singleton (no mpirun).
#include <HYPRE.h>
#include <HYPRE_parcsr_ls.h>
#include <HYPRE_struct_ls.h>
#include <mpi.h>
#include <petscksp.h>

#include <chrono>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <stdexcept>
#include <string>
#include <vector>

#include "benchmarks/basin_generator.hpp"
#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"
#include "solver/simulation.hpp"
#include "solver/system_layout.hpp"

using namespace aquiledger;
using Clock = std::chrono::steady_clock;

namespace {

double since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

/// Resident set size now (MiB), from /proc/self/status.
double rss_mib() {
  std::ifstream in("/proc/self/status");
  std::string line;
  while (std::getline(in, line))
    if (line.rfind("VmRSS:", 0) == 0) return std::stod(line.substr(6)) / 1024.0;
  return 0.0;
}
double peak_mib() {
  std::ifstream in("/proc/self/status");
  std::string line;
  while (std::getline(in, line))
    if (line.rfind("VmHWM:", 0) == 0) return std::stod(line.substr(6)) / 1024.0;
  return 0.0;
}

/// The system as written to file: grid size, unknown of every cell, CSR rows, right-hand side.
struct System {
  int n_rows = 0, n_cols = 0;
  bool symmetric = false;
  std::vector<int> unknown_of_cell;
  std::vector<int> row_start, column;
  std::vector<double> value, rhs;
  int n() const { return static_cast<int>(rhs.size()); }
};

template <class T>
void put(std::ofstream& out, const std::vector<T>& v) {
  const long size = static_cast<long>(v.size());
  out.write(reinterpret_cast<const char*>(&size), sizeof size);
  out.write(reinterpret_cast<const char*>(v.data()),
            static_cast<std::streamsize>(size * sizeof(T)));
}
template <class T>
void get(std::ifstream& in, std::vector<T>& v) {
  long size = 0;
  in.read(reinterpret_cast<char*>(&size), sizeof size);
  v.resize(static_cast<std::size_t>(size));
  in.read(reinterpret_cast<char*>(v.data()), static_cast<std::streamsize>(size * sizeof(T)));
}

void write_system(const System& s, const std::string& path) {
  std::ofstream out(path, std::ios::binary);
  const int head[3] = {s.n_rows, s.n_cols, s.symmetric ? 1 : 0};
  out.write(reinterpret_cast<const char*>(head), sizeof head);
  put(out, s.unknown_of_cell);
  put(out, s.row_start);
  put(out, s.column);
  put(out, s.value);
  put(out, s.rhs);
  if (!out) throw std::runtime_error("cannot write " + path);
}

System read_system(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw std::runtime_error("cannot read " + path);
  System s;
  int head[3] = {0, 0, 0};
  in.read(reinterpret_cast<char*>(head), sizeof head);
  s.n_rows = head[0];
  s.n_cols = head[1];
  s.symmetric = head[2] != 0;
  get(in, s.unknown_of_cell);
  get(in, s.row_start);
  get(in, s.column);
  get(in, s.value);
  get(in, s.rhs);
  if (!in) throw std::runtime_error("truncated " + path);
  return s;
}

/// Stops the run after a given step of the first period, keeping the last two heads.
struct Stop {};
class Capture final : public SimulationObserver {
 public:
  explicit Capture(int step) : step_(step) {}
  void initial_state(std::span<const double> head) override {
    now.assign(head.begin(), head.end());
  }
  void step_done(const StepInfo& info, std::span<const double>,
                 std::span<const double> head) override {
    before = now;
    now.assign(head.begin(), head.end());
    dt = info.dt;
    std::printf("step %d done: %d Newton iterations\n", info.step, info.newton_iterations);
    std::fflush(stdout);
    if (info.step >= step_) throw Stop{};
  }
  void period_done(std::size_t) override {}
  std::vector<double> before, now;
  double dt = 0.0;

 private:
  int step_;
};

int write_mode(double cells, bool switching, int step, const std::string& path) {
  bench::BasinSpec spec;
  spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(cells)));
  spec.switching = switching;
  spec.steps_per_period = 30;
  const Model model = bench::make_basin(spec);
  Capture capture(step);
  try {
    run_simulation(model, capture);
  } catch (const Stop&) {
  }
  const SystemLayout layout = make_system_layout(model);
  FlowSystem system(model, layout);
  system.set_step(0, false, capture.dt, capture.now);
  std::vector<double> start(capture.now.size());
  for (std::size_t i = 0; i < start.size(); ++i)
    start[i] =
        std::isfinite(capture.now[i]) ? 2.0 * capture.now[i] - capture.before[i] : capture.now[i];
  system.assemble(start);
  const Eigen::SparseMatrix<double, Eigen::RowMajor, int> a = system.matrix();
  System s;
  s.n_rows = spec.n_rows;
  s.n_cols = spec.n_cols;
  s.symmetric = system.symmetric();
  s.unknown_of_cell = layout.unknown_of_cell;
  s.row_start.assign(a.outerIndexPtr(), a.outerIndexPtr() + a.rows() + 1);
  s.column.assign(a.innerIndexPtr(), a.innerIndexPtr() + a.nonZeros());
  s.value.assign(a.valuePtr(), a.valuePtr() + a.nonZeros());
  s.rhs.assign(system.residual().data(), system.residual().data() + a.rows());
  write_system(s, path);
  std::printf("%s: %d unknowns, %ld entries, symmetric %d, dt %g d\n", path.c_str(), s.n(),
              static_cast<long>(s.value.size()), s.symmetric ? 1 : 0, capture.dt);
  return 0;
}

/// |b - A x| / |b|.
double relative_residual(const System& s, const std::vector<double>& x) {
  double rr = 0.0, bb = 0.0;
  for (int i = 0; i < s.n(); ++i) {
    double r = s.rhs[i];
    for (int k = s.row_start[i]; k < s.row_start[i + 1]; ++k) r -= s.value[k] * x[s.column[k]];
    rr += r * r;
    bb += s.rhs[i] * s.rhs[i];
  }
  return std::sqrt(rr / bb);
}

struct Outcome {
  double setup = 0, solve = 0;
  int iterations = 0;
  std::vector<double> x;
};

// ---- hypre: BoomerAMG through the IJ interface -------------------------------------------

Outcome hypre_amg(const System& s, const std::string& krylov, double tol) {
  Outcome o;
  const int n = s.n();
  HYPRE_IJMatrix ij;
  HYPRE_IJVector ib, ix;
  HYPRE_IJMatrixCreate(MPI_COMM_WORLD, 0, n - 1, 0, n - 1, &ij);
  HYPRE_IJMatrixSetObjectType(ij, HYPRE_PARCSR);
  HYPRE_IJMatrixInitialize(ij);
  std::vector<int> rows(n), ncols(n);
  for (int i = 0; i < n; ++i) rows[i] = i, ncols[i] = s.row_start[i + 1] - s.row_start[i];
  HYPRE_IJMatrixSetValues(ij, n, ncols.data(), rows.data(), s.column.data(), s.value.data());
  HYPRE_IJMatrixAssemble(ij);
  HYPRE_ParCSRMatrix a;
  HYPRE_IJMatrixGetObject(ij, reinterpret_cast<void**>(&a));
  std::vector<double> zero(n, 0.0);
  HYPRE_IJVectorCreate(MPI_COMM_WORLD, 0, n - 1, &ib);
  HYPRE_IJVectorSetObjectType(ib, HYPRE_PARCSR);
  HYPRE_IJVectorInitialize(ib);
  HYPRE_IJVectorSetValues(ib, n, rows.data(), s.rhs.data());
  HYPRE_IJVectorAssemble(ib);
  HYPRE_IJVectorCreate(MPI_COMM_WORLD, 0, n - 1, &ix);
  HYPRE_IJVectorSetObjectType(ix, HYPRE_PARCSR);
  HYPRE_IJVectorInitialize(ix);
  HYPRE_IJVectorSetValues(ix, n, rows.data(), zero.data());
  HYPRE_IJVectorAssemble(ix);
  HYPRE_ParVector b, x;
  HYPRE_IJVectorGetObject(ib, reinterpret_cast<void**>(&b));
  HYPRE_IJVectorGetObject(ix, reinterpret_cast<void**>(&x));

  HYPRE_Solver amg, solver;
  HYPRE_BoomerAMGCreate(&amg);
  HYPRE_BoomerAMGSetPrintLevel(amg, 0);
  HYPRE_BoomerAMGSetCoarsenType(amg, 10);  // HMIS
  HYPRE_BoomerAMGSetInterpType(amg, 6);    // extended+i
  HYPRE_BoomerAMGSetPMaxElmts(amg, 4);
  HYPRE_BoomerAMGSetStrongThreshold(amg, 0.25);
  HYPRE_BoomerAMGSetRelaxType(amg, 8);  // l1 symmetric Gauss-Seidel
  HYPRE_BoomerAMGSetNumSweeps(amg, 1);
  HYPRE_BoomerAMGSetMaxIter(amg, 1);
  HYPRE_BoomerAMGSetTol(amg, 0.0);
  if (krylov == "gmres") {
    HYPRE_ParCSRGMRESCreate(MPI_COMM_WORLD, &solver);
    HYPRE_GMRESSetKDim(solver, 30);
    HYPRE_GMRESSetMaxIter(solver, 500);
    HYPRE_GMRESSetTol(solver, tol);
    HYPRE_GMRESSetPrecond(solver, (HYPRE_PtrToSolverFcn)HYPRE_BoomerAMGSolve,
                          (HYPRE_PtrToSolverFcn)HYPRE_BoomerAMGSetup, amg);
    auto t0 = Clock::now();
    HYPRE_ParCSRGMRESSetup(solver, a, b, x);
    o.setup = since(t0);
    t0 = Clock::now();
    HYPRE_ParCSRGMRESSolve(solver, a, b, x);
    o.solve = since(t0);
    HYPRE_GMRESGetNumIterations(solver, &o.iterations);
    HYPRE_ParCSRGMRESDestroy(solver);
  } else if (krylov == "bicgstab") {
    HYPRE_ParCSRBiCGSTABCreate(MPI_COMM_WORLD, &solver);
    HYPRE_BiCGSTABSetMaxIter(solver, 500);
    HYPRE_BiCGSTABSetTol(solver, tol);
    HYPRE_BiCGSTABSetPrecond(solver, (HYPRE_PtrToSolverFcn)HYPRE_BoomerAMGSolve,
                             (HYPRE_PtrToSolverFcn)HYPRE_BoomerAMGSetup, amg);
    auto t0 = Clock::now();
    HYPRE_ParCSRBiCGSTABSetup(solver, a, b, x);
    o.setup = since(t0);
    t0 = Clock::now();
    HYPRE_ParCSRBiCGSTABSolve(solver, a, b, x);
    o.solve = since(t0);
    HYPRE_BiCGSTABGetNumIterations(solver, &o.iterations);
    HYPRE_ParCSRBiCGSTABDestroy(solver);
  } else {
    HYPRE_ParCSRPCGCreate(MPI_COMM_WORLD, &solver);
    HYPRE_PCGSetMaxIter(solver, 500);
    HYPRE_PCGSetTol(solver, tol);
    HYPRE_PCGSetTwoNorm(solver, 1);
    HYPRE_PCGSetPrecond(solver, (HYPRE_PtrToSolverFcn)HYPRE_BoomerAMGSolve,
                        (HYPRE_PtrToSolverFcn)HYPRE_BoomerAMGSetup, amg);
    auto t0 = Clock::now();
    HYPRE_ParCSRPCGSetup(solver, a, b, x);
    o.setup = since(t0);
    t0 = Clock::now();
    HYPRE_ParCSRPCGSolve(solver, a, b, x);
    o.solve = since(t0);
    HYPRE_PCGGetNumIterations(solver, &o.iterations);
    HYPRE_ParCSRPCGDestroy(solver);
  }
  o.x.resize(n);
  HYPRE_IJVectorGetValues(ix, n, rows.data(), o.x.data());
  HYPRE_BoomerAMGDestroy(amg);
  HYPRE_IJMatrixDestroy(ij);
  HYPRE_IJVectorDestroy(ib);
  HYPRE_IJVectorDestroy(ix);
  return o;
}

// ---- hypre: PFMG through the Struct interface ---------------------------------------------
// Every grid cell is a point of the structured grid; cells without an unknown (fixed or
// inactive) are identity rows with a zero right-hand side, decoupled from the others (the
// matrix has no entries towards them).

Outcome hypre_pfmg(const System& s, const std::string& krylov, double tol) {
  Outcome o;
  const int nx = s.n_cols, ny = s.n_rows;
  int lower[2] = {0, 0}, upper[2] = {nx - 1, ny - 1};
  HYPRE_StructGrid grid;
  HYPRE_StructGridCreate(MPI_COMM_WORLD, 2, &grid);
  HYPRE_StructGridSetExtents(grid, lower, upper);
  HYPRE_StructGridAssemble(grid);
  HYPRE_StructStencil stencil;
  HYPRE_StructStencilCreate(2, 5, &stencil);
  int offsets[5][2] = {{0, 0}, {-1, 0}, {1, 0}, {0, -1}, {0, 1}};
  for (int e = 0; e < 5; ++e) HYPRE_StructStencilSetElement(stencil, e, offsets[e]);
  HYPRE_StructMatrix a;
  HYPRE_StructMatrixCreate(MPI_COMM_WORLD, grid, stencil, &a);
  HYPRE_StructMatrixInitialize(a);
  const std::size_t cells = static_cast<std::size_t>(nx) * ny;
  std::vector<double> values(5 * cells, 0.0), b(cells, 0.0), x(cells, 0.0);
  std::vector<int> cell_of(s.n());
  for (std::size_t c = 0; c < cells; ++c)
    if (s.unknown_of_cell[c] >= 0) cell_of[s.unknown_of_cell[c]] = static_cast<int>(c);
  for (std::size_t c = 0; c < cells; ++c) {
    const int u = s.unknown_of_cell[c];
    if (u < 0) {
      values[5 * c] = 1.0;
      continue;
    }
    b[c] = s.rhs[u];
    for (int k = s.row_start[u]; k < s.row_start[u + 1]; ++k) {
      const int d = cell_of[s.column[k]] - static_cast<int>(c);
      const int e = d == 0 ? 0 : d == -1 ? 1 : d == 1 ? 2 : d == -nx ? 3 : 4;
      values[5 * c + e] = s.value[k];
    }
  }
  int entries[5] = {0, 1, 2, 3, 4};
  HYPRE_StructMatrixSetBoxValues(a, lower, upper, 5, entries, values.data());
  HYPRE_StructMatrixAssemble(a);
  HYPRE_StructVector vb, vx;
  HYPRE_StructVectorCreate(MPI_COMM_WORLD, grid, &vb);
  HYPRE_StructVectorInitialize(vb);
  HYPRE_StructVectorSetBoxValues(vb, lower, upper, b.data());
  HYPRE_StructVectorAssemble(vb);
  HYPRE_StructVectorCreate(MPI_COMM_WORLD, grid, &vx);
  HYPRE_StructVectorInitialize(vx);
  HYPRE_StructVectorSetBoxValues(vx, lower, upper, x.data());
  HYPRE_StructVectorAssemble(vx);

  HYPRE_StructSolver pfmg, solver;
  HYPRE_StructPFMGCreate(MPI_COMM_WORLD, &pfmg);
  HYPRE_StructPFMGSetMaxIter(pfmg, 1);
  HYPRE_StructPFMGSetTol(pfmg, 0.0);
  HYPRE_StructPFMGSetZeroGuess(pfmg);
  HYPRE_StructPFMGSetRAPType(pfmg, 0);    // Galerkin coarse operators
  HYPRE_StructPFMGSetRelaxType(pfmg, 2);  // red-black Gauss-Seidel (non-symmetric)
  HYPRE_StructPFMGSetNumPreRelax(pfmg, 1);
  HYPRE_StructPFMGSetNumPostRelax(pfmg, 1);
  if (krylov == "gmres") {
    HYPRE_StructGMRESCreate(MPI_COMM_WORLD, &solver);
    HYPRE_StructGMRESSetKDim(solver, 30);
    HYPRE_StructGMRESSetMaxIter(solver, 500);
    HYPRE_StructGMRESSetTol(solver, tol);
    HYPRE_StructGMRESSetPrecond(solver, HYPRE_StructPFMGSolve, HYPRE_StructPFMGSetup, pfmg);
    auto t0 = Clock::now();
    HYPRE_StructGMRESSetup(solver, a, vb, vx);
    o.setup = since(t0);
    t0 = Clock::now();
    HYPRE_StructGMRESSolve(solver, a, vb, vx);
    o.solve = since(t0);
    HYPRE_StructGMRESGetNumIterations(solver, &o.iterations);
    HYPRE_StructGMRESDestroy(solver);
  } else if (krylov == "bicgstab") {
    HYPRE_StructBiCGSTABCreate(MPI_COMM_WORLD, &solver);
    HYPRE_StructBiCGSTABSetMaxIter(solver, 500);
    HYPRE_StructBiCGSTABSetTol(solver, tol);
    HYPRE_StructBiCGSTABSetPrecond(solver, HYPRE_StructPFMGSolve, HYPRE_StructPFMGSetup, pfmg);
    auto t0 = Clock::now();
    HYPRE_StructBiCGSTABSetup(solver, a, vb, vx);
    o.setup = since(t0);
    t0 = Clock::now();
    HYPRE_StructBiCGSTABSolve(solver, a, vb, vx);
    o.solve = since(t0);
    HYPRE_StructBiCGSTABGetNumIterations(solver, &o.iterations);
    HYPRE_StructBiCGSTABDestroy(solver);
  } else {
    HYPRE_StructPCGCreate(MPI_COMM_WORLD, &solver);
    HYPRE_StructPCGSetMaxIter(solver, 500);
    HYPRE_StructPCGSetTol(solver, tol);
    HYPRE_StructPCGSetTwoNorm(solver, 1);
    HYPRE_StructPCGSetPrecond(solver, HYPRE_StructPFMGSolve, HYPRE_StructPFMGSetup, pfmg);
    auto t0 = Clock::now();
    HYPRE_StructPCGSetup(solver, a, vb, vx);
    o.setup = since(t0);
    t0 = Clock::now();
    HYPRE_StructPCGSolve(solver, a, vb, vx);
    o.solve = since(t0);
    HYPRE_StructPCGGetNumIterations(solver, &o.iterations);
    HYPRE_StructPCGDestroy(solver);
  }
  HYPRE_StructVectorGetBoxValues(vx, lower, upper, x.data());
  o.x.assign(s.n(), 0.0);
  for (std::size_t c = 0; c < cells; ++c)
    if (s.unknown_of_cell[c] >= 0) o.x[s.unknown_of_cell[c]] = x[c];
  HYPRE_StructPFMGDestroy(pfmg);
  HYPRE_StructMatrixDestroy(a);
  HYPRE_StructVectorDestroy(vb);
  HYPRE_StructVectorDestroy(vx);
  HYPRE_StructStencilDestroy(stencil);
  HYPRE_StructGridDestroy(grid);
  return o;
}

// ---- PETSc GAMG -----------------------------------------------------------------------------

Outcome petsc_gamg(const System& s, const std::string& krylov, double tol) {
  Outcome o;
  const int n = s.n();
  Mat a;
  MatCreateSeqAIJWithArrays(PETSC_COMM_SELF, n, n, const_cast<int*>(s.row_start.data()),
                            const_cast<int*>(s.column.data()), const_cast<double*>(s.value.data()),
                            &a);
  Vec b, x;
  VecCreateSeqWithArray(PETSC_COMM_SELF, 1, n, s.rhs.data(), &b);
  o.x.assign(n, 0.0);
  VecCreateSeqWithArray(PETSC_COMM_SELF, 1, n, o.x.data(), &x);
  KSP ksp;
  KSPCreate(PETSC_COMM_SELF, &ksp);
  KSPSetOperators(ksp, a, a);
  KSPSetType(ksp, krylov == "gmres" ? KSPGMRES : krylov == "bicgstab" ? KSPBCGS : KSPCG);
  PC pc;
  KSPGetPC(ksp, &pc);
  PCSetType(pc, PCGAMG);
  if (krylov != "cg") KSPSetPCSide(ksp, PC_RIGHT);  // residual norm of the system itself
  if (krylov == "cg") KSPSetNormType(ksp, KSP_NORM_UNPRECONDITIONED);
  KSPSetTolerances(ksp, tol, 0.0, 1e30, 500);
  KSPSetFromOptions(ksp);
  auto t0 = Clock::now();
  KSPSetUp(ksp);
  PCSetUp(pc);
  o.setup = since(t0);
  t0 = Clock::now();
  KSPSolve(ksp, b, x);
  o.solve = since(t0);
  PetscInt it = 0;
  KSPGetIterationNumber(ksp, &it);
  o.iterations = static_cast<int>(it);
  KSPDestroy(&ksp);
  VecDestroy(&b);
  VecDestroy(&x);
  MatDestroy(&a);
  return o;
}

// ---- the serial engine's present backends ---------------------------------------------------
// A first solve analyses, factorises and solves; a second solve of the same matrix reuses the
// factor (the counters tell), so set-up = first - second.

Outcome present(const System& s, const std::string& method, double tol) {
  Outcome o;
  Eigen::SparseMatrix<double, Eigen::RowMajor, int> r(s.n(), s.n());
  r.resize(s.n(), s.n());
  std::vector<Eigen::Triplet<double>> t;
  t.reserve(s.value.size());
  for (int i = 0; i < s.n(); ++i)
    for (int k = s.row_start[i]; k < s.row_start[i + 1]; ++k)
      t.emplace_back(i, s.column[k], s.value[k]);
  r.setFromTriplets(t.begin(), t.end());
  const SparseMatrix a = r;
  std::unique_ptr<LinearSolver> solver = method == "umfpack"   ? make_umfpack_solver()
                                         : method == "cholmod" ? make_cholmod_solver()
                                                               : make_picard_krylov_solver();
  solver->set_relative_tolerance(tol);
  const Eigen::Map<const Eigen::VectorXd> b(s.rhs.data(), s.n());
  Eigen::VectorXd x = Eigen::VectorXd::Zero(s.n());
  auto t0 = Clock::now();
  if (!solver->solve(a, b, x)) throw std::runtime_error(method + " failed");
  const double first = since(t0);
  x.setZero();
  t0 = Clock::now();
  if (!solver->solve(a, b, x)) throw std::runtime_error(method + " failed");
  o.solve = since(t0);
  o.setup = first - o.solve;
  o.iterations = solver->last_iterations();
  o.x.assign(x.data(), x.data() + x.size());
  return o;
}

}  // namespace

int main(int argc, char** argv) {
  std::string write_path, solve_path, method = "amg-gmres", variant = "switching";
  double cells = 1e6, tol = 0.1;
  int step = 3;
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string key = argv[i], value = argv[i + 1];
    if (key == "--write")
      write_path = value;
    else if (key == "--solve")
      solve_path = value;
    else if (key == "--method")
      method = value;
    else if (key == "--variant")
      variant = value;
    else if (key == "--cells")
      cells = std::stod(value);
    else if (key == "--tolerance")
      tol = std::stod(value);
    else if (key == "--step")
      step = std::stoi(value);
    else {
      std::fprintf(stderr, "unknown option %s\n", key.c_str());
      return 64;
    }
  }
  if (!write_path.empty()) return write_mode(cells, variant == "switching", step, write_path);
  if (solve_path.empty()) {
    std::fprintf(stderr, "give --write FILE or --solve FILE\n");
    return 64;
  }
  const System s = read_system(solve_path);
  const std::size_t dash = method.find('-');
  const std::string family = method.substr(0, dash);
  const std::string krylov = dash == std::string::npos ? "" : method.substr(dash + 1);
  Outcome o;
  double base = 0.0;
  if (family == "amg" || family == "pfmg") {
    MPI_Init(&argc, &argv);
    HYPRE_Init();
    base = rss_mib();
    o = family == "amg" ? hypre_amg(s, krylov, tol) : hypre_pfmg(s, krylov, tol);
    HYPRE_Finalize();
    MPI_Finalize();
  } else if (family == "gamg") {
    int no_argc = 1;
    PetscInitialize(&no_argc, &argv, nullptr, nullptr);
    base = rss_mib();
    o = petsc_gamg(s, krylov, tol);
    PetscFinalize();
  } else {
    base = rss_mib();
    o = present(s, method, tol);
  }
  std::printf("%-16s %8d %9.3f %9.3f %6d %10.2e %8.0f\n", method.c_str(), s.n(), o.setup, o.solve,
              o.iterations, relative_residual(s, o.x), peak_mib() - base);
  return 0;
}
