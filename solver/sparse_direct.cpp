// The direct backends. This is the only file that includes SuiteSparse headers.
#include <dlfcn.h>
#include <malloc.h>
#include <omp.h>

#include <Eigen/CholmodSupport>
#include <Eigen/IterativeLinearSolvers>
#include <Eigen/UmfPackSupport>
#include <algorithm>
#include <chrono>
#include <cmath>
#include <memory>
#include <vector>

#include "mesh/nested_dissection.hpp"
#include "solver/linear_solver.hpp"
#include "solver/supernodal_solve.hpp"

namespace aquiledger {

namespace {

/// OpenBLAS runs its own thread pool beside OpenMP's; on 2 cores the pools spin and yield
/// against each other (perf showed most of a step in sched_yield and the OpenMP spin-wait),
/// and the fronts of a 2D grid are too small for threaded BLAS to pay. BLAS therefore runs
/// single-threaded in factorisations and solves (docs/performance.md: 2x faster LU steps at
/// 1e5 cells). Looked up at run time: the reference BLAS has no such call.
void set_blas_threads(int n) {
  using SetThreads = void (*)(int);
  static const auto set =
      reinterpret_cast<SetThreads>(dlsym(RTLD_DEFAULT, "openblas_set_num_threads"));
  if (set) set(n);
}

/// While it lives, every OpenMP parallel region runs on the calling thread alone (no active
/// level). CHOLMOD 3.0's supernodal factorisation opens a region for the loops of each
/// supernode with num_threads(CHOLMOD_OMP_NUM_THREADS), fixed at 4 when the library was built
/// (cholmod_core.h), whatever OMP_NUM_THREADS or the machine's cores say: on 2 cores and with
/// passive waiting, hundreds of thousands of thread wake-ups. One numeric factorisation at 1e6
/// cells (benchmarks/ordering_cost, whole process, load 10 to 14): 4.66 + 3.04 s of CPU with
/// the regions, 3.51 + 2.16 s without, the same as under OMP_THREAD_LIMIT=1 (3.66 + 2.18 s);
/// docs/performance.md, "Ninth pass".
class SerialRegions {
 public:
  SerialRegions() : levels_(omp_get_max_active_levels()) { omp_set_max_active_levels(0); }
  ~SerialRegions() { omp_set_max_active_levels(levels_); }
  SerialRegions(const SerialRegions&) = delete;
  SerialRegions& operator=(const SerialRegions&) = delete;

