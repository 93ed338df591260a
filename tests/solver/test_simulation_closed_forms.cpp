// Transient and steady solutions against closed forms from the literature.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>

#include "postproc/analytical_solutions.hpp"
#include "support/budget_observer.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {

/// Largest |h - exact| over columns first..last of a one-row strip, exact the
/// Dupuit-Forchheimer head (postproc/analytical_solutions.hpp) with h1 at the centre of
/// column 0 and h2 at that of the last column.
double worst_dupuit_error(const Model& m, const std::vector<double>& head, double h1, double h2,
                          double n_rate, double k, int first, int last) {
  const int end = m.grid.n_cols() - 1;
  const double length = m.grid.x_center(end) - m.grid.x_center(0);
  double worst = 0.0;
  for (int col = first; col <= last; ++col) {
    const double x = m.grid.x_center(col) - m.grid.x_center(0);
    const double exact = dupuit_recharge_head(h1, h2, length, n_rate, k, x);
    worst = std::max(worst, std::abs(head[static_cast<std::size_t>(col)] - exact));
  }
  return worst;
}

}  // namespace

TEST_CASE("semi-infinite aquifer after a sudden boundary head change", "[analytical]") {
  // Carslaw and Jaeger (1959), semi-infinite solid with a step in surface value:
  // h = h0 + dH erfc(x / sqrt(4 D t)), D = T / S.
  test::AquiferSpec a;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 10.0;                 // T = 100 m2/d
  a.specific_storage = 1e-3;  // S = 1e-2, D = 1e4 m2/d
  a.initial_head = 20.0;
  const double dh = 2.0, dx = 5.0;
  // sqrt(4 D t) = 200 m at t = 1 d; the closed end at 4 km is far beyond the front.
  Model m = test::make_model(std::vector<double>(800, dx), {10.0}, a);
  test::add_fixed_head(m, {m.grid.cell(0, 0)}, a.initial_head + dh);
  test::add_period(m, 1.0, 120, 1.05);
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  const double diffusivity = 100.0 / 1e-2;
  double worst = 0.0;
  for (std::size_t s : {obs.steps.size() / 2, obs.steps.size() - 1}) {
    const double t = obs.steps[s].time;
    for (int col = 1; col < 200; ++col) {
      const double x = m.grid.x_center(col) - m.grid.x_center(0);  // from the fixed cell's centre
      const double exact = a.initial_head + dh * std::erfc(x / std::sqrt(4.0 * diffusivity * t));
      worst = std::max(worst, std::abs(obs.heads[s][static_cast<std::size_t>(col)] - exact) / dh);
    }
  }
  std::printf("erfc step response: max |h - exact| / dH = %.3e\n", worst);
  // Space: O(dx^2 / (4 D t)) ~ 1e-3 at the mid time; time: backward Euler with
  // dt / t ~ 0.05 late in the period moves the front by ~ dt/2 in time, ~ 1% of dH.
  CHECK(worst < 0.01);
}

TEST_CASE("steady Dupuit-Forchheimer flow with recharge between two fixed heads", "[analytical]") {
  // Dupuit (1863), Forchheimer (1886): h^2 = h1^2 - (h1^2 - h2^2) x / L + (N / K) x (L - x).
  test::AquiferSpec a;
  a.condition = Condition::water_table;
  a.top = 30.0;
  a.bottom = 0.0;
  a.k = 5.0;
  a.initial_head = 10.0;
  const double h1 = 10.0, h2 = 6.0, n_rate = 0.002, dx = 1.0;
  // Fixed cells 1 mm wide: their centres (x = 0 and L) sit on the ends of the recharged
  // strip, so no recharge is lost in their half cells.
  std::vector<double> widths(200, dx);
  widths.front() = widths.back() = 1e-3;
  Model m = test::make_model(widths, {1.0}, a);
  const int last = m.grid.n_cols() - 1;
  test::add_fixed_head(m, {m.grid.cell(0, 0)}, h1);
  test::add_fixed_head(m, {m.grid.cell(0, last)}, h2);
  test::add_recharge(m, {n_rate});
  test::add_period(m, 1.0, 1, 1.0, true);
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  const double length = m.grid.x_center(last) - m.grid.x_center(0);
  const double worst = worst_dupuit_error(m, obs.last_head, h1, h2, n_rate, a.k, 1, last - 1);
  std::printf("Dupuit-Forchheimer: max |h - exact| = %.3e m\n", worst);
  // The mean face thickness (default) is exact for the quadratic h^2 of a uniform strip
  // except beside each held head, where the canal-to-cell difference stands for the
  // gradient half a cell from the face: a flow error ~ n dx / 2 there, which moves heads by
  // ~ n dx^2 / (2 K h) ~ 2.5e-5 m (second order; test_simulation_dupuit.cpp). Tolerance twice that.
  CHECK(worst < 5e-5);
  // All recharge leaves through the fixed heads.
  const WaterBudget& b = obs.budgets.back();
  CHECK(b[BudgetComponent::recharge].in == Approx(n_rate * (length - 1e-3) * 1.0).epsilon(1e-9));
}

