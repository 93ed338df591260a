// Stream depletion by a well near a straight, fully penetrating river held at its stage
// (Glover and Balmer, 1954), with the drawdown of the image-well solution.
#include <algorithm>
#include <boost/math/constants/constants.hpp>
#include <boost/math/special_functions/erf.hpp>
#include <boost/math/special_functions/expint.hpp>
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "solver/simulation.hpp"
#include "solver/stress_flows.hpp"
#include "solver/system_layout.hpp"
#include "stress_test_models.hpp"

using namespace aquiledger;
using namespace aquiledger::stress_tests;

namespace {

constexpr double transmissivity = 100.0;  ///< L2/T
constexpr double storativity = 1e-4;      ///< -
constexpr double rate = 1000.0;           ///< L3/T
constexpr double distance = 200.0;        ///< L, well to river line
constexpr double initial_head = 20.0;     ///< L
const std::vector<int> offsets{-15, -10, -5, 3,
                               6,   10,  15};  ///< observation columns from the well (coarse)

/// The river (west column, 10 m wide; its centre line is the river line), 10 m columns to
/// 400 m east of it, then growing by 10 % to 10 km; rows 10 m at the well growing by 10 % to
/// 10 km north and south; every cell split into `split` parts (odd: coarse centres kept).
/// The cone, sqrt(4 T t / S) = 2.8 km at 2 d, stays far from the no-flow edges.
Model river_model(int split, const Period& period) {
  UniformAquifer a;
  a.condition = Condition::confined;
  a.top = 0.0;
  a.bottom = -10.0;
  a.k = 10.0;                 // T = 100 m2/d
  a.specific_storage = 1e-5;  // S = 1e-4
  a.initial_head = initial_head;
  std::vector<double> coarse_dx(40, 10.0);
  for (double w = 10.0 * 1.1, x = 400.0; x < 100000.0; w *= 1.1) {
    coarse_dx.push_back(w);
    x += w;
  }
  std::vector<double> dx, dy;
  for (double w : coarse_dx)
    for (int k = 0; k < split; ++k) dx.push_back(w / split);
  for (double w : telescoping_widths(10.0, 1.1, 100000.0))
    for (int k = 0; k < split; ++k) dy.push_back(w / split);
  Model m = uniform_model(static_cast<int>(dy.size()), static_cast<int>(dx.size()), 1.0, 1.0, a);
  m.grid = RectilinearGrid(dx, dy, 0.0, 0.0);
  const int well_row = m.grid.n_rows() / 2, well_col = 20 * split + split / 2;
  m.wells.push_back(Well{"well", m.grid.x_center(well_col), m.grid.y_center(well_row),
                         m.grid.cell(well_row, well_col), PeriodValues(rate)});
  // The river fills the west (coarse) column, held at the stage through a very large bed
  // conductance, 1e7 m2/d per 10 m of channel (1e5 T): the river cells stay within
  // rate / C = 1e-4 m of the stage. The bed bottom is far below, so the law stays linear.
  River river{"river", {}, {}, PeriodValues(initial_head), PeriodValues(-100.0), PeriodValues(1e7)};
  // On a refined grid only the column centred on the river line holds the river.
  for (int row = 0; row < m.grid.n_rows(); ++row) {
    river.cells.push_back(m.grid.cell(row, split / 2));
    river.length.push_back(m.grid.dy(row));
  }
  m.rivers.push_back(river);
  m.periods = {period};
  return m;
}

struct RiverRun {
  std::vector<StepInfo> steps;
  std::vector<double> depletion;              ///< L3/T, river to aquifer, per step
  std::vector<std::vector<double>> drawdown;  ///< L, per step, per offset
  std::vector<double> x;  ///< L, distance of each observation from the river line
};

RiverRun run_river(int split, const Period& period) {
  const Model m = river_model(split, period);
  RecordingObserver recorder;
  REQUIRE(run_simulation(m, recorder).converged);
  const SystemLayout layout = make_system_layout(m);
  const std::size_t river_feature = 1;  // list_features order: the well, then the river
  REQUIRE(list_features(m)[river_feature].kind == FeatureKind::river);
  const int well_row = m.grid.n_rows() / 2, well_col = 20 * split + split / 2;
  const double river_line = 0.5 * 10.0;
  RiverRun run;
  for (int offset : offsets)
    run.x.push_back(m.grid.x_center(well_col + offset * split) - river_line);
  for (const auto& step : recorder.steps) {
    std::vector<FeatureFlow> flows(list_features(m).size());
    stress_flows_by_feature(m, layout, step.info.period, step.head, flows);
    run.steps.push_back(step.info);
    run.depletion.push_back(flows[river_feature].in - flows[river_feature].out);
    std::vector<double> s;
    for (int offset : offsets)
      s.push_back(initial_head - step.head[static_cast<std::size_t>(
                                     m.grid.cell(well_row, well_col + offset * split).value)]);
    run.drawdown.push_back(s);
  }
  return run;
}

}  // namespace