 private:
  int levels_;
};

/// Hands the heap's free memory back to the system. METIS's ordering of a large graph frees
/// its arrays before the factorisation, but the C library keeps much of the freed space in
/// the heap (its mmap threshold rises with each large block freed), and the factor then comes
/// on top: at 1e6 confined cells the process held 105 MiB more after the analysis than
/// before it, 21 MiB less with this call, and its peak fell from 1011 to 970 MB
/// (docs/performance.md, "Eighth pass").
void return_freed_memory() {
#ifdef __GLIBC__
  malloc_trim(0);
#endif
}

/// Without the grid behind the unknowns (make_cholmod_solver(grid) orders by the grid's own
/// nested dissection, smaller than METIS's and AMD's at every size measured), from this many
/// unknowns CHOLMOD's automatic choice of ordering is replaced by METIS nested dissection. On the
/// 5-point grid (measured, docs/performance.md) CHOLMOD keeps AMD at 1e6 unknowns, whose factor
/// holds 44.7 entries per row against METIS's 34.0 (peak 649 against 525 bytes per row), and picks
/// METIS itself at 4e6; METIS costs about 4 s more analysis once at 1e6, and factorises in 2.7 s
/// against 3.0 s.
constexpr int metis_ordering_from = 500'000;

/// Below this many unknowns the Cholesky factor is simplicial (column by column: no BLAS, no
/// OpenMP) instead of supernodal. CHOLMOD 3.0's supernodal factorisation opens an OpenMP
/// parallel region for every supernode, and on a 2D grid of a few thousand cells those
/// regions, not the arithmetic, set its time: about a million futex calls in a 200-step run
/// of 5041 cells, a third of its CPU time in the kernel. Factorise and solve, median, 5-point
/// matrix (benchmarks/cholesky_kinds, 2 cores, load about 8): 2,500 cells 8.6 against 0.6 ms;
/// 10,000 cells 25 against 9 ms; 48,400 cells 209 against 122 ms; 99,856 cells 532 against
/// 510 ms; 490,000 cells 2.8 s supernodal against 8.9 s simplicial.
constexpr int simplicial_below = 100'000;

void use_simplicial(cholmod_common& c) {
  // As Eigen's CholmodSimplicialLLT: an LL' factor, so an indefinite matrix fails as the
  // supernodal factorisation does.
  c.supernodal = CHOLMOD_SIMPLICIAL;
  c.final_asis = 0;
  c.final_super = 0;
  c.final_ll = 1;
  c.final_pack = 1;
  c.final_monotonic = 1;
  c.final_resymbol = 1;
}

/// Share of explicit zeros CHOLMOD may add when it merges supernodes of up to 4, 16 and 48
/// columns (its defaults 0.8, 0.1, 0.05; CHOLMOD User Guide, Common->zrelax; from memory),
/// halved for the large factors METIS orders. At 1e6 confined cells the factor then holds
/// 46.6 million values instead of 52.6 (a 0.4 GiB factor loses 46 MB, the run's peak 48 bytes
/// per cell) in 303,000 supernodes instead of 182,000; the kept factor's solve pair costs the
/// same (0.081 to 0.085 s of CPU), analysis and factorisation about as much within the noise
/// of a loaded machine (benchmarks/cholesky_solve_cost, docs/performance.md, "Eighth pass").
void use_fewer_stored_zeros(cholmod_common& c) {
  c.zrelax[0] = 0.4, c.zrelax[1] = 0.05, c.zrelax[2] = 0.02;
}

void use_metis(cholmod_common& c) {
  use_fewer_stored_zeros(c);
  c.nmethods = 1;
  c.method[0].ordering = CHOLMOD_METIS;
  c.postorder = 1;
}

/// The permutation handed to cholmod_analyze_p (the grid's nested dissection), followed by
/// the postorder of its elimination tree, with as few stored zeros as under METIS (both are
/// nested-dissection factors).
void use_given_order(cholmod_common& c) {
  use_fewer_stored_zeros(c);
  c.nmethods = 1;
  c.method[0].ordering = CHOLMOD_GIVEN;
  c.postorder = 1;
}

/// True when `order` holds each of 0 .. n - 1 once.
bool is_permutation_of(const std::vector<int>& order, Eigen::Index n) {
  if (static_cast<Eigen::Index>(order.size()) != n) return false;
  std::vector<std::uint8_t> seen(order.size(), 0);
  for (const int k : order) {
    if (k < 0 || k >= n || seen[static_cast<std::size_t>(k)]) return false;
    seen[static_cast<std::size_t>(k)] = 1;
  }
  return true;
}

/// CHOLMOD's Cholesky (supernodal, or simplicial below simplicial_below) whose solves keep their
/// result and workspace between calls (cholmod_solve2): a repeated solve allocates nothing, where
/// cholmod_solve allocates and frees three dense blocks each time (benchmarks/step_allocations).
class KeptCholesky : public Eigen::CholmodSupernodalLLT<SparseMatrix, Eigen::Lower> {
 public:
  KeptCholesky() = default;
  KeptCholesky(const KeptCholesky&) = delete;
  KeptCholesky& operator=(const KeptCholesky&) = delete;
  ~KeptCholesky() {
    cholmod_free_dense(&x_, &cholmod());
    cholmod_free_dense(&y_, &cholmod());
    cholmod_free_dense(&e_, &cholmod());
  }
  /// x = A^-1 b; false when CHOLMOD fails (x unchanged). A supernodal factor is solved by our
  /// own substitution on the threads OpenMP has (solver/supernodal_solve.hpp: at 1e6 confined
  /// cells 0.080 s of CPU against CHOLMOD's 0.110 on one thread, docs/performance.md).
  bool solve_into(const Eigen::VectorXd& b, Eigen::VectorXd& x) {
    if (m_cholmodFactor != nullptr && info() == Eigen::Success && m_cholmodFactor->is_super &&
        m_cholmodFactor->is_ll && m_cholmodFactor->xtype == CHOLMOD_REAL &&
        m_cholmodFactor->itype == CHOLMOD_INT) {
      const SupernodalFactor f = supernodal_view();
      if (!substitution_)
        substitution_ = std::make_unique<SupernodalSolve>(f, omp_get_max_threads());
      x.resize(b.size());
      substitution_->solve(f, b.data(), x.data());
      return true;
    }
    if (!solve_dense(b.data(), b.rows(), 1)) return false;
    x = Eigen::Map<const Eigen::VectorXd>(static_cast<const double*>(x_->x), b.size());
    return true;
  }
  /// The symbolic analysis with a given fill-reducing order (entry k: the unknown eliminated
  /// k-th, a permutation of a's unknowns) in place of analyzePattern's own choice.
  void analyze_in_order(const SparseMatrix& a, const std::vector<int>& order) {
    if (m_cholmodFactor != nullptr) cholmod_free_factor(&m_cholmodFactor, &cholmod());
    cholmod_sparse view = Eigen::viewAsCholmod(a.selfadjointView<Eigen::Lower>());
    m_cholmodFactor =
        cholmod_analyze_p(&view, const_cast<int*>(order.data()), nullptr, 0, &cholmod());
    this->m_isInitialized = true;
    this->m_info = m_cholmodFactor != nullptr ? Eigen::Success : Eigen::InvalidInput;
    this->m_analysisIsOk = m_cholmodFactor != nullptr;
    this->m_factorizationIsOk = false;
  }
  /// X = A^-1 B, every column in one call: CHOLMOD's triangular solves take the columns of a
  /// dense right-hand side together (up to 4 a pass in the simplicial solve, a block in the
  /// supernodal one; CHOLMOD User Guide, cholmod_solve2; from memory), so the factor is read
  /// once for several columns. False when CHOLMOD fails (x unchanged).
  bool solve_columns_into(const Eigen::MatrixXd& b, Eigen::MatrixXd& x) {
    if (!solve_dense(b.data(), b.rows(), b.cols())) return false;
    x = Eigen::Map<const Eigen::MatrixXd>(static_cast<const double*>(x_->x), b.rows(), b.cols());
    return true;
  }