TEST_CASE("closed aquifer drained uniformly across its top", "[analytical]") {
  // Mass balance of a closed cell with uniform withdrawal N (L/T): A dW/dt = N A, so W falls
  // linearly in time; with W piecewise linear in h the head history is piecewise linear:
  // slope N/S above the top, N/Sy below it. Released volumes: S A (h0 - top) elastic and
  // Sy A (top - h_end) drainage.
  test::AquiferSpec a;
  a.condition = Condition::switching;
  a.top = 10.0;
  a.bottom = 0.0;
  a.specific_storage = 1e-4;  // S = 1e-3
  a.specific_yield = 0.1;
  a.initial_head = 10.5;
  Model m = test::make_model({20.0, 20.0, 20.0}, {20.0, 20.0, 20.0}, a);
  const double rate = -0.01;
  test::add_recharge(m, {rate});
  test::add_period(m, 0.03, 1);  // stays confined: h = 10.2
  test::add_period(m, 10.0, 1);  // one step crossing the top
  test::add_period(m, 30.02, 5, 1.3);
  const double s = 1e-3, sy = 0.1, t_top = s * 0.5 / 0.01;
  auto exact = [&](double t) {
    return t <= t_top ? 10.5 + rate * t / s : 10.0 + rate * (t - t_top) / sy;
  };
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  REQUIRE(obs.steps.size() == 7);
  double worst = 0.0;
  for (std::size_t k = 0; k < obs.steps.size(); ++k)
    for (double h : obs.heads[k]) worst = std::max(worst, std::abs(h - exact(obs.steps[k].time)));
  std::printf("closed drained aquifer: max |h - exact| = %.3e m, end head %.9f\n", worst,
              obs.last_head[4]);
  // Newton is exact on each linear piece; the residual test bounds what is left to
  // flow_tolerance * |N| dt / Sy ~ 1e-6 m.
  CHECK(worst < 1e-6);
  CHECK(obs.last_head[4] == Approx(6.0).margin(1e-6));
  const double area = 3600.0;
  CHECK(obs.cumulative[BudgetComponent::storage_elastic].in ==
        Approx(s * area * 0.5).epsilon(1e-6));
  CHECK(obs.cumulative[BudgetComponent::storage_drainage].in ==
        Approx(sy * area * 4.0).epsilon(1e-6));
  CHECK(obs.cumulative[BudgetComponent::storage_elastic].out == 0.0);
  // The crossing step alone: elastic S A (10.2 - 10), drainage Sy A (10 - h_end) over its dt.
  const WaterBudget& crossing = obs.budgets[1];
  const double h_end = exact(10.03);
  CHECK(crossing[BudgetComponent::storage_elastic].in * 10.0 ==
        Approx(s * area * 0.2).epsilon(1e-6));
  CHECK(crossing[BudgetComponent::storage_drainage].in * 10.0 ==
        Approx(sy * area * (10.0 - h_end)).epsilon(1e-6));
}

