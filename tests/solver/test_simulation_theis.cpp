// Pumping a confined aquifer of infinite extent: Theis (1935) drawdown
// s = Q / (4 pi T) W(u), u = r^2 S / (4 T t), W(u) = E1(u).
#include <boost/math/special_functions/expint.hpp>
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>

#include "support/budget_observer.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {

constexpr double pi = 3.14159265358979323846;

double theis_drawdown(double q, double t_transmissivity, double s_storativity, double r, double t) {
  const double u = r * r * s_storativity / (4.0 * t_transmissivity * t);
  return q / (4.0 * pi * t_transmissivity) * boost::math::expint(1, u);
}

struct TheisSetup {
  double k = 10.0, thickness = 10.0;  // T = 100 m2/d
  double ss = 1e-5;                   // S = 1e-4
  double q = 1000.0;                  // m3/d
  double length = 10.0;               // d
};

struct TheisRun {
  double max_relative_error = 0.0;
  double max_imbalance = 0.0;
  RunResult result;
};

/// Runs the pumping test on a grid refined geometrically around the well (centre cell
/// `centre`, growth `growth`), and returns the largest relative drawdown error over cell
/// centres at r in [r_min, r_max] on the well's row, at the step ends closest to the times.
TheisRun run_theis(double centre, double growth, int steps, double step_growth, double r_min,
                   double r_max, std::vector<double> times,
                   LinearChoice linear = LinearChoice::automatic) {
  const TheisSetup p;
  test::AquiferSpec a;
  a.top = p.thickness;
  a.bottom = 0.0;
  a.k = p.k;
  a.specific_storage = p.ss;
  a.initial_head = 50.0;
  // The cone reaches r ~ 1.5 sqrt(T t / S) ~ 4.7 km at 10 d; no-flow boundaries at 20 km act
  // as image wells 40 km away, whose drawdown is Q/(4 pi T) W(40) ~ 1e-20 m.
  const std::vector<double> w = test::geometric_spacing(centre, growth, 20000.0);
  Model m = test::make_model(w, w, a);
  m.solver.linear = linear;
  test::add_period(m, p.length, steps, step_growth);
  const int mid = static_cast<int>(w.size() / 2);
  test::add_well(m, mid, mid, {p.q});

  // Only the period end is compared when a single time equal to it is asked for.
  const bool end_only = times.size() == 1 && times[0] == p.length;
  test::BudgetObserver obs(m, !end_only);
  TheisRun run;
  run.result = run_simulation(m, obs);
  REQUIRE(run.result.converged);
  const double transmissivity = p.k * p.thickness, storativity = p.ss * p.thickness;
  for (double t_want : times) {
    std::size_t best = 0;
    for (std::size_t s = 0; s < obs.steps.size(); ++s)
      if (std::abs(obs.steps[s].time - t_want) < std::abs(obs.steps[best].time - t_want)) best = s;
    const double t = obs.steps[best].time;
    const std::vector<double>& head = end_only ? obs.last_head : obs.heads[best];
    for (int col = mid + 1; col < m.grid.n_cols(); ++col) {
      const double r = m.grid.x_center(col) - m.grid.x_center(mid);
      if (r < r_min || r > r_max) continue;
      const double s_num =
          a.initial_head - head[static_cast<std::size_t>(m.grid.cell(mid, col).value)];
      const double s_ref = theis_drawdown(p.q, transmissivity, storativity, r, t);
      run.max_relative_error = std::max(run.max_relative_error, std::abs(s_num - s_ref) / s_ref);
    }
  }
  run.max_imbalance = obs.max_imbalance;
  return run;
}

}  // namespace

TEST_CASE("Boost's E1 reproduces tabulated exponential-integral values", "[theis]") {
  // Abramowitz and Stegun (1964), Table 5.1 (E1(x)); values from memory, 10 digits.
  CHECK(boost::math::expint(1, 0.01) == Approx(4.0379295765).epsilon(1e-9));
  CHECK(boost::math::expint(1, 0.1) == Approx(1.8229239584).epsilon(1e-9));
  CHECK(boost::math::expint(1, 0.5) == Approx(0.5597735948).epsilon(1e-9));
  CHECK(boost::math::expint(1, 1.0) == Approx(0.2193839344).epsilon(1e-9));
  CHECK(boost::math::expint(1, 2.0) == Approx(0.0489005107).epsilon(1e-9));
}

TEST_CASE("Theis drawdown around a pumped confined well", "[theis]") {
  // Geometric grid: centre 2 m, growth 1.1; 80 steps over 10 d growing by 1.08.
  // Error estimate: spatial O((g-1)^2) ~ 1% relative on the smooth part of the cone, time
  // (backward Euler, dt/t ~ 0.07 late in the period) ~ 1%; the grid-convergence test below
  // confirms the spatial part. Radii 10..1000 m keep clear of the well cell (2 m) and of the
  // far tail where s is tiny.
  const TheisRun run = run_theis(2.0, 1.1, 80, 1.08, 10.0, 1000.0, {1.0, 5.0, 10.0});
  std::printf("Theis: max relative drawdown error %.3e (r 10..1000 m, t ~ 1, 5, 10 d)\n",
              run.max_relative_error);
  CHECK(run.max_relative_error < 0.03);
  // Confined model: the residual is affine in the heads, so one exact solve per step settles
  // it and the proving solve is skipped (solver/newton_solver.hpp).
  CHECK(run.result.newton_iterations == run.result.steps);
  // linear = "auto" on a confined (symmetric) model of 27 000 unknowns: Cholesky.
  CHECK(run.result.linear_solver == "cholmod");
  CHECK(run.result.linear_reason.find("symmetric") != std::string::npos);
}

TEST_CASE("Theis error falls at second order as the grid is refined", "[theis][convergence]") {
  // Cell-centred finite volumes on smoothly varying grids converge at second order in the
  // local spacing even where the truncation error is only first order (Manteuffel and White,
  // 1986; Forsyth and Sammon, 1988). On the geometric grid the spacing at radius r is
  // ~ r (g - 1), so the relative drawdown error should fall as (g - 1)^2. Each level halves
  // the centre cell and g - 1 and quarters the (uniform) time step, so backward Euler's
  // first-order time error falls at the same rate and cannot mask the spatial order.
  struct Level {
    double centre, growth;
    int steps;
  };
  const Level levels[] = {
      {4.0, 1.2, 25}, {2.0, std::sqrt(1.2), 100}, {1.0, std::sqrt(std::sqrt(1.2)), 400}};
  std::vector<double> errors;
  for (const Level& l : levels)
    errors.push_back(
        run_theis(l.centre, l.growth, l.steps, 1.0, 20.0, 500.0, {10.0}).max_relative_error);
  for (std::size_t k = 1; k < errors.size(); ++k) {
    const double ratio = (levels[k - 1].growth - 1.0) / (levels[k].growth - 1.0);
    const double order = std::log(errors[k - 1] / errors[k]) / std::log(ratio);
    std::printf("Theis grid convergence: g %.4f -> %.4f, error %.3e -> %.3e, observed order %.2f\n",
                levels[k - 1].growth, levels[k].growth, errors[k - 1], errors[k], order);
    CHECK(order > 1.6);
    CHECK(order < 2.4);
  }
}