 private:
  SupernodalFactor supernodal_view() const {
    const cholmod_factor& l = *m_cholmodFactor;
    SupernodalFactor f;
    f.n = static_cast<int>(l.n);
    f.n_supernodes = static_cast<int>(l.nsuper);
    f.first_column = static_cast<const int*>(l.super);
    f.row_start = static_cast<const int*>(l.pi);
    f.value_start = static_cast<const int*>(l.px);
    f.rows = static_cast<const int*>(l.s);
    f.values = static_cast<const double*>(l.x);
    f.permutation = static_cast<const int*>(l.Perm);
    return f;
  }
  /// The solution of the rows x columns right-hand side b (column-major) into x_.
  bool solve_dense(const double* b, Eigen::Index rows, Eigen::Index columns) {
    if (m_cholmodFactor == nullptr || info() != Eigen::Success) return false;
    cholmod_dense rhs{};
    rhs.nrow = rhs.d = static_cast<std::size_t>(rows);
    rhs.ncol = static_cast<std::size_t>(columns);
    rhs.nzmax = rhs.nrow * rhs.ncol;
    rhs.x = const_cast<double*>(b);
    rhs.xtype = CHOLMOD_REAL;
    rhs.dtype = CHOLMOD_DOUBLE;
    return cholmod_solve2(CHOLMOD_A, m_cholmodFactor, &rhs, nullptr, &x_, nullptr, &y_, &e_,
                          &cholmod()) != 0;
  }