TEST_CASE("steady drawdown beside a river converges to the image-well solution",
          "[glover_balmer]") {
  const double pi = boost::math::constants::pi<double>();
  const RiverRun coarse = run_river(1, Period{"steady", 1.0, 1, 1.0, true});
  const RiverRun fine =
      run_river(3, Period{"steady", 1.0, 1, 1.0, true});  // every cell split in three
  // At steady state the river supplies the whole withdrawal (mass balance).
  CHECK(std::abs(coarse.depletion[0] - rate) <= 1e-8 * rate);
  double worst = 0.0;
  for (std::size_t k = 0; k < offsets.size(); ++k) {
    // Steady image-well drawdown (Thiem with the method of images, e.g. Ferris et al.,
    // 1962, from memory): Q / (2 pi T) ln(r2 / r1),
    // r1 to the well, r2 to its image mirrored across the river line.
    const double r1 = std::abs(coarse.x[k] - distance), r2 = coarse.x[k] + distance;
    const double exact = rate / (2.0 * pi * transmissivity) * std::log(r2 / r1);
    const double e_coarse = coarse.drawdown[0][k] - exact, e_fine = fine.drawdown[0][k] - exact;
    INFO("x " << coarse.x[k] << " exact " << exact << " coarse error " << e_coarse << " fine error "
              << e_fine);
    // Second-order five-point scheme: refining by 3 divides the error by about 9; the no-flow
    // edges 100 km away add (d / L)^2 Q / (2 pi T) ~ 1e-5 m, below either error.
    CHECK(e_coarse / e_fine > 6.0);
    CHECK(e_coarse / e_fine < 12.0);
    // Richardson estimate of the fine error, (s_coarse - s_fine) / 8, within half.
    CHECK(std::abs(e_fine) <= 1.5 * std::abs(coarse.drawdown[0][k] - fine.drawdown[0][k]) / 8.0);
    worst = std::max(worst, std::abs(e_fine) / exact);
  }
  WARN("Glover-Balmer steady image-well drawdown: worst relative error on the fine grid " << worst);
}

TEST_CASE("river depletion and drawdown near a river follow Glover-Balmer", "[glover_balmer]") {
  const double pi = boost::math::constants::pi<double>();
  // 2 days in 120 steps growing by 6 %.
  const RiverRun run = run_river(1, Period{"pumping", 2.0, 120, 1.06, false});
  const RiverRun steady = run_river(1, Period{"steady", 1.0, 1, 1.0, true});
  const double a =
      distance * distance * storativity / (4.0 * transmissivity);  // T, d^2 S / (4 T) = 0.01 d
  double worst_depletion = 0.0, worst_drawdown = 0.0;
  for (std::size_t n = 0; n < run.steps.size(); ++n) {
    const double t = run.steps[n].time, dt = run.steps[n].dt;
    // From t = d^2 S / (4 T) on (u = 1 at the river): before, the depletion is under 16 % of
    // Q and carried by a front only a few cells wide.
    if (t < a) continue;
    // Glover and Balmer (1954): depletion Q erfc(sqrt(d^2 S / (4 T t))); its rate of change
    // Q / sqrt(pi) sqrt(a) t^-3/2 exp(-a / t).
    const double expected = rate * boost::math::erfc(std::sqrt(a / t));
    const double change =
        rate / std::sqrt(pi) * std::sqrt(a) * std::pow(t, -1.5) * std::exp(-a / t);
    // Error budget: the implicit step lags about half a step behind (0.5 dt dD/dt, leading
    // term of the backward Euler error).
    INFO("t " << t << " depletion " << run.depletion[n] << " Glover-Balmer " << expected);
    CHECK(std::abs(run.depletion[n] - expected) <= 0.5 * dt * change);
    worst_depletion = std::max(worst_depletion, std::abs(run.depletion[n] - expected) / rate);
    for (std::size_t k = 0; k < offsets.size(); ++k) {
      // Image-well drawdown: Theis (1935) of the well minus Theis of an image injecting at
      // the mirror point across the river line; d/dt of Q/(4 pi T) E1(r^2 S / (4 T t)) is
      // Q/(4 pi T) exp(-r^2 S / (4 T t)) / t.
      const double r1 = std::abs(run.x[k] - distance), r2 = run.x[k] + distance;
      auto theis = [&](double r) {
        return boost::math::expint(1, r * r * storativity / (4.0 * transmissivity * t));
      };
      auto theis_rate = [&](double r) {
        return std::exp(-r * r * storativity / (4.0 * transmissivity * t)) / t;
      };
      const double exact = rate / (4.0 * pi * transmissivity) * (theis(r1) - theis(r2));
      // Error budget: half-step lag plus the grid's error at this point, taken from the
      // steady run on the same grid (second order, see the steady case).
      const double lag =
          0.5 * dt * rate / (4.0 * pi * transmissivity) * std::abs(theis_rate(r1) - theis_rate(r2));
      const double steady_exact = rate / (2.0 * pi * transmissivity) * std::log(r2 / r1);
      const double tolerance = lag + std::abs(steady.drawdown[0][k] - steady_exact);
      INFO("x " << run.x[k] << " drawdown " << run.drawdown[n][k] << " image wells " << exact);
      CHECK(std::abs(run.drawdown[n][k] - exact) <= tolerance);
      worst_drawdown = std::max(worst_drawdown, std::abs(run.drawdown[n][k] - exact));
    }
  }
  WARN("Glover-Balmer: worst depletion error " << worst_depletion << " Q, worst drawdown error "
                                               << worst_drawdown << " m");
}
