#include "postproc/numerical_well_test.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <sstream>
#include <stdexcept>

#include "mesh/quarter_radial_grid.hpp"
#include "postproc/parameter_estimation.hpp"

namespace aquiledger {
namespace {

enum class NumericalAquiferKind { confined, switching, water_table };

NumericalAquiferKind numerical_aquifer_kind(const PumpingTest& test) {
  if (!test.aquifer) return NumericalAquiferKind::confined;
  return test.aquifer->starts_confined() ? NumericalAquiferKind::switching
                                         : NumericalAquiferKind::water_table;
}

/// T since the start of pumping of the last drawdown measured after it began.
double numerical_test_length(const PumpingTest& test) {
  const double t0 = test.schedule.front().start;
  double last = 0.0;
  for (const ObservationSeries& w : test.wells)
    for (std::size_t i = 0; i < w.times.size(); ++i)
      if (w.times[i] > t0 && std::isfinite(w.drawdowns[i])) last = std::max(last, w.times[i] - t0);
  return last;
}

/// The first time (T, since the start of the test) of any well inside (from, to]; +inf if none.
double first_time_within(const PumpingTest& test, double from, double to) {
  double first = std::numeric_limits<double>::infinity();
  for (const ObservationSeries& w : test.wells)
    for (double t : w.times)
      if (t > from && t <= to) first = std::min(first, t);
  return first;
}

/// The storage that sets how far the cone spreads early on: S when the aquifer is (first)
/// confined, Sy for a water-table aquifer (p in numerical_parameter_names' order).
double spreading_storage(const std::vector<double>& p) { return p[1]; }

/// sqrt(2.25 T t / S) (L): the radius where the Cooper and Jacob (1946) line reaches zero.
double radius_of_influence(double transmissivity, double storage, double time) {
  return std::sqrt(2.25 * transmissivity * time / storage);
}

/// Every grid cell in ascending order (the quarter grid has no inactive cells).
std::vector<int> every_numerical_cell(const Model& model) {
  std::vector<int> cells(static_cast<std::size_t>(model.grid.n_cells()));
  for (std::size_t i = 0; i < cells.size(); ++i) cells[i] = static_cast<int>(i);
  return cells;
}

/// A set-up with the same parameters whose targets are each well's drawdowns at `times`
/// (per well, T since pumping began).
EstimationSetup numerical_setup_at(const EstimationSetup& fit_setup, const PumpingTest& test,
                                   const std::vector<std::vector<double>>& times) {
  EstimationSetup s;
  s.parameters = fit_setup.parameters;
  for (std::size_t w = 0; w < test.wells.size(); ++w) {
    EstimationTarget t;
    t.name = test.wells[w].name;
    t.kind = TargetKind::drawdown;
    t.bore = w;
    t.times = times[w];
    t.values.assign(t.times.size(), 0.0);
    t.weights.assign(t.times.size(), 1.0);
    s.targets.push_back(std::move(t));
  }
  return s;
}

}  // namespace

std::vector<std::string> numerical_parameter_names(const PumpingTest& test) {
  switch (numerical_aquifer_kind(test)) {
    case NumericalAquiferKind::confined:
      return {"transmissivity", "storativity"};
    case NumericalAquiferKind::switching:
      return {"transmissivity", "storativity", "specific_yield"};
    case NumericalAquiferKind::water_table:
      return {"transmissivity", "specific_yield"};
  }
  return {};
}

Model numerical_test_model(const PumpingTest& test, const std::vector<double>& p,
                           double grid_transmissivity, double grid_storativity,
                           const NumericalTestSettings& settings) {
  const NumericalAquiferKind kind = numerical_aquifer_kind(test);
  if (p.size() != numerical_parameter_names(test).size())
    throw std::invalid_argument("numerical: wrong number of parameters");
  if (test.schedule.empty() || test.wells.empty())
    throw std::invalid_argument("numerical: the test needs a rate schedule and a well");
  const double t0 = test.schedule.front().start;
  const double length = numerical_test_length(test);
  if (!(length > 0.0)) throw std::invalid_argument("numerical: no drawdown after pumping began");
  double r_min = std::numeric_limits<double>::infinity(), r_max = 0.0;
  for (const ObservationSeries& w : test.wells) {
    if (!w.images.empty())
      throw std::invalid_argument("numerical: well \"" + w.name +
                                  "\" has a straight boundary (image_distance), which the "
                                  "numerical model does not represent yet");
    r_min = std::min(r_min, w.distance);
    r_max = std::max(r_max, w.distance);
  }
  QuarterRadialGridSpec spec;
  spec.inner = settings.inner_fraction * r_min;
  spec.growth = settings.width_growth;
  for (const ObservationSeries& w : test.wells) spec.anchors.push_back(w.distance);
  spec.extent = std::max(
      settings.extent_factor * radius_of_influence(grid_transmissivity, grid_storativity, length),
      2.0 * r_max);

  Model m;
  m.title =
      "numerical model of " + (test.title.empty() ? std::string("a pumping test") : test.title);
  m.length_unit = test.length_unit;
  m.time_unit = test.time_unit;
  m.grid = quarter_radial_grid(spec);
  const auto n = static_cast<std::size_t>(m.grid.n_cells());
  Aquifer& a = m.aquifer;
  double top = 0.0, bottom = -1.0, head = 0.0;  // confined: a unit thickness, K = T, Ss = S
  if (test.aquifer) {
    top = test.aquifer->has_top ? test.aquifer->top : std::nan("");
    bottom = test.aquifer->bottom;
    head = test.aquifer->static_level;
  }
  const double thickness = test.aquifer ? test.aquifer->thickness() : 1.0;
  const double k = p[0] / thickness;
  a.condition = kind == NumericalAquiferKind::confined    ? Condition::confined
                : kind == NumericalAquiferKind::switching ? Condition::switching
                                                          : Condition::water_table;
  a.top.assign(n, top);
  a.bottom.assign(n, bottom);
  a.kx.assign(n, k);
  a.ky.assign(n, k);
  for (int row = 0; row < m.grid.n_rows(); ++row)
    for (int col = 0; col < m.grid.n_cols(); ++col) {
      const auto c = static_cast<std::size_t>(m.grid.cell(row, col).value);
      a.kx[c] = k * quarter_radial_x_factor(m.grid, col);
      a.ky[c] = k * quarter_radial_y_factor(m.grid, row);
    }
  const double elastic = kind == NumericalAquiferKind::water_table ? 0.0 : p[1] / thickness;
  a.specific_storage.assign(n, elastic);
  if (kind != NumericalAquiferKind::confined) a.specific_yield.assign(n, p.back());
  m.initial.head.assign(n, head);

  // One stress period per rate step that begins before the last drawdown.
  std::vector<std::vector<double>> rates;
  std::vector<std::uint32_t> table_of_period;
  for (std::size_t i = 0; i < test.schedule.size(); ++i) {
    const double begin = test.schedule[i].start - t0;
    if (begin >= length) break;
    const double end =
        i + 1 < test.schedule.size() ? std::min(test.schedule[i + 1].start - t0, length) : length;
    if (!(end > begin)) continue;
    // The first step a fraction of the first measurement after the step's start (of the
    // step's length when none falls inside it), the others growing by step_growth.
    const double first = first_time_within(test, begin + t0, end + t0) - t0 - begin;
    const double dt1 = settings.first_step_fraction * std::min(first, end - begin);
    const double g = settings.step_growth;
    const int steps = std::clamp(
        static_cast<int>(std::ceil(std::log1p((end - begin) * (g - 1.0) / dt1) / std::log(g))), 1,
        settings.max_steps_per_period);
    m.periods.push_back(Period{"rate step " + std::to_string(i + 1), end - begin, steps, g, false});
    // A quarter of the rate: the corner cell is a quarter of the well's cell.
    rates.push_back({0.25 * test.schedule[i].rate});
    table_of_period.push_back(static_cast<std::uint32_t>(rates.size() - 1));
  }
  m.wells.push_back(Well{"pumped well", 0.0, 0.0, m.grid.cell(m.grid.n_rows() - 1, 0),
                         PeriodValues(std::move(rates), std::move(table_of_period))});
  // Each well on the x axis at its distance: on the grid's south edge, beyond the centres of
  // the first row, so its head is interpolated along that row only (ObservationSampler),
  // whose centres lie where the whole grid's centres on the line through the well lie; the
  // columns are built with a centre at each well's distance (the anchors above), so no
  // interpolation error enters unless two wells lie within a cell of each other.
  for (const ObservationSeries& w : test.wells) {
    Observation o;
    o.name = w.name;
    o.x = w.distance;
    o.y = 0.0;
    o.cell = *m.grid.locate(o.x, o.y);
    m.observations.push_back(std::move(o));
  }
  m.output.fields = FieldCadence::none;
  m.output.budget = false;
  m.solver.threads = 1;
  return m;
}

EstimationSetup numerical_test_setup(const PumpingTest& test, const Model& model,
                                     const std::vector<double>& lower_over_start,
                                     const std::vector<double>& upper_over_start) {
  EstimationSetup setup;
  const std::vector<int> cells = every_numerical_cell(model);
  const std::vector<std::string> names = numerical_parameter_names(test);
  for (std::size_t j = 0; j < names.size(); ++j) {
    EstimatedParameter e;
    e.parameter.name = names[j];
    e.parameter.property = names[j] == "transmissivity" ? ParameterProperty::conductivity
                           : names[j] == "storativity"  ? ParameterProperty::specific_storage
                                                        : ParameterProperty::specific_yield;
    e.parameter.form = ParameterForm::multiplier;
    e.parameter.cells = cells;
    e.start = 1.0;
    e.lower = std::min(lower_over_start[j], 1.0);
    e.upper = std::max(upper_over_start[j], 1.0);
    setup.parameters.push_back(std::move(e));
  }
  const double t0 = test.schedule.front().start;
  for (std::size_t w = 0; w < test.wells.size(); ++w) {
    const ObservationSeries& well = test.wells[w];
    EstimationTarget t;
    t.name = well.name;
    t.kind = TargetKind::drawdown;
    t.bore = w;
    for (std::size_t i = 0; i < well.times.size(); ++i)
      if (well.times[i] > t0 && std::isfinite(well.drawdowns[i])) {
        t.times.push_back(well.times[i] - t0);
        t.values.push_back(well.drawdowns[i]);
        t.weights.push_back(1.0);
      }
    setup.targets.push_back(std::move(t));
  }
  setup.gradient = GradientMethod::forward;
  return setup;
}

ModelFit fit_numerical_pumping_test(const PumpingTest& test, const std::vector<double>& start,
                                    const std::vector<double>& lower,
                                    const std::vector<double>& upper,
                                    const NumericalTestSettings& settings) {
  const std::vector<std::string> names = numerical_parameter_names(test);
  const std::size_t k = names.size();
  if (start.size() != k || lower.size() != k || upper.size() != k)
    throw std::invalid_argument("numerical: one start value and bounds per parameter expected");
  const double length = numerical_test_length(test);
  std::vector<double> p = start;
  double grid_t = start[0], grid_s = spreading_storage(start);
  for (int round = 0;; ++round) {
    const Model base = numerical_test_model(test, p, grid_t, grid_s, settings);
    std::vector<double> lo(k), hi(k);
    for (std::size_t j = 0; j < k; ++j) lo[j] = lower[j] / p[j], hi[j] = upper[j] / p[j];
    const EstimationSetup setup = numerical_test_setup(test, base, lo, hi);
    if (setup.n_measurements() <= static_cast<int>(k) + 1)
      throw std::invalid_argument("numerical: only " + std::to_string(setup.n_measurements()) +
                                  " usable drawdowns, more than " + std::to_string(k + 1) +
                                  " are needed");
    const EstimationResult est = estimate_parameters(base, setup);
    std::vector<double> fitted(k);
    for (std::size_t j = 0; j < k; ++j)
      fitted[j] = p[j] * est.fit.parameters[static_cast<Eigen::Index>(j)];
    const double needed =
        settings.extent_factor * radius_of_influence(fitted[0], spreading_storage(fitted), length);
    const double reached = base.grid.x_max();
    if (needed > reached && round < 2) {  // the cone of the fitted values reaches the edge
      p = fitted;
      grid_t = fitted[0];
      grid_s = spreading_storage(fitted);
      continue;
    }
    ModelFit out;
    out.model = WellTestModel::numerical;
    out.parameter_names = names;
    out.fit = est.fit;
    for (std::size_t j = 0; j < k; ++j) {
      const auto i = static_cast<Eigen::Index>(j);
      out.fit.parameters[i] *= p[j];
      out.fit.lower_95[i] *= p[j];
      out.fit.upper_95[i] *= p[j];
    }
    out.n_used = setup.n_measurements();
    out.aicc = corrected_akaike_criterion(out.fit.weighted_sum_of_squares, out.n_used,
                                          static_cast<int>(k));
    out.rms_residual = std::sqrt(out.fit.weighted_sum_of_squares / out.n_used);
    // One more run for every time of every well and the charts' curve.
    const double t0 = test.schedule.front().start;
    std::vector<std::vector<double>> times(test.wells.size());
    out.curve_times.resize(test.wells.size());
    for (std::size_t w = 0; w < test.wells.size(); ++w) {
      const ObservationSeries& well = test.wells[w];
      double lo_t = std::numeric_limits<double>::infinity(), hi_t = 0.0;
      out.used.emplace_back(well.times.size(), false);
      for (std::size_t i = 0; i < well.times.size(); ++i)
        if (well.times[i] > t0) {
          times[w].push_back(well.times[i] - t0);
          lo_t = std::min(lo_t, well.times[i] - t0);
          hi_t = std::max(hi_t, well.times[i] - t0);
          out.used[w][i] = std::isfinite(well.drawdowns[i]);
        }
      if (hi_t > lo_t)
        for (int c = 0; c < 80; ++c)
          out.curve_times[w].push_back(
              t0 + std::exp(std::log(lo_t) + (std::log(hi_t) - std::log(lo_t)) * c / 79.0));
      for (double t : out.curve_times[w]) times[w].push_back(t - t0);
    }
    const SimulatedTargets all =
        simulate_targets(base, numerical_setup_at(setup, test, times), est.fit.parameters);
    Eigen::Index row = 0;
    out.fitted.resize(test.wells.size());
    out.curve.resize(test.wells.size());
    for (std::size_t w = 0; w < test.wells.size(); ++w) {
      for (double t : test.wells[w].times)
        out.fitted[w].push_back(t > t0 ? all.values[row++] : 0.0);
      for (std::size_t c = 0; c < out.curve_times[w].size(); ++c)
        out.curve[w].push_back(all.values[row++]);
    }
    std::ostringstream d;
    d.precision(4);
    int steps = 0;
    for (const Period& per : base.periods) steps += per.steps;
    d << "quarter radial grid of " << base.grid.n_cols() << " x " << base.grid.n_rows()
      << " cells, the well's cell " << 2.0 * base.grid.dx(0) << " " << test.length_unit
      << " wide, widths growing by " << settings.width_growth << " to " << reached << " "
      << test.length_unit << " (" << reached / (needed / settings.extent_factor)
      << " radii of influence of the fitted values); " << steps << " time steps in "
      << base.periods.size() << " rate step(s), growing by " << settings.step_growth << "; "
      << est.n_model_runs << " model runs with sensitivities";
    out.description = d.str();
    return out;
  }
}

}  // namespace aquiledger
