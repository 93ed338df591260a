// Benchmarks with a pumped well: Theis (1935), Papadopulos (1965), Hantush and Jacob (1955),
// Glover and Balmer (1954). Units: m and d.
#include <boost/math/constants/constants.hpp>
#include <cmath>
#include <vector>

#include "postproc/analytical_solutions.hpp"
#include "postproc/verification_support.hpp"
#include "solver/stress_flows.hpp"

namespace aquiledger::verification {

namespace {

constexpr double pi = boost::math::constants::pi<double>();
constexpr double rate = 1000.0;  ///< m3/d, withdrawal

Well well_at(const Model& m, int row, int col) {
  return Well{"well", m.grid.x_center(col), m.grid.y_center(row), m.grid.cell(row, col),
              PeriodValues(rate)};
}

double head_at(const std::vector<double>& head, const Model& m, int row, int col) {
  return head[static_cast<std::size_t>(m.grid.cell(row, col).value)];
}

/// A confined aquifer 10 m thick (Ss 1e-5 1/m, S = 1e-4) on a grid refined around a central
/// well: centre cell 2 m, widths growing by 10 % to 20 km on every side. The cone reaches
/// ~ 1.5 sqrt(T t / S) <= 9.5 km at 10 d for T <= 400 m2/d; the no-flow edges act as image
/// wells >= 40 km away, whose drawdown Q / (4 pi T) W(u >= 10) is below 1e-6 m.
Model pumped_confined(double kx, double ky) {
  UniformAquifer a;
  a.kx = kx;
  a.ky = ky;
  a.initial_head = 50.0;
  const std::vector<double> w = telescoping_widths(2.0, 1.1, 20000.0);
  Model m = uniform_model(w, w, a);
  const int mid = m.grid.n_cols() / 2;
  m.wells.push_back(well_at(m, mid, mid));
  // 80 steps over 10 d growing by 8 %.
  m.periods = {Period{"pumping", 10.0, 80, 1.08, false}};
  return m;
}

/// Drawdown profile along the row (dir 0) or column (dir 1) through the well at step s.
VerificationCurve profile(const Model& m, const Recorder& r, std::size_t s, int dir, double r_max,
                          const std::function<double(double, double)>& exact, std::string name,
                          std::string title) {
  VerificationCurve c{std::move(name),
                      std::move(title),
                      dir == 0 ? "distance east of the well (m)" : "distance south of the well (m)",
                      "drawdown (m)",
                      {},
                      {},
                      {}};
  const int mid = m.grid.n_cols() / 2;
  for (int k = mid + 1; k < m.grid.n_cols(); ++k) {
    const int row = dir == 0 ? mid : k, col = dir == 0 ? k : mid;
    const double d = dir == 0 ? m.grid.x_center(col) - m.grid.x_center(mid)
                              : m.grid.y_center(mid) - m.grid.y_center(row);
    if (d > r_max) break;
    c.x.push_back(d);
    c.numerical.push_back(r.initial[0] - head_at(r.heads[s], m, row, col));
    c.analytical.push_back(dir == 0 ? exact(d, 0.0) : exact(0.0, d));
  }
  return c;
}

/// Relative drawdown errors at radii 10..1000 m at the steps nearest 1, 5 and 10 d. Error
/// estimate (test_simulation_theis.cpp): spatial O((g - 1)^2) ~ 1 % relative on the smooth part of
/// the cone with growth g = 1.1, backward Euler with dt / t ~ 0.07 late in the period ~ 1 %:
/// tolerance 3 %. The well cell (2 m) and the far tail where s is tiny are left out.
void check_radial(const Model& m, const Recorder& r, int dir,
                  const std::function<double(double, double, double)>& exact, WorstPoint& worst) {
  const int mid = m.grid.n_cols() / 2;
  for (double t_want : {1.0, 5.0, 10.0}) {
    const std::size_t s = step_nearest(r, t_want);
    const double t = r.steps[s].time;
    for (int k = mid + 1; k < m.grid.n_cols(); ++k) {
      const int row = dir == 0 ? mid : k, col = dir == 0 ? k : mid;
      const double d = dir == 0 ? m.grid.x_center(col) - m.grid.x_center(mid)
                                : m.grid.y_center(mid) - m.grid.y_center(row);
      if (d < 10.0 || d > 1000.0) continue;
      const double s_ref = dir == 0 ? exact(d, 0.0, t) : exact(0.0, d, t);
      const double s_num = r.initial[0] - head_at(r.heads[s], m, row, col);
      worst.add((s_num - s_ref) / s_ref, 0.03);
    }
  }
}

}  // namespace

VerificationResult benchmark_theis() {
  VerificationResult res{"theis",
                         "Pumped confined aquifer",
                         "Theis (1935)",
                         "drawdown at r 10..1000 m, t 1, 5, 10 d; relative error",
                         "-",
                         0.0,
                         0.0,
                         0,
                         false,
                         0.0,
                         {}};
  const Model m = pumped_confined(10.0, 10.0);  // T = 100 m2/d
  Recorder r(m, false);
  run_or_throw(m, r);
  auto exact = [](double x, double y, double t) {
    return theis_drawdown(rate, 100.0, 1e-4, std::hypot(x, y), t);
  };
  WorstPoint worst;
  check_radial(m, r, 0, exact, worst);
  finish(res, worst);
  const std::size_t last = r.steps.size() - 1;
  res.curves.push_back(profile(
      m, r, last, 0, 5000.0, [&](double x, double y) { return exact(x, y, r.steps[last].time); },
      "theis_profile", "Drawdown along the well's row at t = 10 d"));
  // Time series at the cell centre nearest 100 m east of the well.
  const int mid = m.grid.n_cols() / 2;
  int col = mid + 1;
  while (m.grid.x_center(col + 1) - m.grid.x_center(mid) < 100.0) ++col;
  const double d = m.grid.x_center(col) - m.grid.x_center(mid);
  VerificationCurve c{
      "theis_history",
      "Drawdown " + std::to_string(static_cast<int>(std::round(d))) + " m from the well",
      "time since pumping started (d)",
      "drawdown (m)",
      {},
      {},
      {}};
  for (std::size_t s = 0; s < r.steps.size(); ++s) {
    c.x.push_back(r.steps[s].time);
    c.numerical.push_back(r.initial[0] - head_at(r.heads[s], m, mid, col));
    c.analytical.push_back(exact(d, 0.0, r.steps[s].time));
  }
  res.curves.push_back(c);
  return res;
}

VerificationResult benchmark_papadopulos() {
  VerificationResult res{"papadopulos",
                         "Pumped anisotropic aquifer (Kx = 4 Ky)",
                         "Papadopulos (1965)",
                         "drawdown along x and y at 10..1000 m, t 1, 5, 10 d; relative error",
                         "-",
                         0.0,
                         0.0,
                         0,
                         false,
                         0.0,
                         {}};
  // Tx = 200, Ty = 50 m2/d: T_e = sqrt(Tx Ty) = 100 m2/d. The same grid and steps as the
  // Theis benchmark; the five-point scheme stays second order on the scaled (stretched)
  // cells, so the same 3 % tolerance applies.
  const double tx = 200.0, ty = 50.0;
  const Model m = pumped_confined(tx / 10.0, ty / 10.0);
  Recorder r(m, false);
  run_or_throw(m, r);
  auto exact = [&](double x, double y, double t) {
    return papadopulos_drawdown(rate, tx, ty, 1e-4, x, y, t);
  };
  WorstPoint worst;
  check_radial(m, r, 0, exact, worst);
  check_radial(m, r, 1, exact, worst);
  finish(res, worst);
  const std::size_t last = r.steps.size() - 1;
  auto at_end = [&](double x, double y) { return exact(x, y, r.steps[last].time); };
  res.curves.push_back(profile(m, r, last, 0, 5000.0, at_end, "papadopulos_x",
                               "Drawdown along x (major axis) at t = 10 d"));
  res.curves.push_back(profile(m, r, last, 1, 5000.0, at_end, "papadopulos_y",
                               "Drawdown along y (minor axis) at t = 10 d"));
  return res;
}

namespace {

/// The pumped leaky aquifer of the Hantush-Jacob benchmark: T = 100 m2/d, S = 1e-4,
/// leakance 4e-4 1/d (B = sqrt(T / leakance) = 500 m), source head held at the initial head,
/// 20 m above the aquifer top (leakage stays linear). Cells `inner` m wide at the well
/// growing by `growth` to 10 km (20 B) on every side; the cone decays like exp(-r / B),
/// e^-20 at the edges.
Model pumped_leaky(double inner, double growth) {
  UniformAquifer a;
  a.top = 0.0;
  a.bottom = -10.0;
  a.initial_head = 20.0;
  const std::vector<double> w = telescoping_widths(inner, growth, 10000.0);
  Model m = uniform_model(w, w, a);
  const int mid = m.grid.n_cols() / 2;
  m.wells.push_back(well_at(m, mid, mid));
  m.leakage = Leakage{"leakage", all_cells(m), constant(20.0), constant(4e-4)};
  // 10 d = 40 B^2 S / T in 160 steps growing by 6 %.
  m.periods = {Period{"pumping", 10.0, 160, 1.06, false}};
  return m;
}

}  // namespace

VerificationResult benchmark_hantush_jacob() {
  VerificationResult res{"hantush_jacob",
                         "Pumped leaky confined aquifer",
                         "Hantush and Jacob (1955)",
                         "drawdown at r 35..1000 m, t 1, 5, 10 d; relative error",
                         "-",
                         0.0,
                         0.0,
                         0,
                         false,
                         0.0,
                         {}};
  const double transmissivity = 100.0, storativity = 1e-4;
  const double b = std::sqrt(transmissivity / 4e-4);
  const Model m = pumped_leaky(10.0, 1.1);
  Recorder r(m, false);
  run_or_throw(m, r);
  // The tolerance is fixed in advance as for Theis (check_radial): spatial O((g - 1)^2)
  // ~ 1 % relative with g = 1.1, backward Euler with dt / t ~ 0.06 late in the period
  // ~ 1 %: 3 %. From 3.5 inner cells on (r >= 35 m), where the well's point sink is resolved.
  const int mid = m.grid.n_cols() / 2;
  WorstPoint worst;
  for (double t_want : {1.0, 5.0, 10.0}) {
    const std::size_t n = step_nearest(r, t_want);
    const double t = r.steps[n].time;
    for (int k = 3; m.grid.x_center(mid + k) - m.grid.x_center(mid) <= 1000.0; ++k) {
      const double d = m.grid.x_center(mid + k) - m.grid.x_center(mid);
      const double exact = hantush_jacob_drawdown(rate, transmissivity, storativity, b, d, t);
      const double s_num = r.initial[0] - head_at(r.heads[n], m, mid, mid + k);
      worst.add((s_num - exact) / exact, 0.03);
    }
  }
  finish(res, worst);
  const std::size_t last = r.steps.size() - 1;
  res.curves.push_back(profile(
      m, r, last, 0, 3000.0,
      [&](double x, double) {
        return hantush_jacob_drawdown(rate, transmissivity, storativity, b, x, r.steps[last].time);
      },
      "hantush_jacob_profile", "Drawdown along the well's row at t = 10 d"));
  const double d = m.grid.x_center(mid + 5) - m.grid.x_center(mid);
  VerificationCurve c{
      "hantush_jacob_history",
      "Drawdown " + std::to_string(static_cast<int>(std::round(d))) + " m from the well",
      "time since pumping started (d)",
      "drawdown (m)",
      {},
      {},
      {}};
  for (std::size_t n = 0; n < r.steps.size(); ++n) {
    c.x.push_back(r.steps[n].time);
    c.numerical.push_back(r.initial[0] - head_at(r.heads[n], m, mid, mid + 5));
    c.analytical.push_back(
        hantush_jacob_drawdown(rate, transmissivity, storativity, b, d, r.steps[n].time));
  }
  res.curves.push_back(c);
  // The grid error on its own, apart from the check: the steady limit (de Glee; Hantush and
  // Jacob, 1955), Q / (2 pi T) K0(r / B), on grids whose growth - 1 halves each time. The
  // five-point scheme is second order in the local spacing ~ r (g - 1), so the largest
  // relative error over 35..1000 m should fall about fourfold per level; the analytical
  // column carries that second-order line from the coarsest grid.
  VerificationCurve g{"hantush_jacob_grid_convergence",
                      "Steady drawdown: largest relative grid error over 35..1000 m",
                      "cell growth factor minus one",
                      "relative error",
                      {},
                      {},
                      {}};
  for (auto [inner, growth] : {std::pair{10.0, 1.2}, {5.0, 1.1}, {2.5, 1.05}}) {
    Model steady = pumped_leaky(inner, growth);
    steady.periods = {Period{"steady", 1.0, 1, 1.0, true}};
    Recorder sr(steady, false);
    run_or_throw(steady, sr);
    const int c0 = steady.grid.n_cols() / 2;
    double largest = 0.0;
    for (int k = 1; k < steady.grid.n_cols() - c0; ++k) {
      const double dist = steady.grid.x_center(c0 + k) - steady.grid.x_center(c0);
      if (dist < 35.0) continue;
      if (dist > 1000.0) break;
      const double exact = steady_leaky_drawdown(rate, transmissivity, b, dist);
      const double s_num = sr.initial[0] - head_at(sr.heads[0], steady, c0, c0 + k);
      largest = std::max(largest, std::abs(s_num - exact) / exact);
    }
    g.x.push_back(growth - 1.0);
    g.numerical.push_back(largest);
    g.analytical.push_back(g.numerical.front() * std::pow((growth - 1.0) / 0.2, 2.0));
  }
  res.curves.push_back(g);
  return res;
}

VerificationResult benchmark_glover_balmer() {
  VerificationResult res{"glover_balmer",
                         "Well 200 m from a river",
                         "Glover and Balmer (1954)",
                         "river depletion rate, t >= d^2 S / (4 T); error vs per-step budget",
                         "m3/d",
                         0.0,
                         0.0,
                         0,
                         false,
                         0.0,
                         {}};
  // T = 100 m2/d, S = 1e-4, well 200 m from the centre line of a river held at its stage
  // through a bed conductance of 1e7 m2/d per 10 m cell (river cells within Q / C = 1e-4 m
  // of the stage). Columns 10 m to 400 m east of the river, then growing by 10 % to 100 km;
  // rows 10 m at the well growing by 10 % to 100 km north and south.
  const double transmissivity = 100.0, storativity = 1e-4, distance = 200.0;
  UniformAquifer a;
  a.top = 0.0;
  a.bottom = -10.0;
  std::vector<double> dx(40, 10.0);
  for (double w = 11.0, x = 400.0; x < 100000.0; w *= 1.1) {
    dx.push_back(w);
    x += w;
  }
  Model m = uniform_model(dx, telescoping_widths(10.0, 1.1, 100000.0), a);
  const int well_row = m.grid.n_rows() / 2, well_col = 20;
  m.wells.push_back(well_at(m, well_row, well_col));
  River river{"river", {}, {}, constant(a.initial_head), constant(-100.0), constant(1e7)};
  for (int row = 0; row < m.grid.n_rows(); ++row) {
    river.cells.push_back(m.grid.cell(row, 0));
    river.length.push_back(m.grid.dy(row));
  }
  m.rivers.push_back(river);
  m.periods = {Period{"pumping", 2.0, 120, 1.06, false}};  // 2 d in 120 steps growing by 6 %
  Recorder r(m, false);
  run_or_throw(m, r);

  const SystemLayout layout = make_system_layout(m);
  const std::vector<FeatureRef> features = list_features(m);
  std::size_t river_feature = 0;
  while (features[river_feature].kind != FeatureKind::river) ++river_feature;
  const double tau = distance * distance * storativity / (4.0 * transmissivity);  // 0.01 d
  WorstPoint worst;
  VerificationCurve c{"glover_balmer_depletion",
                      "Depletion of the river by the well",
                      "time since pumping started (d)",
                      "river depletion (m3/d)",
                      {},
                      {},
                      {}};
  for (std::size_t n = 0; n < r.steps.size(); ++n) {
    std::vector<FeatureFlow> flows(features.size());
    stress_flows_by_feature(m, layout, 0, r.heads[n], flows);
    const double t = r.steps[n].time, dt = r.steps[n].dt;
    const double depletion = flows[river_feature].in - flows[river_feature].out;
    const double exact =
        rate * glover_balmer_depletion_fraction(distance, transmissivity, storativity, t);
    c.x.push_back(t);
    c.numerical.push_back(depletion);
    c.analytical.push_back(exact);
    // Before t = d^2 S / (4 T) (u = 1 at the river) the depletion is under 16 % of Q and
    // carried by a front a few cells wide. Error budget: backward Euler lags half a step,
    // 0.5 dt dD/dt with dD/dt = Q / sqrt(pi) sqrt(tau) t^-3/2 exp(-tau / t).
    if (t < tau) continue;
    const double change =
        rate / std::sqrt(pi) * std::sqrt(tau) * std::pow(t, -1.5) * std::exp(-tau / t);
    worst.add(depletion - exact, 0.5 * dt * change);
  }
  finish(res, worst);
  res.curves.push_back(c);
  return res;
}

}  // namespace aquiledger::verification