  std::unique_ptr<SupernodalSolve> substitution_;  ///< the plan, kept with the pattern
  cholmod_dense* x_ = nullptr;
  cholmod_dense* y_ = nullptr;
  cholmod_dense* e_ = nullptr;
};

/// UMFPACK's LU whose several right-hand sides are solved in parallel, one column per thread
/// at a time: UMFPACK has no multi-column solve, and umfpack_di_wsolve only reads the numeric
/// factorisation and works in the workspace it is given (no allocation), so each thread
/// keeps its own workspace (Wi: n integers, W: 5n doubles with iterative refinement, the
/// default; UMFPACK User Guide, umfpack_wsolve; from memory).
class KeptLU : public Eigen::UmfPackLU<SparseMatrix> {
 public:
  bool solve_columns_into(const Eigen::MatrixXd& b, Eigen::MatrixXd& x) {
    if (m_numeric == nullptr || info() != Eigen::Success) return false;
    const auto n = static_cast<std::size_t>(b.rows());
    const auto columns = static_cast<int>(b.cols());
    x.resize(b.rows(), b.cols());
    int failed = 0;
#pragma omp parallel if (columns > 1) reduction(+ : failed)
    {
      std::vector<int> wi(n);
      std::vector<double> w(5 * n);
#pragma omp for schedule(dynamic)
      for (int j = 0; j < columns; ++j)
        if (umfpack_di_wsolve(UMFPACK_A, mp_matrix.outerIndexPtr(), mp_matrix.innerIndexPtr(),
                              mp_matrix.valuePtr(), x.col(j).data(), b.col(j).data(), m_numeric,
                              m_control.data(), nullptr, wi.data(), w.data()) != UMFPACK_OK)
          ++failed;
    }
    return failed == 0;
  }
};

/// The fill-reducing ordering of a factorisation of n unknowns, set before its analysis: the
/// one asked for, or under `automatic` METIS from metis_ordering_from unknowns and CHOLMOD's
/// own choice below. UMFPACK keeps its own.
void configure_cholmod(cholmod_common& c, CholmodOrdering ordering, Eigen::Index n, bool given) {
  if (n < simplicial_below) use_simplicial(c);
  if (given) return use_given_order(c);
  if (ordering == CholmodOrdering::automatic && n < metis_ordering_from) return;
  use_metis(c);
  if (ordering == CholmodOrdering::amd) c.method[0].ordering = CHOLMOD_AMD;
}

template <class Factorization>
void configure(Factorization&, CholmodOrdering, Eigen::Index, bool) {}

template <>
void configure(KeptCholesky& f, CholmodOrdering ordering, Eigen::Index n, bool given) {
  configure_cholmod(f.cholmod(), ordering, n, given);
}

/// Symbolic analysis on the first call, numeric factorisation only when values changed.
template <class Factorization>
class DirectSolver final : public LinearSolver {
 public:
  DirectSolver(std::string name, CholmodOrdering ordering, std::vector<int> order = {})
      : name_(std::move(name)), ordering_(ordering), order_(std::move(order)) {}
  bool solve(const SparseMatrix& a, const Eigen::VectorXd& b, Eigen::VectorXd& x) override {
    if (!factorize(a)) return false;
    if constexpr (requires { factorization_.solve_into(b, x); }) {
      return factorization_.solve_into(b, x) && x.allFinite();
    } else {
      x = factorization_.solve(b);
      return factorization_.info() == Eigen::Success && x.allFinite();
    }
  }
  bool solve_columns(const SparseMatrix& a, const Eigen::MatrixXd& b, Eigen::MatrixXd& x) override {
    if (!factorize(a)) return false;
    return factorization_.solve_columns_into(b, x) && x.allFinite();
  }
  std::string name() const override { return name_; }
  bool exact() const override { return true; }

