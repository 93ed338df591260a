// Benchmarks without a well: the erfc step response (Carslaw and Jaeger, 1959), Dupuit-
// Forchheimer flow with recharge, the drained closed aquifer (exact mass balance) and the
// compressibility split (Jacob, 1940). Units: m and d.
#include <cmath>
#include <vector>

#include "postproc/analytical_solutions.hpp"
#include "postproc/verification_support.hpp"

namespace aquiledger::verification {

VerificationResult benchmark_step_response() {
  VerificationResult res{"step_response",
                         "Sudden head rise at a boundary",
                         "Carslaw and Jaeger (1959)",
                         "head at 0..1 km, t 0.5 and 1 d; error over the step dH",
                         "-",
                         0.0,
                         0.0,
                         0,
                         false,
                         0.0,
                         {}};
  // T = 100 m2/d, S = 1e-2 (D = 1e4 m2/d); 800 cells of 5 m in one row; the west cell is
  // raised by dH = 2 m at t = 0. sqrt(4 D t) = 200 m at 1 d: the closed east end (4 km) is
  // far beyond the front.
  UniformAquifer a;
  a.specific_storage = 1e-3;
  const double dh = 2.0, diffusivity = 100.0 / 1e-2;
  Model m = uniform_model(std::vector<double>(800, 5.0), {10.0}, a);
  m.fixed_heads.push_back(
      FixedHead{"boundary", {m.grid.cell(0, 0)}, constant(a.initial_head + dh)});
  m.periods = {Period{"rise", 1.0, 120, 1.05, false}};
  Recorder r(m, false);
  run_or_throw(m, r);
  WorstPoint worst;
  // Space O(dx^2 / (4 D t)) ~ 1e-3 at the mid time; time: backward Euler with dt / t ~ 0.05
  // late in the period moves the front by ~ dt / 2, ~ 1 % of dH: tolerance 0.01.
  for (std::size_t s : {step_nearest(r, 0.5), r.steps.size() - 1}) {
    const double t = r.steps[s].time;
    for (int col = 1; col < 200; ++col) {
      const double x = m.grid.x_center(col) - m.grid.x_center(0);
      const double exact = a.initial_head + step_response(dh, diffusivity, x, t);
      worst.add((r.heads[s][static_cast<std::size_t>(col)] - exact) / dh, 0.01);
    }
  }
  finish(res, worst);
  VerificationCurve c{"step_response_profile",
                      "Head rise at t = 1 d",
                      "distance from the boundary (m)",
                      "head rise (m)",
                      {},
                      {},
                      {}};
  const std::size_t last = r.steps.size() - 1;
  for (int col = 1; col < 200; ++col) {
    const double x = m.grid.x_center(col) - m.grid.x_center(0);
    c.x.push_back(x);
    c.numerical.push_back(r.heads[last][static_cast<std::size_t>(col)] - a.initial_head);
    c.analytical.push_back(step_response(dh, diffusivity, x, r.steps[last].time));
  }
  res.curves.push_back(c);
  return res;
}

VerificationResult benchmark_dupuit() {
  VerificationResult res{"dupuit",
                         "Recharged water-table strip between two canals, two K zones",
                         "Dupuit (1863), Forchheimer (1886)",
                         "steady head; absolute error",
                         "m",
                         0.0,
                         0.0,
                         0,
                         false,
                         0.0,
                         {}};
  // Canals at 20 and 12 m above a flat base 1500 m apart (an 8 m head drop), recharge
  // 2 mm/d raising a mound between them, K = 20 m/d west of the middle and 5 m/d east of it,
  // on 25 m cells (60 across). The canal cells are 1 mm wide so their centres sit on the
  // strip's ends and the zone interface is a cell face. The closed form for two zones is
  // derived from the same discharge law (analytical_solutions.hpp).
  UniformAquifer a;
  a.condition = Condition::water_table;
  a.top = 40.0;
  a.kx = a.ky = 20.0;
  a.initial_head = 16.0;
  const double h1 = 20.0, h2 = 12.0, n_rate = 0.002, k_east = 5.0, end_width = 1e-3;
  std::vector<double> widths(62, 25.0);
  widths.front() = widths.back() = end_width;
  Model m = uniform_model(widths, {1.0}, a);
  for (int col = 31; col < m.grid.n_cols(); ++col)
    m.aquifer.kx[static_cast<std::size_t>(col)] = m.aquifer.ky[static_cast<std::size_t>(col)] =
        k_east;
  const int last = m.grid.n_cols() - 1;
  m.fixed_heads.push_back(FixedHead{"west canal", {m.grid.cell(0, 0)}, constant(h1)});
  m.fixed_heads.push_back(FixedHead{"east canal", {m.grid.cell(0, last)}, constant(h2)});
  m.recharges.push_back(Recharge{"recharge", all_cells(m), constant(n_rate)});
  m.periods = {Period{"steady", 1.0, 1, 1.0, true}};
  Recorder r(m, false);
  run_or_throw(m, r);
  const double length = m.grid.x_center(last) - m.grid.x_center(0);
  const double interface = 0.5 * end_width + 750.0;
  WorstPoint worst;
  VerificationCurve c{"dupuit_profile",
                      "Steady water table",
                      "distance from the west canal (m)",
                      "head above the base (m)",
                      {},
                      {},
                      {}};
  for (int col = 1; col < last; ++col) {
    const double x = m.grid.x_center(col) - m.grid.x_center(0);
    const double exact = dupuit_two_zone_head(h1, h2, length, n_rate, 20.0, k_east, interface, x);
    const double h = r.heads[0][static_cast<std::size_t>(col)];
    // Fixed in advance: 0.1 % of the 8 m head drop. The mean face thickness is second order
    // (test_simulation_dupuit.cpp: 2.5e-3 m here, falling fourfold per halving of the cells).
    worst.add(h - exact, 1e-3 * (h1 - h2));
    c.x.push_back(x);
    c.numerical.push_back(h);
    c.analytical.push_back(exact);
  }
  finish(res, worst);
  res.curves.push_back(c);
  return res;
}

VerificationResult benchmark_drainage() {
  VerificationResult res{"drainage",
                         "Closed aquifer drained across its top",
                         "exact mass balance, A dW/dt = N A",
                         "head at every step, confined then water table; absolute error",
                         "m",
                         0.0,
                         0.0,
                         0,
                         false,
                         0.0,
                         {}};
  // A closed switching aquifer (top 10 m, S = 1e-3, Sy = 0.1) starting at 10.5 m, drained by
  // a uniform 1 cm/d: the head falls at N / S to the top (t = 0.05 d), then at N / Sy.
  UniformAquifer a;
  a.condition = Condition::switching;
  a.specific_storage = 1e-4;
  a.specific_yield = 0.1;
  a.initial_head = 10.5;
  Model m = uniform_model({20.0, 20.0, 20.0}, {20.0, 20.0, 20.0}, a);
  const double rate = -0.01, s = 1e-3, sy = 0.1, t_top = s * 0.5 / 0.01;
  m.recharges.push_back(Recharge{"drainage", all_cells(m), constant(rate)});
  m.periods = {Period{"confined", 0.03, 1, 1.0, false}, Period{"crossing", 10.0, 1, 1.0, false},
               Period{"water table", 30.02, 5, 1.3, false}};
  auto exact = [&](double t) {
    return t <= t_top ? 10.5 + rate * t / s : 10.0 + rate * (t - t_top) / sy;
  };
  Recorder r(m, false);
  run_or_throw(m, r);
  WorstPoint worst;
  VerificationCurve c{"drainage_history",
                      "Head of the drained closed aquifer",
                      "time (d)",
                      "head (m)",
                      {0.0},
                      {r.initial[4]},
                      {exact(0.0)}};
  for (std::size_t k = 0; k < r.steps.size(); ++k) {
    // Newton is exact on each linear piece; the residual test leaves at most
    // flow_tolerance * |N| dt / Sy ~ 1e-6 m (test_simulation_closed_forms.cpp).
    for (double h : r.heads[k]) worst.add(h - exact(r.steps[k].time), 1e-6);
    c.x.push_back(r.steps[k].time);
    c.numerical.push_back(r.heads[k][4]);
    c.analytical.push_back(exact(r.steps[k].time));
  }
  finish(res, worst);
  res.curves.push_back(c);
  return res;
}

VerificationResult benchmark_compressibility() {
  VerificationResult res{"compressibility",
                         "Skeleton and water shares of elastic storage",
                         "Jacob (1940)",
                         "cumulative skeleton and water release; relative error",
                         "-",
                         0.0,
                         0.0,
                         0,
                         false,
                         0.0,
                         {}};
  // Jacob (1940): Ss = rho g (alpha + n beta); the skeleton releases alpha / (alpha + n beta)
  // of the elastic water, the water the rest. alpha = 5e-9 1/Pa, n = 0.25, beta = 4.6e-10
  // 1/Pa (water near 20 C, from memory), rho = 998.2 kg/m3, g = 9.80665 m/s2. A closed
  // confined aquifer pumped at 500 m3/d: all the water comes from storage.
  Compressibility comp;
  comp.skeleton = 5e-9;
  comp.porosity = 0.25;
  const double elastic = comp.skeleton + comp.porosity * comp.water;  // the expected shares below
  UniformAquifer a;
  a.specific_storage = specific_storage_per_metre(comp, comp.skeleton, comp.porosity);
  Model m = uniform_model(std::vector<double>(21, 50.0), std::vector<double>(21, 50.0), a);
  m.aquifer.compressibility = comp;
  m.aquifer.skeleton_share.assign(static_cast<std::size_t>(m.grid.n_cells()),
                                  skeleton_share_of_storage(comp, comp.skeleton, comp.porosity));
  const double q = 500.0;
  m.wells.push_back(
      Well{"well", m.grid.x_center(10), m.grid.y_center(10), m.grid.cell(10, 10), constant(q)});
  m.periods = {Period{"pumping", 5.0, 10, 1.2, false}};
  Recorder r(m, true);
  run_or_throw(m, r);
  WorstPoint worst;
  VerificationCurve c{"compressibility_skeleton",
                      "Water released by skeleton compression",
                      "time since pumping started (d)",
                      "cumulative volume (m3)",
                      {},
                      {},
                      {}};
  WaterBudget cumulative;
  for (std::size_t k = 0; k < r.steps.size(); ++k) {
    cumulative.add_scaled(r.budgets[k], r.steps[k].dt);
    const double pumped = q * r.steps[k].time;
    const double skeleton = cumulative[BudgetComponent::storage_skeleton].in -
                            cumulative[BudgetComponent::storage_skeleton].out;
    const double water = cumulative[BudgetComponent::storage_water].in -
                         cumulative[BudgetComponent::storage_water].out;
    const double skeleton_exact = pumped * comp.skeleton / elastic;
    const double water_exact = pumped * comp.porosity * comp.water / elastic;
    // The budget closes every step to 1e-6 percent (format contract, "Rules in detail"):
    // relative tolerance 1e-8 on each share of the pumped volume.
    worst.add((skeleton - skeleton_exact) / skeleton_exact, 1e-8);
    worst.add((water - water_exact) / water_exact, 1e-8);
    c.x.push_back(r.steps[k].time);
    c.numerical.push_back(skeleton);
    c.analytical.push_back(skeleton_exact);
  }
  finish(res, worst);
  res.curves.push_back(c);
  return res;
}

}  // namespace aquiledger::verification
