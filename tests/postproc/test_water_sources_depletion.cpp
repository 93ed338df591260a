// Stream depletion by a well beside a straight, fully penetrating river (Glover and Balmer,
// 1954), as the sources-of-water computation reports it: the river's share of the water
// pumped, per period and cumulatively, while pumping and after it stops.
#include <boost/math/constants/constants.hpp>
#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <catch2/catch.hpp>
#include <cmath>
#include <map>

#include "postproc/analytical_solutions.hpp"
#include "postproc/water_sources.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;
using namespace aquiledger::test;

namespace {

constexpr double transmissivity = 100.0;  ///< L2/T
constexpr double storativity = 1e-4;      ///< -
constexpr double rate = 1000.0;           ///< L3/T
constexpr double h = 10.0;                ///< L, column width
constexpr double distance = 200.0;        ///< L, river line to well (20 columns)
constexpr double stop = 0.2;              ///< T, the well stops
constexpr double bed_conductance = 1e5;   ///< L/T, river bed per unit length of channel
/// T, d^2 S / (4 T): the depletion reaches erfc(1) = 16 % of the rate at t = a.
constexpr double a = distance * distance * storativity / (4.0 * transmissivity);

/// 201 columns of 10 m: the river fills column 0 (its centre is the river line), the well is
/// 20 columns east, an external boundary on the east edge 2 km away drives a regional flow to
/// the river in both runs. Rows 10 m at the well, doubling to 3 km north and south (the row heights
/// do not enter the depletion, see grid_error). The east boundary's image across it lies 3.8 km
/// from the river: its share of the depletion, erfc(3800 / sqrt(4 D t)), stays below 1e-6 to t =
/// 0.3.
Model river_model(int steps, double growth) {
  AquiferSpec s;
  s.top = 0.0;
  s.bottom = -10.0;
  s.k = 10.0;                 // T = 100
  s.specific_storage = 1e-5;  // S = 1e-4
  s.initial_head = 20.0;
  Model m = make_model(std::vector<double>(201, h), geometric_spacing(10.0, 2.0, 3000.0), s);
  m.initial.steady = true;
  const int row = m.grid.n_rows() / 2;
  add_well(m, row, 20, {rate, rate, 0.0});
  m.wells[0].name = "supply well";
  // Conductances proportional to the row height (per unit length of river or edge), so that
  // the row sums of the discrete equations form the one-dimensional scheme below exactly.
  // River bed 1e5 L/T per unit length (1e3 T): its resistance equals T / 1e5 = 1e-3 L of
  // aquifer (bed_error); larger conductances leave the steady start to rounding.
  River river{"creek", column_cells(m, 0), {}, PeriodValues(20.0), PeriodValues(-100.0), {}};
  ExternalHead edge{"east hills", column_cells(m, 200), PeriodValues(21.0), {}};
  std::vector<double> river_c, edge_c;
  for (int r = 0; r < m.grid.n_rows(); ++r) {
    river.length.push_back(m.grid.dy(r));
    river_c.push_back(bed_conductance * m.grid.dy(r));
    edge_c.push_back(1.0 * m.grid.dy(r));
  }
  river.conductance = PeriodValues({river_c}, {});
  edge.conductance = PeriodValues({edge_c}, {});
  m.rivers.push_back(river);
  m.external_heads.push_back(edge);
  m.periods.clear();
  add_period(m, 0.05, steps, growth);  // 0 .. 5 a
  add_period(m, 0.15, steps, 1.0);     // .. 20 a
  add_period(m, 0.10, steps, growth);  // recovery, .. 30 a
  m.solver.threads = 1;                // a small grid: threads would only wait for each other
  return m;
}

/// Glover and Balmer (1954) depletion fraction of a well pumping from 0 to `stop`, by
/// superposition of an equal injection from `stop` on.
double fraction(double t) {
  double f = glover_balmer_depletion_fraction(distance, transmissivity, storativity, t);
  if (t > stop)
    f -= glover_balmer_depletion_fraction(distance, transmissivity, storativity, t - stop);
  return f;
}

/// Leading term of the spatial error of the depletion fraction. Summed over rows, the
/// five-point scheme of this model is exactly the three-point scheme in x (the y fluxes cancel
/// at the no-flow edges; storage and bed conductances are proportional to the row height). In
/// the Laplace domain its depletion is Q/s exp(-kappa d) with cosh(kappa h) = 1 + s h^2/(2 D),
/// D = T/S, against Q/s exp(-k d), k = sqrt(s / D): kappa = k (1 - k^2 h^2 / 24 + O(h^4)), so
/// the error is (d h^2 / 24) Q k^3 e^{-kd} / s = -(d h^2 / 24) d^3/dd^3 [Q erfc(d / (2 sqrt(D
/// t)))], i.e. (h/d)^2 z^3 (2 z^2 - 1) e^{-z^2} / (6 sqrt(pi)) of Q with z = sqrt(a / t).
double grid_error(double t) {
  auto term = [](double tt) {
    if (tt <= 0.0) return 0.0;
    const double z = std::sqrt(a / tt);
    return (h / distance) * (h / distance) * z * z * z * (2 * z * z - 1) * std::exp(-z * z) /
           (6.0 * std::sqrt(boost::math::constants::pi<double>()));
  };
  return term(t) - (t > stop ? term(t - stop) : 0.0);
}

/// Leading term of the river bed's effect. Along a bed of conductance c per unit length the
/// one-dimensional scheme has T u'(0) = c u(0) instead of u(0) = 0; in the Laplace domain the
/// depletion becomes Q/s e^{-kd} / (1 + k T / c), i.e. to first order that of a river
/// delta = T / c farther away: -delta d/dd [Q erfc(d / (2 sqrt(D t)))], which is
/// delta e^{-z^2} / sqrt(pi D t) of Q.
double bed_error(double t) {
  auto term = [](double tt) {
    if (tt <= 0.0) return 0.0;
    const double delta = transmissivity / bed_conductance;
    const double diffusivity = transmissivity / storativity;
    return delta * std::exp(-a / tt) /
           std::sqrt(boost::math::constants::pi<double>() * diffusivity * tt);
  };
  return term(t) - (t > stop ? term(t - stop) : 0.0);
}

template <class F>
double integral(F f, double t0, double t1) {
  // Split at the stop, where the superposed term starts with all derivatives zero.
  if (t0 < stop && t1 > stop) return integral(f, t0, stop) + integral(f, stop, t1);
  return boost::math::quadrature::gauss_kronrod<double, 61>::integrate(f, t0, t1, 15, 1e-13);
}

const WaterSources& sources_of(int steps, double growth) {
  static std::map<int, WaterSourcesRun> runs;
  if (!runs.count(steps)) {
    const std::size_t chosen = 0;
    runs[steps] = run_water_sources(river_model(steps, growth), std::span(&chosen, 1));
    INFO(runs[steps].failure);
    REQUIRE(runs[steps].converged);
  }
  return runs[steps].sources;
}

std::size_t line_of(const WaterSources& s, const std::string& source) {
  for (std::size_t k = 0; k < s.lines.size(); ++k)
    if (s.lines[k].source == source) return k;
  FAIL("no line " << source);
  return 0;
}

}  // namespace

