// Time control: drying and rewetting, non-convergence reporting, linear backends,
// factorisation reuse.
#include <Eigen/SparseCholesky>
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>
#include <utility>

#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"
#include "solver/newton_iteration.hpp"
#include "solver/newton_solver.hpp"
#include "solver/saturation.hpp"
#include "solver/time_steps.hpp"
#include "stress_test_models.hpp"
#include "support/budget_observer.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

using test::drying_model;

TEST_CASE("a cell pumped dry wets again under recharge", "[time_control]") {
  const Model m = drying_model();
  test::BudgetObserver obs(m);
  const RunResult r = run_simulation(m, obs);
  REQUIRE(r.converged);  // a drained cell never makes the run fail (model format)
  const auto centre = static_cast<std::size_t>(m.grid.cell(2, 2).value);
  const std::size_t end_of_pumping = 19;
  REQUIRE(obs.steps[end_of_pumping].period == 0);
  // The whole aquifer holds Sy A h = 0.1 * 2500 * 2 = 500 m3 < 20 m3/d * 20 d: the well
  // must fall short, and the reported shortfall plus the delivered rate is the asked rate.
  const WaterBudget& dry = obs.budgets[end_of_pumping];
  std::printf("drying: centre head %.4f m, delivered %.4f, shortfall %.4f m3/d\n",
              obs.heads[end_of_pumping][centre], dry[BudgetComponent::well].out,
              dry.well_shortfall);
  CHECK(dry.well_shortfall > 10.0);
  CHECK(dry[BudgetComponent::well].out + dry.well_shortfall == Approx(20.0).epsilon(1e-9));
  CHECK(obs.heads[end_of_pumping][centre] < 0.1);  // within the reduction length of the base
  // Recharge 0.01 m/d for 40 d refills Sy-storage by 4 m of head at most; the centre wets.
  CHECK(obs.last_head[centre] > 1.0);
  CHECK(obs.max_imbalance < 1e-6);
}

TEST_CASE("a dry cell wets from a wet neighbour alone, with either face thickness",
          "[time_control]") {
  // Five dry water-table cells (head at the base) beside a canal held 3 m above it, no
  // recharge: water can only enter across the faces, so each cell wets from its upstream
  // neighbour. The filling strip's time scale is Sy L^2 / T ~ 0.1 * 50^2 / 30 ~ 8 d; after
  // 40 d every head is within a few centimetres of the canal's (the only steady state of a
  // closed strip with one held head).
  for (FaceThickness scheme : {FaceThickness::mean, FaceThickness::upstream}) {
    test::AquiferSpec a;
    a.condition = Condition::water_table;
    a.k = 10.0;
    a.specific_yield = 0.1;
    a.initial_head = 0.0;
    Model m = test::make_model(std::vector<double>(6, 10.0), {10.0}, a);
    m.solver.face_thickness = scheme;
    test::add_fixed_head(m, {m.grid.cell(0, 0)}, 3.0);
    test::add_period(m, 40.0, 30, 1.1);
    test::BudgetObserver obs(m);
    const RunResult r = run_simulation(m, obs);
    INFO("scheme " << (scheme == FaceThickness::mean ? "mean" : "upstream") << ": " << r.failure);
    REQUIRE(r.converged);
    for (int col = 1; col < 6; ++col) {
      CHECK(obs.last_head[static_cast<std::size_t>(col)] > 2.9);
      CHECK(obs.last_head[static_cast<std::size_t>(col)] < 3.0);
    }
  }
}