 private:
  /// Symbolic analysis on the first call, numeric factorisation when the values changed.
  bool factorize(const SparseMatrix& a) {
    set_blas_threads(1);
    if (!analysed_) {
      bool given = false;
      if constexpr (requires { factorization_.analyze_in_order(a, order_); })
        given = is_permutation_of(order_, a.rows());
      configure(factorization_, ordering_, a.rows(), given);
      if constexpr (requires { factorization_.analyze_in_order(a, order_); })
        if (given) factorization_.analyze_in_order(a, order_);
      if (!given) factorization_.analyzePattern(a);
      analysed_ = true;
      order_ = {};
      if (a.rows() >= simplicial_below) return_freed_memory();
    }
    const bool changed = values_changed(a);
    if (changed) {
      const SerialRegions serial;
      factorization_.factorize(a);
    }
    count_factorization(!changed);
    if (factorization_.info() != Eigen::Success) return false;
    count_iterations(0);
    return true;
  }

  std::string name_;
  CholmodOrdering ordering_;
  std::vector<int> order_;  ///< the given fill-reducing order, until the analysis
  Factorization factorization_;
  bool analysed_ = false;
};

/// Preconditioner for Eigen's BiCGSTAB: solves with a Cholesky factor held elsewhere
/// (compute() does nothing: the owner decides when to refactorise).
class HeldCholesky {
 public:
  using Factor = KeptCholesky;
  HeldCholesky() = default;
  void hold(const Factor* f) { factor_ = f; }
  template <class M>
  HeldCholesky& analyzePattern(const M&) {
    return *this;
  }
  template <class M>
  HeldCholesky& factorize(const M&) {
    return *this;
  }
  template <class M>
  HeldCholesky& compute(const M&) {
    return *this;
  }
  template <class V>
  Eigen::VectorXd solve(const V& b) const {
    return factor_->solve(Eigen::VectorXd(b));
  }
  Eigen::ComputationInfo info() const { return factor_ ? factor_->info() : Eigen::Success; }

 private:
  const Factor* factor_ = nullptr;
};

/// BiCGSTAB on the non-symmetric Jacobian J of upstream-weighted (water-table, switching)
/// models, preconditioned by a Cholesky factorisation of the fixed-thickness (Picard) matrix P
/// recovered from J itself. On a face between cells i and j with i upstream, J holds -C in
/// row i and -(C + C' dh) in row j (C' dh: the derivative of the upstream thickness), and the
/// diagonal of i holds C + C' dh. P keeps -C = max(J_ij, J_ji) on both sides and removes C' dh
/// from the upstream diagonal: it is the conductance-plus-storage matrix, a symmetric M-matrix,
/// diagonally dominant because J is column-diagonally dominant (mass conservation), so
/// positive definite once storage or a fixed head is present. The symmetric part (J + J^T)/2
/// is not: on two cells with storage s it has determinant s (2C + C'dh + s) - (C'dh)^2 / 4,
/// negative where the water table is steep over a thin saturated thickness and the storage
/// is confined-small. Preconditioning Newton's system with the Picard linearisation: Knoll and
/// Keyes, J. Comput. Phys. 193 (2004) 357-397, section 3. The factorisation is kept across
/// Newton iterations and steps while the iterations stay few, and redone when they grow: one
/// numeric factorisation serves many solves.
class PicardKrylov final : public LinearSolver {
 public:
  PicardKrylov() { krylov_.setTolerance(iterative_tolerance); }
  bool solve(const SparseMatrix& a, const Eigen::VectorXd& b, Eigen::VectorXd& x) override {
    set_blas_threads(1);
    if (!analysed_) {
      mirror_ = transpose_positions(a);
      picard_ = a;
      configure(factor_, CholmodOrdering::automatic, a.rows(), false);
      factor_.analyzePattern(picard_);
      krylov_.setMaxIterations(max_iterations);
      analysed_ = true;
      refactor_ = true;
    }
    if (x.size() != b.size() || !x.allFinite()) x.setZero(b.size());
    // The previous solution starts the iteration only where it is closer than zero.
    if ((b - a * x).squaredNorm() >= b.squaredNorm()) x.setZero();
    for (int attempt = 0; attempt < 2; ++attempt) {
      if (refactor_ || attempt > 0) {
        if (!refactorize(a)) return false;
      } else {
        count_factorization(true);
      }
      krylov_.compute(a);
      krylov_.preconditioner().hold(&factor_);
      Eigen::VectorXd y = krylov_.solveWithGuess(b, x);
      const int used = static_cast<int>(krylov_.iterations());
      if (krylov_.info() == Eigen::Success && y.allFinite()) {
        x = std::move(y);
        count_iterations(used);
        refactor_ = used > refactor_after;
        return true;
      }
      count_iterations(used);
    }
    return false;
  }
  std::string name() const override { return "bicgstab (Cholesky of the fixed-thickness matrix)"; }
  void set_relative_tolerance(double t) override { krylov_.setTolerance(t); }