TEST_CASE("river share of the water pumped follows Glover and Balmer", "[water_sources]") {
  // Three step sequences, each step about halved from one to the next. Backward Euler is
  // first order in time, so 2 V(n/2) - V(n) removes the leading time error (Richardson); the
  // two extrapolations then differ by the second-order remainder, and their difference bounds
  // what is left of the time error of the finer one (its estimate is a third of it). The
  // grid's and the river bed's errors are the leading terms derived above.
  const WaterSources& s1 = sources_of(30, 1.04);
  const WaterSources& s2 = sources_of(60, std::pow(1.04, 0.5));
  const WaterSources& s4 = sources_of(120, std::pow(1.04, 0.25));
  const std::size_t river = line_of(s4, "river");
  // Grid and bed terms taken with their sizes, not their signs.
  auto abs_grid_error = [](double t) { return std::abs(grid_error(t)) + std::abs(bed_error(t)); };
  double worst = 0.0;
  for (std::size_t p = 0; p < s4.periods.size(); ++p) {
    const SourcePeriod& f = s4.periods[p];
    // Cumulative from 0 (all periods, also after pumping stops), and per pumping period.
    const double pumped = rate * std::min(f.end, stop);
    CHECK(f.cumulative_withdrawn == Approx(pumped).epsilon(1e-12));
    const double e1 = 2.0 * s2.periods[p].cumulative[river] - s1.periods[p].cumulative[river];
    const double e2 = 2.0 * f.cumulative[river] - s2.periods[p].cumulative[river];
    const double exact = rate * integral(fraction, 0.0, f.end);
    const double grid = rate * integral(abs_grid_error, 0.0, f.end);
    INFO("to t = " << f.end << ": cumulative river share " << f.cumulative[river] / pumped
                   << ", extrapolated " << e2 / pumped << ", Glover-Balmer " << exact / pumped
                   << ", time term " << std::abs(e1 - e2) / pumped << ", grid and bed terms "
                   << grid / pumped);
    CHECK(std::abs(e2 - exact) <= std::abs(e1 - e2) + grid);
    worst = std::max(worst, std::abs(f.cumulative[river] - exact) / pumped);
    if (f.withdrawn > 0.0) {
      const double v1 = 2.0 * s2.periods[p].volume[river] - s1.periods[p].volume[river];
      const double v2 = 2.0 * f.volume[river] - s2.periods[p].volume[river];
      const double period_exact = rate * integral(fraction, f.start, f.end);
      const double period_grid = rate * integral(abs_grid_error, f.start, f.end);
      INFO("share in the period " << f.volume[river] / f.withdrawn << ", extrapolated "
                                  << v2 / f.withdrawn << ", Glover-Balmer "
                                  << period_exact / f.withdrawn);
      CHECK(std::abs(v2 - period_exact) <= std::abs(v1 - v2) + period_grid);
    }
  }
  WARN("Glover-Balmer: largest cumulative river-share error of the finest run (not extrapolated) "
       << worst);
}