TEST_CASE("an aquifer left to come to rest converges at every step", "[time_control]") {
  // A strip beside a canal with nothing else acting relaxes to the canal's head; once every
  // flow and storage change is at rounding level the budget test can only ask for the
  // floor that quantised heads leave (rounding_floor, cell_balance.hpp). Before that floor
  // such a run stopped with "Newton did not converge" though nothing was wrong. Both
  // conditions; the diffusion time is 8 d (water table) and 0.03 d (confined), the period
  // 1000 d.
  struct Heads final : SimulationObserver {
    void initial_state(std::span<const double>) override {}
    void step_done(const StepInfo&, std::span<const double>, std::span<const double> h) override {
      last.assign(h.begin(), h.end());
      ++steps;
    }
    void period_done(std::size_t) override {}
    std::vector<double> last;
    int steps = 0;
  };
  for (Condition c : {Condition::water_table, Condition::confined})
    for (FaceThickness scheme : {FaceThickness::mean, FaceThickness::upstream}) {
      test::AquiferSpec a;
      a.condition = c;
      a.k = 10.0;
      a.specific_yield = 0.1;
      a.specific_storage = 1e-4;
      a.initial_head = c == Condition::confined ? 10.0 : 0.0;
      const double canal = c == Condition::confined ? 13.0 : 3.0;
      Model m = test::make_model(std::vector<double>(6, 10.0), {10.0}, a);
      m.solver.face_thickness = scheme;
      test::add_fixed_head(m, {m.grid.cell(0, 0)}, canal);
      test::add_period(m, 1000.0, 40, 1.15);
      Heads obs;
      const RunResult r = run_simulation(m, obs);
      INFO(r.failure);
      REQUIRE(r.converged);
      CHECK(obs.steps == 40);
      for (double h : obs.last) CHECK(h == Approx(canal).margin(1e-9));
    }
}

TEST_CASE("a thin cell drains to its base and no further, with either face thickness",
          "[time_control]") {
  // Two closed cells: A holds 0.5 m of water on a base 5 m up, B 1 m on a base at 0. A
  // drains into B until it is empty and must stop there: the face takes A's vanishing
  // thickness (upstream) or a blend bounded by 4 times it (mean), so the implicit step
  // cannot take A below its base. Mass balance: B gains what A loses, Sy A (5.5 - h_A).
  for (FaceThickness scheme : {FaceThickness::mean, FaceThickness::upstream}) {
    test::AquiferSpec a;
    a.condition = Condition::water_table;
    a.k = 20.0;
    a.specific_yield = 0.15;
    Model m = test::make_model({10.0, 10.0}, {10.0}, a);
    m.solver.face_thickness = scheme;
    m.aquifer.bottom[0] = 5.0;
    m.initial.head = {5.5, 1.0};
    test::add_period(m, 200.0, 30, 1.2);
    test::BudgetObserver obs(m);
    REQUIRE(run_simulation(m, obs).converged);
    double lowest = obs.initial[0];
    for (const auto& h : obs.heads) lowest = std::min(lowest, h[0]);
    INFO("scheme " << (scheme == FaceThickness::mean ? "mean" : "upstream") << ", lowest head "
                   << lowest);
    CHECK(lowest >= 5.0 - m.solver.head_tolerance);
    CHECK(obs.last_head[0] < 5.0 + 0.05);  // nearly empty after 200 d
    CHECK(obs.last_head[1] - 1.0 == Approx(5.5 - obs.last_head[0]).epsilon(1e-6));
  }
}

TEST_CASE("non-convergence is a status with a named place, steps kept", "[time_control]") {
  Model m = drying_model();
  m.periods[0].steps = 3;
  m.wells[0].rate = PeriodValues({{0.0}, {20.0}}, {0, 1});  // quiet first period
  m.recharges.clear();
  m.solver.max_iterations = 1;
  m.solver.max_cutbacks = 2;
  test::BudgetObserver obs(m);
  const RunResult r = run_simulation(m, obs);
  INFO(r.failure);
  CHECK_FALSE(r.converged);
  CHECK(r.failed_period == 1);
  CHECK(r.failed_step == 1);
  CHECK(r.failure.find("period 2") != std::string::npos);
  CHECK(r.failure.find("step 1") != std::string::npos);
  CHECK(r.failure.find("row 3, col 3") != std::string::npos);  // the pumped cell, 1-based
  CHECK(r.cutbacks == 2);
  // Every step of the quiet period was seen, and no failed one.
  CHECK(obs.steps.size() == 3);
  CHECK(obs.periods_done.size() == 1);
}