 private:
  /// Iterations beyond which the factorisation is renewed before the next solve; a solve
  /// with the factor reused costs about one triangular solve pair per half iteration, a new
  /// numeric factorisation about as much as 15 to 20 of them at 1e6 cells (measured,
  /// docs/performance.md).
  static constexpr int refactor_after = 12;
  static constexpr int max_iterations = 400;

  /// For every stored entry (r, c) the position of (c, r); the 5-point pattern is symmetric.
  static std::vector<int> transpose_positions(const SparseMatrix& a) {
    std::vector<int> mirror(static_cast<std::size_t>(a.nonZeros()), -1);
    for (int c = 0; c < a.outerSize(); ++c)
      for (int p = a.outerIndexPtr()[c]; p < a.outerIndexPtr()[c + 1]; ++p) {
        const int r = a.innerIndexPtr()[p];
        for (int q = a.outerIndexPtr()[r]; q < a.outerIndexPtr()[r + 1]; ++q)
          if (a.innerIndexPtr()[q] == c) mirror[static_cast<std::size_t>(p)] = q;
      }
    return mirror;
  }

  bool refactorize(const SparseMatrix& a) {
    const double* v = a.valuePtr();
    const int* outer = a.outerIndexPtr();
    const int* inner = a.innerIndexPtr();
    double* s = picard_.valuePtr();
    const int n = static_cast<int>(a.outerSize());
    // Column c holds the entries (r, c): the derivatives of every residual by head c. Each
    // column writes only its own entries, so the columns run in parallel.
#pragma omp parallel for schedule(static)
    for (int c = 0; c < n; ++c) {
      double diagonal = 0.0, removed = 0.0;
      int diagonal_at = -1;
      for (int p = outer[c]; p < outer[c + 1]; ++p) {
        if (inner[p] == c) {
          diagonal = v[p];
          diagonal_at = p;
          continue;
        }
        const int q = mirror_[static_cast<std::size_t>(p)];
        const double kept = q >= 0 ? std::min(0.0, std::max(v[p], v[q])) : std::min(0.0, v[p]);
        removed += kept - v[p];  // C' dh where c is upstream, 0 where it is downstream
        s[p] = kept;
      }
      if (diagonal_at >= 0) s[diagonal_at] = diagonal - removed;
    }
    {
      const SerialRegions serial;
      factor_.factorize(picard_);
    }
    count_factorization(false);
    refactor_ = false;
    return factor_.info() == Eigen::Success;
  }

