// The multigrid backend (linear = "multigrid": Krylov preconditioned by hypre's PFMG) against
// the direct backend on the same runs. Built only with -DAQUILEDGER_WITH_HYPRE=ON.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"
#include "solver/simulation.hpp"
#include "support/budget_observer.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {

/// 40 x 30 cells of 50 m, fixed head on the west column, two wells, recharge; the north-east
/// corner (6 x 6 cells) inactive, so the structured grid holds cells without an unknown.
Model grid_model(Condition condition) {
  test::AquiferSpec a;
  a.condition = condition;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 5.0;
  a.specific_storage = 1e-5;
  a.specific_yield = 0.15;
  a.initial_head = condition == Condition::confined ? 30.0 : 10.5;
  const int nr = 30, nc = 40;
  Model m = test::make_model(std::vector<double>(nc, 50.0), std::vector<double>(nr, 50.0), a);
  std::vector<std::uint8_t> active(static_cast<std::size_t>(nr * nc), 1);
  for (int r = 0; r < 6; ++r)
    for (int c = nc - 6; c < nc; ++c) active[static_cast<std::size_t>(r * nc + c)] = 0;
  m.grid = RectilinearGrid(std::vector<double>(nc, 50.0), std::vector<double>(nr, 50.0), 0.0, 0.0,
                           active);
  test::add_period(m, 100.0, 10);
  test::add_period(m, 100.0, 10);
  test::add_well(m, 15, 25, {400.0, 0.0});
  test::add_well(m, 22, 12, {250.0, 0.0});
  test::add_recharge(m, {1e-4});
  test::add_fixed_head(m, test::column_cells(m, 0), a.initial_head);
  // Tighter than the default so that the two backends' converged heads are compared well
  // below the differences a loose stop could leave.
  m.solver.head_tolerance = 1e-7;
  return m;
}

struct Run {
  RunResult result;
  std::vector<std::vector<double>> heads;
  double max_imbalance = 0.0;
  int below_top = 0;  ///< cells ever below the top (switching regime visited)
};

Run run_with(Model m, LinearChoice choice) {
  m.solver.linear = choice;
  test::BudgetObserver obs(m);  // checks every step's budget below 1e-6 percent
  Run run;
  run.result = run_simulation(m, obs);
  run.heads = obs.heads;
  run.max_imbalance = obs.max_imbalance;
  for (std::size_t i = 0; i < obs.last_head.size(); ++i)
    for (const auto& h : obs.heads)
      if (std::isfinite(h[i]) && h[i] < m.aquifer.top[i]) {
        ++run.below_top;
        break;
      }
  return run;
}

/// Largest head difference over every step and cell.
double largest_difference(const Run& a, const Run& b) {
  double worst = 0.0;
  for (std::size_t s = 0; s < a.heads.size(); ++s)
    for (std::size_t i = 0; i < a.heads[s].size(); ++i)
      if (std::isfinite(a.heads[s][i]))
        worst = std::max(worst, std::abs(a.heads[s][i] - b.heads[s][i]));
  return worst;
}

}  // namespace

TEST_CASE("multigrid backend: switching run agrees with LU, budgets close, preconditioner kept",
          "[linear][multigrid]") {
  const Model m = grid_model(Condition::switching);
  const Run direct = run_with(m, LinearChoice::direct);
  const Run multigrid = run_with(m, LinearChoice::multigrid);
  REQUIRE(direct.result.converged);
  REQUIRE(multigrid.result.converged);
  CHECK(multigrid.result.linear_solver == "multigrid (bicgstab + pfmg)");
  // The water table fell below the top: the switching (non-symmetric) regime was exercised.
  CHECK(multigrid.below_top > 20);
  REQUIRE(multigrid.heads.size() == direct.heads.size());
  // Both runs stop Newton at the same residual test and a last update below 1e-7 m; with
  // Newton's quadratic convergence the error of each converged step is below that update, so
  // 20 steps can differ by at most about 20 x 1e-7 m (our bound; measured: see WARN).
  const double difference = largest_difference(direct, multigrid);
  WARN("largest head difference multigrid - LU: " << difference << " m");
  CHECK(difference < 2e-6);
  CHECK(multigrid.max_imbalance < 1e-6);  // percent, as every step's check
  // The preconditioner was kept across solves and rebuilt fewer times than there were solves.
  CHECK(multigrid.result.factorization_reuses > 0);
  CHECK(multigrid.result.factorizations < multigrid.result.newton_iterations);
  CHECK(multigrid.result.factorizations + multigrid.result.factorization_reuses >=
        multigrid.result.newton_iterations);
}

TEST_CASE("multigrid backend: confined run agrees with Cholesky", "[linear][multigrid]") {
  const Model m = grid_model(Condition::confined);
  const Run direct = run_with(m, LinearChoice::direct);
  const Run multigrid = run_with(m, LinearChoice::multigrid);
  REQUIRE(direct.result.converged);
  REQUIRE(multigrid.result.converged);
  CHECK(multigrid.result.linear_solver == "multigrid (pcg + pfmg)");
  // A confined system is linear: the multigrid solves run to the 1e-12 relative residual
  // (iterative_tolerance) and agree with the factorisation to far below the head tolerance.
  const double difference = largest_difference(direct, multigrid);
  WARN("largest head difference multigrid - Cholesky: " << difference << " m");
  CHECK(difference < 1e-7);
  CHECK(multigrid.max_imbalance < 1e-6);
  // Constant dt within a period: one matrix per period, so the preconditioner is kept.
  CHECK(multigrid.result.factorization_reuses > 0);
}

TEST_CASE("multigrid backend: one Jacobian solved to the relative residual asked for",
          "[linear][multigrid]") {
  // The solve itself, checked against its definition |b - A x| <= tolerance |b|, at a loose
  // (first Newton iteration, Eisenstat-Walker's 0.1) and a tight tolerance.
  const Model m = grid_model(Condition::switching);
  const SystemLayout layout = make_system_layout(m);
  FlowSystem sys(m, layout);
  std::vector<double> old_head(m.initial.head.values()), head(m.initial.head.values());
  for (std::size_t i = 0; i < head.size(); ++i) head[i] -= 0.001 * static_cast<double>(i % 40);
  sys.set_step(0, false, 10.0, old_head);
  sys.assemble(head);
  const StructuredUnknowns grid{m.grid.n_rows(), m.grid.n_cols(), layout.unknown_of_cell};
  auto solver = make_multigrid_solver(grid, sys.symmetric());
  const Eigen::VectorXd& b = sys.residual();
  for (double tolerance : {0.1, 1e-10}) {
    solver->set_relative_tolerance(tolerance);
    Eigen::VectorXd x = Eigen::VectorXd::Zero(b.size());
    REQUIRE(solver->solve(sys.matrix(), b, x));
    CHECK((b - sys.matrix() * x).norm() <= tolerance * b.norm());
  }
  // The same matrix twice: one preconditioner set-up, one reuse.
  CHECK(solver->factorizations() == 1);
  CHECK(solver->reuses() == 1);
}