/// Calls check(system, backends) with the drying model's system, confined and water table,
/// assembled at a non-uniform state (so upstream choices differ across faces), and every
/// backend that solves it.
template <class Check>
void with_each_drying_system(Check&& check) {
  for (Condition c : {Condition::confined, Condition::water_table}) {
    Model m = drying_model();
    m.aquifer.condition = c;
    if (c == Condition::confined) m.aquifer.specific_yield = std::vector<double>{};
    const SystemLayout layout = make_system_layout(m);
    FlowSystem sys(m, layout);
    std::vector<double> head_old = m.initial.head.values();
    sys.set_step(0, false, 0.5, head_old);
    std::vector<double> head = m.initial.head.values();
    head[7] -= 0.3;
    sys.assemble(head);
    std::vector<std::unique_ptr<LinearSolver>> solvers;
    solvers.push_back(make_umfpack_solver());
    solvers.push_back(make_bicgstab_solver());
    if (sys.symmetric())
      solvers.push_back(make_cholmod_solver()), solvers.push_back(make_pcg_solver());
    check(sys, solvers);
  }
}

TEST_CASE("linear backends agree on the same system", "[linear]") {
  with_each_drying_system([](FlowSystem& sys, std::vector<std::unique_ptr<LinearSolver>>& solvers) {
    const Eigen::VectorXd b = sys.residual();
    Eigen::VectorXd reference;
    for (auto& s : solvers) {
      Eigen::VectorXd x = Eigen::VectorXd::Zero(b.size());
      REQUIRE(s->solve(sys.matrix(), b, x));
      // Each must solve the system to the iterative tolerance (1e-12 relative residual).
      CHECK((sys.matrix() * x - b).norm() <= 1e-10 * b.norm());
      if (reference.size() == 0)
        reference = x;
      else
        CHECK((x - reference).cwiseAbs().maxCoeff() <= 1e-8 * reference.cwiseAbs().maxCoeff());
    }
  });
}

TEST_CASE("several right-hand sides solved together equal one solve each", "[linear]") {
  // The sensitivity columns of independent parameters go through solve_columns: the direct
  // backends solve them together with one factorisation (CHOLMOD's multi-column solve,
  // UMFPACK's columns in parallel), the others one solve() per column. Checked against the
  // residual of each column (the definition of a solution) and against one solve each.
  with_each_drying_system([](FlowSystem& sys, std::vector<std::unique_ptr<LinearSolver>>& solvers) {
    const Eigen::Index n = sys.residual().size();
    Eigen::MatrixXd b(n, 5);
    for (Eigen::Index j = 0; j < b.cols(); ++j)
      for (Eigen::Index i = 0; i < n; ++i)
        b(i, j) = std::sin(1.0 + static_cast<double>(i * (j + 1))) * static_cast<double>(j + 1);
    for (auto& s : solvers) {
      INFO(s->name());
      Eigen::MatrixXd x = Eigen::MatrixXd::Zero(n, b.cols());
      REQUIRE(s->solve_columns(sys.matrix(), b, x));
      if (s->exact()) CHECK(s->factorizations() == 1);  // one factorisation for every column
      for (Eigen::Index j = 0; j < b.cols(); ++j) {
        const Eigen::VectorXd bj = b.col(j);
        CHECK((sys.matrix() * x.col(j) - bj).norm() <= 1e-10 * bj.norm());
        Eigen::VectorXd one = Eigen::VectorXd::Zero(n);
        REQUIRE(s->solve(sys.matrix(), bj, one));
        CHECK((x.col(j) - one).cwiseAbs().maxCoeff() <= 1e-8 * one.cwiseAbs().maxCoeff());
      }
    }
  });
}