  HeldCholesky::Factor factor_;
  Eigen::BiCGSTAB<SparseMatrix, HeldCholesky> krylov_;
  SparseMatrix picard_;
  std::vector<int> mirror_;
  bool analysed_ = false;
  bool refactor_ = true;
};

}  // namespace

std::unique_ptr<LinearSolver> make_picard_krylov_solver() {
  return std::make_unique<PicardKrylov>();
}

std::unique_ptr<LinearSolver> make_cholmod_solver() {
  return make_cholmod_solver(CholmodOrdering::automatic);
}

std::unique_ptr<LinearSolver> make_cholmod_solver(CholmodOrdering ordering) {
  const char* name = ordering == CholmodOrdering::metis ? "cholmod (METIS)"
                     : ordering == CholmodOrdering::amd ? "cholmod (AMD)"
                                                        : "cholmod";
  return std::make_unique<DirectSolver<KeptCholesky>>(name, ordering);
}

std::unique_ptr<LinearSolver> make_cholmod_solver(const StructuredUnknowns& grid) {
  return std::make_unique<DirectSolver<KeptCholesky>>("cholmod", CholmodOrdering::automatic,
                                                      grid_elimination_order(grid));
}

std::vector<int> grid_elimination_order(const StructuredUnknowns& grid) {
  const std::size_t cells = grid.unknown_of_cell.size();
  if (grid.n_rows <= 0 || grid.n_cols <= 0 ||
      cells != static_cast<std::size_t>(grid.n_rows) * static_cast<std::size_t>(grid.n_cols))
    return {};
  std::vector<std::uint8_t> included(cells);
  for (std::size_t i = 0; i < cells; ++i) included[i] = grid.unknown_of_cell[i] >= 0 ? 1 : 0;
  std::vector<int> order = nested_dissection_order(grid.n_rows, grid.n_cols, included);
  for (int& k : order) k = grid.unknown_of_cell[static_cast<std::size_t>(k)];
  if (order.empty() || !is_permutation_of(order, static_cast<Eigen::Index>(order.size())))
    return {};
  return order;
}

CholeskyAnalysis analyse_cholesky(const SparseMatrix& a, CholmodOrdering ordering,
                                  std::span<const int> given, bool factorize) {
  using Clock = std::chrono::steady_clock;
  const auto seconds_since = [](Clock::time_point t0) {
    return std::chrono::duration<double>(Clock::now() - t0).count();
  };
  set_blas_threads(1);
  CholeskyAnalysis result;
  const std::vector<int> order(given.begin(), given.end());
  const bool use_given = !order.empty();
  if (use_given && !is_permutation_of(order, a.rows())) return result;
  cholmod_common c;
  cholmod_start(&c);
  configure_cholmod(c, ordering, a.rows(), use_given);
  cholmod_sparse view = Eigen::viewAsCholmod(a.selfadjointView<Eigen::Lower>());
  const auto t0 = Clock::now();
  cholmod_factor* l = use_given
                          ? cholmod_analyze_p(&view, const_cast<int*>(order.data()), nullptr, 0, &c)
                          : cholmod_analyze(&view, &c);
  result.analyse_seconds = seconds_since(t0);
  if (l != nullptr) {
    result.ok = true;
    result.nonzeros = c.lnz;
    result.flops = c.fl;
    result.stored = l->is_super ? static_cast<double>(l->xsize) : c.lnz;
    if (factorize) {
      const auto t1 = Clock::now();
      {
        const SerialRegions serial;
        result.ok = cholmod_factorize(&view, l, &c) != 0 && c.status == CHOLMOD_OK;
      }
      result.factorize_seconds = seconds_since(t1);
      cholmod_dense* b = cholmod_ones(view.nrow, 1, CHOLMOD_REAL, &c);
      cholmod_dense* x = result.ok ? cholmod_solve(CHOLMOD_A, l, b, &c) : nullptr;
      if (x != nullptr) {
        const Eigen::Map<const Eigen::VectorXd> xv(static_cast<const double*>(x->x), a.rows());
        result.residual = (a * xv - Eigen::VectorXd::Ones(a.rows())).norm() /
                          std::sqrt(static_cast<double>(a.rows()));
      } else {
        result.ok = false;
      }
      cholmod_free_dense(&x, &c);
      cholmod_free_dense(&b, &c);
    }
    cholmod_free_factor(&l, &c);
  }
  cholmod_finish(&c);
  return result;
}

std::unique_ptr<LinearSolver> make_umfpack_solver() {
  return std::make_unique<DirectSolver<KeptLU>>("umfpack", CholmodOrdering::automatic);
}

}  // namespace aquiledger