TEST_CASE("initial steady state is reported as the initial heads and persists", "[analytical]") {
  // Same Dupuit-Forchheimer strip as above, started from the steady state of period 1's
  // stresses: the initial state must be that closed form, and a transient period with the
  // same stresses must leave it unchanged (storage release is zero at steady state).
  test::AquiferSpec a;
  a.condition = Condition::water_table;
  a.top = 30.0;
  a.bottom = 0.0;
  a.k = 5.0;
  const double h1 = 10.0, h2 = 6.0, n_rate = 0.002;
  std::vector<double> widths(100, 2.0);
  widths.front() = widths.back() = 1e-3;
  Model m = test::make_model(widths, {1.0}, a);
  m.initial.steady = true;
  m.initial.head = std::vector<double>{};
  const int last = m.grid.n_cols() - 1;
  test::add_fixed_head(m, {m.grid.cell(0, 0)}, h1);
  test::add_fixed_head(m, {m.grid.cell(0, last)}, h2);
  test::add_recharge(m, {n_rate});
  test::add_period(m, 10.0, 3);
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  const double worst = worst_dupuit_error(m, obs.initial, h1, h2, n_rate, a.k, 0, last);
  double drift = 0.0;
  for (std::size_t i = 0; i < obs.initial.size(); ++i)
    drift = std::max(drift, std::abs(obs.last_head[i] - obs.initial[i]));
  std::printf(
      "initial steady Dupuit: max |h - exact| = %.3e m, drift over a transient period %.3e m\n",
      worst, drift);
  // Error as in the steady test with cells twice as wide: four times, ~ 1e-4 m; tolerance
  // twice that.
  CHECK(worst < 2e-4);
  // The steady residual is at most flow_tolerance of the throughflow; what storage must
  // absorb of it moves heads by far less than the head tolerance.
  CHECK(drift < 1e-5);
}

TEST_CASE("initial steady state of a water-table strip without a top between two rivers",
          "[analytical]") {
  // Dupuit (1863), Forchheimer (1886), as above: h^2 = h1^2 - (h1^2 - h2^2) x / L
  // + (N / K) x (L - x), here between two rivers in the end cells of an aquifer with no top.
  // Every river bed lies well above bottom + reference_thickness_without_top, where a start
  // from the bottom alone would leave both rivers disconnected and the steady Jacobian that
  // of a closed aquifer (singular): the run must still find the steady state.
  test::AquiferSpec a;
  a.condition = Condition::water_table;
  a.top = std::nan("");
  a.bottom = 0.0;
  a.k = 5.0;
  const double h1 = 30.0, h2 = 26.0, n_rate = 0.002, conductance = 1e7;
  std::vector<double> widths(200, 1.0);
  widths.front() = widths.back() = 1e-3;
  Model m = test::make_model(widths, {1.0}, a);
  m.initial.steady = true;
  m.initial.head = std::vector<double>{};
  const int last = m.grid.n_cols() - 1;
  for (auto [col, stage] : {std::pair{0, h1}, std::pair{last, h2}}) {
    River r;
    r.name = "river at column " + std::to_string(col + 1);
    r.cells = {m.grid.cell(0, col)};
    r.length = {1.0};
    r.stage = PeriodValues(stage);
    r.bed_bottom = PeriodValues(stage - 1.0);
    r.conductance = PeriodValues(conductance);
    m.rivers.push_back(r);
  }
  REQUIRE(h2 - 1.0 > a.bottom + reference_thickness_without_top);
  test::add_recharge(m, {n_rate});
  test::add_period(m, 1.0, 1, 1.0, true);
  test::BudgetObserver obs(m);
  const RunResult run = run_simulation(m, obs);
  INFO(run.failure);
  REQUIRE(run.converged);
  const double length = m.grid.x_center(last) - m.grid.x_center(0);
  const double worst = worst_dupuit_error(m, obs.initial, h1, h2, n_rate, a.k, 0, last);
  std::printf("initial steady Dupuit between rivers, no top: max |h - exact| = %.3e m\n", worst);
  // As in the steady test above (same cells, ~2.5e-5 m), plus the rivers' bed resistance:
  // end flows of at most K (h1^2 - h2^2) / (2 L) + N L ~ 3 m2/d over C = 1e7 m2/d, < 1e-6 m.
  CHECK(worst < 5e-5);
  // All recharge, over every cell (the river cells too: 1 mm more than L), leaves through
  // the rivers (net), as at any steady state.
  const WaterBudget& b = obs.budgets.back();
  CHECK(b[BudgetComponent::river].out - b[BudgetComponent::river].in ==
        Approx(n_rate * (length + 1e-3) * 1.0).epsilon(1e-6));
}