TEST_CASE("linear = auto picks by symmetry and size", "[linear]") {
  CHECK(choose_linear_solver(LinearChoice::automatic, true, 1000).solver->name() == "cholmod");
  // A symmetric system is factorised while its factor fits in the memory available.
  const double gib = 1024.0 * 1024.0 * 1024.0;
  CHECK(choose_linear_solver(LinearChoice::automatic, true, 10'000'000, 20 * gib).solver->name() ==
        "cholmod");
  CHECK(choose_linear_solver(LinearChoice::automatic, true, 10'000'000, 8 * gib).solver->name() ==
        "pcg");
  CHECK(choose_linear_solver(LinearChoice::automatic, true, 100'000, 0.0).solver->name() ==
        "cholmod");
  CHECK(choose_linear_solver(LinearChoice::automatic, true, cholmod_auto_limit + 1, 0.0)
            .solver->name() == "pcg");
  CHECK(choose_linear_solver(LinearChoice::automatic, false, 1000).solver->name() == "umfpack");
  CHECK(
      choose_linear_solver(LinearChoice::automatic, false, umfpack_auto_limit + 1).solver->name() ==
      "bicgstab (Cholesky of the fixed-thickness matrix)");
  CHECK(choose_linear_solver(LinearChoice::pcg, false, 10).solver->name() == "bicgstab");
}

TEST_CASE("confined model with constant dt factorises once; backends give the same run",
          "[linear]") {
  test::AquiferSpec a;
  a.initial_head = 30.0;
  Model m = test::make_model(std::vector<double>(30, 10.0), std::vector<double>(20, 10.0), a);
  test::add_period(m, 5.0, 10);
  test::add_well(m, 10, 15, {50.0});
  test::add_fixed_head(m, test::column_cells(m, 0), 30.0);
  std::vector<std::vector<double>> ends;
  for (LinearChoice choice : {LinearChoice::direct, LinearChoice::pcg, LinearChoice::bicgstab}) {
    m.solver.linear = choice;
    test::BudgetObserver obs(m);
    const RunResult r = run_simulation(m, obs);
    REQUIRE(r.converged);
    // Same dt, same stresses, linear system: one matrix for the whole run.
    CHECK(r.factorizations == 1);
    CHECK(r.factorization_reuses == r.newton_iterations - 1);
    ends.push_back(obs.last_head);
  }
  for (std::size_t k = 1; k < ends.size(); ++k)
    for (std::size_t i = 0; i < ends[0].size(); ++i)
      CHECK(ends[k][i] == Approx(ends[0][i]).margin(1e-7));
}

namespace {

/// A matrix shaped like an upstream-weighted Jacobian on an nr x nc grid: `storage` on the
/// diagonal, and on the face from each cell i to its east and north neighbour j the
/// conductance C with i upstream, so that the thickness-derivative term a = C' dh sits in
/// column i (row i's diagonal and row j's entry). face(r, c, east) returns {C, a}.
template <class Face>
SparseMatrix upstream_weighted_matrix(int nr, int nc, double storage, Face face) {
  std::vector<Eigen::Triplet<double>> t;
  auto id = [&](int r, int c) { return r * nc + c; };
  for (int r = 0; r < nr; ++r)
    for (int c = 0; c < nc; ++c) {
      const int i = id(r, c);
      t.emplace_back(i, i, storage);
      auto add = [&](int j, std::pair<double, double> f) {
        const auto [conductance, skew] = f;
        t.emplace_back(i, i, conductance + skew);
        t.emplace_back(j, j, conductance);
        t.emplace_back(i, j, -conductance);
        t.emplace_back(j, i, -conductance - skew);
      };
      if (c + 1 < nc) add(id(r, c + 1), face(r, c, true));
      if (r + 1 < nr) add(id(r + 1, c), face(r, c, false));
    }
  SparseMatrix a(nr * nc, nr * nc);
  a.setFromTriplets(t.begin(), t.end());
  a.makeCompressed();
  return a;
}

}  // namespace

TEST_CASE(
    "BiCGSTAB with a Cholesky factor of the fixed-thickness matrix solves upstream-weighted "
    "systems",
    "[linear]") {
  // A column-diagonally-dominant M-matrix like an upstream-weighted Jacobian: 5-point
  // conductances C on a 60 x 50 grid, plus on each face the thickness-derivative term
  // C' dh (here 5 % of C) on the upstream cell's column, and a storage diagonal. The check is
  // the defining equation itself: the relative residual |A x - b| / |b| must reach the
  // iterative tolerance (1e-12), and x must agree with LU (UMFPACK) to 1e-9 relative.
  const int nr = 60, nc = 50, n = nr * nc;
  const SparseMatrix a = upstream_weighted_matrix(nr, nc, 0.01, [](int r, int c, bool east) {
    const double conductance =
        east ? 1.0 + 0.5 * std::sin(0.3 * r + 0.1 * c) : 1.0 + 0.5 * std::cos(0.2 * r - 0.4 * c);
    return std::pair{conductance, 0.05 * conductance};  // C' dh: 5 % of C
  });
  Eigen::VectorXd b(n);
  for (int i = 0; i < n; ++i) b[i] = std::sin(0.01 * i) + 0.1;
  auto krylov = make_picard_krylov_solver();
  auto lu = make_umfpack_solver();
  Eigen::VectorXd x = Eigen::VectorXd::Zero(n), y = Eigen::VectorXd::Zero(n);
  REQUIRE(krylov->solve(a, b, x));
  REQUIRE(lu->solve(a, b, y));
  CHECK((a * x - b).norm() / b.norm() < 1e-11);
  CHECK((x - y).norm() / y.norm() < 1e-9);
  // A preconditioner this close to the matrix converges in tens of iterations, not hundreds
  // (common practice).
  CHECK(krylov->last_iterations() < 40);
  // A second solve with the same matrix reuses the factorisation.
  Eigen::VectorXd x2 = Eigen::VectorXd::Zero(n);
  REQUIRE(krylov->solve(a, 2.0 * b, x2));
  CHECK(krylov->factorizations() == 1);
  CHECK((x2 - 2.0 * y).norm() / (2.0 * y.norm()) < 1e-9);
}

TEST_CASE("The fixed-thickness preconditioner holds where the symmetric part is indefinite",
          "[linear]") {
  // Two cells with storage s, conductance C and an upstream thickness derivative term a = C'dh:
  // J = [[C + a + s, -C], [-(C + a), C + s]]. Its symmetric part has determinant
  // s (2C + a + s) - a^2 / 4 (Sylvester's criterion: positive definite only if positive), so
  // with C = 1, a = 0.2 (a head drop across the face of a fifth of the saturated thickness),
  // s = 1e-4 it is indefinite and has no Cholesky factor, while J is a
  // non-singular M-matrix. The preconditioner's matrix, [[C + s, -C], [-C, C + s]], is positive
  // definite; the check is the defining equation J x = b (residual) and LU (UMFPACK) agreement.
  // The same pattern repeated over a 40 x 40 grid of such faces, with tiny storage: a steep
  // water table over thin saturated thickness beside confined-small storage.
  const double conductance = 1.0, skew = 0.2, storage = 1e-4;
  {
    const double det = storage * (2 * conductance + skew + storage) - skew * skew / 4;
    REQUIRE(det < 0);
    SparseMatrix sym(2, 2);
    std::vector<Eigen::Triplet<double>> t{{0, 0, conductance + skew + storage},
                                          {1, 1, conductance + storage},
                                          {0, 1, -conductance - skew / 2},
                                          {1, 0, -conductance - skew / 2}};
    sym.setFromTriplets(t.begin(), t.end());
    Eigen::SimplicialLLT<SparseMatrix> llt(sym);
    CHECK(llt.info() != Eigen::Success);
  }
  const int nr = 40, nc = 40, n = nr * nc;
  const SparseMatrix a = upstream_weighted_matrix(nr, nc, storage, [&](int r, int c, bool east) {
    const double k = 1.0 + 0.5 * std::sin(0.3 * r + 0.2 * c);
    return std::pair{k, (east ? 1.0 : 0.2) * skew * k};
  });
  SparseMatrix half = 0.5 * (a + SparseMatrix(a.transpose()));
  Eigen::SimplicialLLT<SparseMatrix> llt(half);
  CHECK(llt.info() != Eigen::Success);  // the symmetric part is indefinite here too
  Eigen::VectorXd b(n);
  for (int i = 0; i < n; ++i) b[i] = std::cos(0.02 * i);
  auto krylov = make_picard_krylov_solver();
  auto lu = make_umfpack_solver();
  Eigen::VectorXd x = Eigen::VectorXd::Zero(n), y = Eigen::VectorXd::Zero(n);
  REQUIRE(krylov->solve(a, b, x));
  REQUIRE(lu->solve(a, b, y));
  INFO("relative residual " << (a * x - b).norm() / b.norm() << " after "
                            << krylov->last_iterations());
  CHECK((a * x - b).norm() / b.norm() < 1e-11);
  CHECK((x - y).norm() / y.norm() < 1e-9);
  // A preconditioner this close to the matrix converges in tens of iterations, not hundreds
  // (common practice).
  CHECK(krylov->last_iterations() < 40);
}

TEST_CASE("Newton with the fixed-thickness preconditioned BiCGSTAB reaches the LU solution",
          "[linear]") {
  // A switching aquifer whose pumped cells fall below the confining top (steep cone, thin
  // saturated thickness beside confined-small storage: the regime where the symmetric part
  // can be indefinite). Each step is solved by Newton twice from the same state, with LU
  // (UMFPACK: exact solves) and with BiCGSTAB + Cholesky of the fixed-thickness matrix (inexact
  // solves, Eisenstat-Walker forcing). Both are asked to converge far below the comparison (head
  // change 1e-10 m, cell imbalance 1e-10 of the throughflow), so the defining equation R(h) = 0 is
  // met by both and their heads must agree to 1e-7 m; the step budget closes in both (the residual
  // test).
  test::AquiferSpec a;
  a.condition = Condition::switching;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 5.0;
  a.specific_yield = 0.15;
  a.specific_storage = 1e-5;
  a.initial_head = 10.5;
  Model m = test::make_model(std::vector<double>(24, 20.0), std::vector<double>(20, 20.0), a);
  test::add_period(m, 2.0, 6, 1.3);
  test::add_well(m, 10, 12, {400.0});
  test::add_fixed_head(m, test::column_cells(m, 0), 10.5);
  const SystemLayout layout = make_system_layout(m);
  FlowSystem sys(m, layout);
  NewtonSettings settings;
  settings.head_tolerance = 1e-10;
  settings.flow_tolerance = 1e-10;
  auto lu = make_umfpack_solver();
  auto krylov = make_picard_krylov_solver();
  std::vector<double> head = m.initial.head.values();
  const std::vector<double> ends = step_end_times(m.periods[0], 0.0);
  int below_top = 0;
  for (std::size_t step = 0; step < ends.size(); ++step) {
    const double dt = ends[step] - (step > 0 ? ends[step - 1] : 0.0);
    const std::vector<double> head_old = head;
    std::vector<double> by_lu = head_old, by_krylov = head_old;
    NewtonWorkspace w1, w2;
    sys.set_step(0, false, dt, head_old);
    const NewtonResult r1 = solve_newton(sys, *lu, settings, by_lu, w1);
    sys.set_step(0, false, dt, head_old);
    const NewtonResult r2 = solve_newton(sys, *krylov, settings, by_krylov, w2);
    REQUIRE(r1.converged);
    REQUIRE(r2.converged);
    double worst = 0.0;
    for (std::size_t i = 0; i < head.size(); ++i)
      worst = std::max(worst, std::abs(by_lu[i] - by_krylov[i]));
    INFO("step " << step << ": largest head difference " << worst << " m");
    CHECK(worst <= 1e-7);
    CHECK(r2.sum_imbalance <= 1e-10);
    head = by_lu;
    below_top = 0;
    for (double h : head) below_top += h < a.top;
  }
  CHECK(below_top > 0);  // the cone did cross the top: switching cells were exercised
}

TEST_CASE("The forcing term follows Eisenstat and Walker's choice 2 within our bounds",
          "[linear]") {
  // Eisenstat and Walker, SIAM J. Sci. Comput. 17 (1996) 16-32, choice 2 with gamma = 0.9,
  // alpha = 2: eta_k = 0.9 (|F_k| / |F_k-1|)^2, raised to 0.9 eta_k-1^2 when that exceeds
  // 0.1. Our bounds (solver/newton_iteration.hpp): the first is 0.1, none above 0.1, none
  // below what the budget test needs, 1e-3 flow_tolerance throughflow / sqrt(n) / |F_k|.
  ForcingTerm f;
  // No throughflow given: only the published sequence and the upper bound act.
  CHECK(f.next(1.0, 0.0, 1e-6, 0) == Approx(0.1));
  CHECK(f.next(0.1, 0.0, 1e-6, 0) == Approx(0.9 * 0.01));
  CHECK(f.next(1e-3, 0.0, 1e-6, 0) == Approx(0.9 * 1e-4));
  CHECK(f.next(9e-4, 0.0, 1e-6, 0) == Approx(0.1));  // slow progress: capped at 0.1
  ForcingTerm g;
  g.next(1.0, 1.0, 1e-6, 100);
  // |F| = 1e-6 of a unit throughflow, 100 unknowns: the budget test needs a linear residual
  // of 1e-3 * 1e-6 / 10 = 1e-10, i.e. eta = 1e-4 here; the published value (9e-13) is lower.
  CHECK(g.next(1e-6, 1.0, 1e-6, 100) == Approx(1e-4));
  ForcingTerm h;
  CHECK(h.next(1e-20, 1.0, 1e-6, 1) == Approx(0.1));  // never above 0.1, whatever is needed
}

TEST_CASE("Newton update stopped at the inflection point of a withdrawal's reduction",
          "[time_control][newton_limit]") {
  // The kernel: an update that crosses the point stops there, one that does not is kept, and
  // from the point itself the next update goes on (by definition, newton_iteration.hpp).
  CHECK(stopped_at_inflection(1.0, -1.0, 0.2) == 0.2);
  CHECK(stopped_at_inflection(-1.0, 1.0, 0.2) == 0.2);
  CHECK(stopped_at_inflection(1.0, 0.5, 0.2) == 0.5);
  CHECK(stopped_at_inflection(0.2, -1.0, 0.2) == -1.0);
  // The point is smoothstep's inflection: the cubic x^2 (3 - 2x) has second derivative
  // 6 - 12x, zero at x = 1/2 (by hand), so its slope peaks there; central differences of the
  // kernel's own slope show the sign change of the curvature.
  const double width = 0.4, b = smoothstep_inflection(width), d = 1e-4;
  CHECK(b == Approx(0.2).epsilon(1e-15));
  CHECK(smoothstep(b - d, width).slope < smoothstep(b, width).slope);
  CHECK(smoothstep(b + d, width).slope < smoothstep(b, width).slope);
  CHECK(smoothstep(b, width).slope == Approx(1.5 / width).epsilon(1e-12));  // 6 x (1-x) / w

  // A well pumping more than the aquifer delivers (drying_model): its cell ends within the
  // reduction length of the base, on the S-shaped part of phi. With the limit the steps
  // need fewer Newton iterations in all and reach the same heads: solved tightly, both paths
  // end at the same root of the same equations (the limit changes the path, not the law).
  struct Counted {
    RunResult result;
    std::vector<std::vector<double>> heads;
    double max_imbalance = 0.0;
  };
  auto run = [](bool limit, double head_tolerance) {
    Model m = drying_model();
    m.solver.limit_at_withdrawal_inflection = limit;
    m.solver.head_tolerance = head_tolerance;
    test::BudgetObserver obs(m);
    Counted c{run_simulation(m, obs), obs.heads, obs.max_imbalance};
    return c;
  };
  const Counted with = run(true, 1e-5), without = run(false, 1e-5);
  REQUIRE(with.result.converged);
  REQUIRE(without.result.converged);
  WARN("Newton iterations with the limit " << with.result.newton_iterations << ", without "
                                           << without.result.newton_iterations);
  CHECK(with.result.newton_iterations < without.result.newton_iterations);
  CHECK(with.result.cutbacks == 0);
  CHECK(with.max_imbalance < 1e-6);  // percent, every step (the contract's closure)
  CHECK(without.max_imbalance < 1e-6);

  // Tight solves: every step's last update below 1e-11 m, so both runs hold the same heads to
  // far better than 1e-8 m.
  const Counted tight_with = run(true, 1e-11), tight_without = run(false, 1e-11);
  REQUIRE(tight_with.result.converged);
  REQUIRE(tight_without.result.converged);
  REQUIRE(tight_with.heads.size() == tight_without.heads.size());
  double worst = 0.0;
  for (std::size_t s = 0; s < tight_with.heads.size(); ++s)
    for (std::size_t i = 0; i < tight_with.heads[s].size(); ++i)
      if (std::isfinite(tight_with.heads[s][i]))
        worst = std::max(worst, std::abs(tight_with.heads[s][i] - tight_without.heads[s][i]));
  WARN("largest head difference with - without the limit, tight solves: " << worst << " m");
  CHECK(worst < 1e-8);
}

TEST_CASE("Newton stops without the proving solve when the contraction estimate is far below",
          "[time_control][newton_estimate]") {
  // The kernel on a sequence contracting at a known rate: x_k = theta^k towards 0 with the
  // residual F(x) = x. The last update is theta^(k-1) (1 - theta), the residual norms
  // theta^(k-1) and theta^k, so the bound theta / (1 - theta) times the update is theta^k, the
  // distance left (by hand). No estimate while the iteration is not clearly contracting.
  for (const double theta : {1e-6, 0.01, 0.3}) {
    const int k = 3;
    const double before = std::pow(theta, k - 1), after = std::pow(theta, k);
    CHECK(contraction_update_estimate(before * (1.0 - theta), before, after) ==
          Approx(after).epsilon(1e-14));
  }
  CHECK(std::isinf(contraction_update_estimate(1.0, 1.0, 0.5)));
  CHECK(std::isinf(contraction_update_estimate(1.0, 0.0, 0.0)));

  // Models where Newton ends on the residual test with many cells on curved parts of their
  // laws: a well pumped dry (drying_model, water table) and the switching model with every
  // stress, each with its direct solver and (where built) the inexact V-cycle path the rule was
  // made for. With the estimate the runs need fewer Newton iterations, close every step's
  // budget below 1e-6 percent (the contract's closure), and hold heads within 1e-8 m, the
  // estimate's bound (1e-3 of the 1e-5 m head tolerance), of the same run solved tightly
  // (last update below 1e-11 m, no estimate).
  struct Counted {
    RunResult result;
    std::vector<std::vector<double>> heads;
    double max_imbalance = 0.0;
  };
  auto run = [](Model m, bool estimate, double head_tolerance) {
    m.solver.stop_on_contraction_estimate = estimate;
    m.solver.head_tolerance = head_tolerance;
    test::BudgetObserver obs(m);
    Counted c{run_simulation(m, obs), obs.heads, obs.max_imbalance};
    return c;
  };
  auto compare = [&](const Model& m) {
    const Counted with = run(m, true, 1e-5), without = run(m, false, 1e-5);
    const Counted tight = run(m, false, 1e-11);
    REQUIRE(with.result.converged);
    REQUIRE(without.result.converged);
    REQUIRE(tight.result.converged);
    WARN(with.result.linear_solver << ": Newton iterations with the estimate "
                                   << with.result.newton_iterations << ", without "
                                   << without.result.newton_iterations);
    CHECK(with.result.newton_iterations < without.result.newton_iterations);
    CHECK(with.result.cutbacks == 0);
    CHECK(with.max_imbalance < 1e-6);  // percent, every step
    REQUIRE(with.heads.size() == tight.heads.size());
    double worst = 0.0;
    for (std::size_t s = 0; s < with.heads.size(); ++s)
      for (std::size_t i = 0; i < with.heads[s].size(); ++i)
        if (std::isfinite(with.heads[s][i]))
          worst = std::max(worst, std::abs(with.heads[s][i] - tight.heads[s][i]));
    WARN("largest head difference to the tight solve: " << worst << " m");
    CHECK(worst < affine_margin * 1e-5);
  };
  SECTION("water table, direct") { compare(drying_model()); }
  SECTION("switching, direct") { compare(stress_tests::every_stress_model()); }
  if (multigrid_available()) {
    SECTION("water table, multigrid") {
      Model m = drying_model();
      m.solver.linear = LinearChoice::multigrid;
      compare(m);
    }
    SECTION("switching, multigrid") {
      Model m = stress_tests::every_stress_model();
      m.solver.linear = LinearChoice::multigrid;
      compare(m);
    }
  }
}
