#pragma once
// Synthetic basin models of any size for benchmarks: a smooth heterogeneous K field, a well
// field, areal recharge, a fixed-head west edge and two transient periods (pumping, recovery).
#include <algorithm>
#include <cmath>
#include <numbers>
#include <string>

#include "solver/model.hpp"

namespace aquiledger::bench {

struct BasinSpec {
  int n_rows = 100;
  int n_cols = 100;
  bool switching = false;  ///< false: confined
  int steps_per_period = 30;
  /// Cells between wells of the regular well field (over the east three quarters): the well
  /// density, and so the drawdown pattern, is the same at every size.
  int well_spacing = 40;
  /// Withdrawal over the recharge falling on each well's square of the field (confined: 1,
  /// balanced; switching: 3, so that the water table falls below the top around the wells).
  double pumping_over_recharge() const { return switching ? 3.0 : 1.0; }
};

inline Model make_basin(const BasinSpec& spec) {
  Model m;
  m.title = "benchmark basin";
  const double cell = 100.0;  // m
  m.grid = RectilinearGrid(std::vector<double>(spec.n_cols, cell),
                           std::vector<double>(spec.n_rows, cell), 0.0, 0.0);
  const std::size_t n = static_cast<std::size_t>(m.grid.n_cells());
  Aquifer& a = m.aquifer;
  a.condition = spec.switching ? Condition::switching : Condition::confined;
  a.top.assign(n, 40.0);
  a.bottom.assign(n, 0.0);
  a.kx.assign(n, 0.0);
  const double lx = spec.n_cols * cell, ly = spec.n_rows * cell;
  for (int r = 0; r < spec.n_rows; ++r)
    for (int c = 0; c < spec.n_cols; ++c) {
      const double x = m.grid.x_center(c) / lx, y = m.grid.y_center(r) / ly;
      a.kx[m.grid.cell(r, c).value] = 10.0 * std::exp(0.8 * std::sin(2 * std::numbers::pi * 3 * x) *
                                                      std::cos(2 * std::numbers::pi * 2 * y));
    }
  a.ky = a.kx;
  a.specific_storage.assign(n, 2.0e-6);
  if (spec.switching) a.specific_yield.assign(n, 0.15);
  m.initial.head.assign(n, spec.switching ? 40.5 : 60.0);

  for (int p = 0; p < 2; ++p)
    m.periods.push_back(
        {p == 0 ? "pumping" : "recovery", 365.0, spec.steps_per_period, 1.0, false});

  FixedHead west{"west edge", {}, PeriodValues(spec.switching ? 40.5 : 60.0)};
  for (int r = 0; r < spec.n_rows; ++r) west.cells.push_back(m.grid.cell(r, 0));
  m.fixed_heads.push_back(std::move(west));

  const double recharge = 2.0e-4;  // m/d
  Recharge rch{"areal recharge", {}, PeriodValues(recharge)};
  for (int i = 0; i < m.grid.n_cells(); ++i) rch.cells.push_back(CellIndex{i});
  m.recharges.push_back(std::move(rch));

  const int sp = spec.well_spacing;
  const double rate = spec.pumping_over_recharge() * recharge * sp * sp * cell * cell;  // m3/d
  int k = 0;
  for (int r = sp / 2; r < spec.n_rows; r += sp)
    for (int c = spec.n_cols / 4 + sp / 2; c < spec.n_cols; c += sp) {
      Well w;
      w.name = "well " + std::to_string(++k);
      w.cell = m.grid.cell(r, c);
      w.x = m.grid.x_center(c);
      w.y = m.grid.y_center(r);
      w.rate = PeriodValues({{rate}, {0.0}}, {0, 1});
      m.wells.push_back(std::move(w));
    }
  m.output.fields = FieldCadence::none;
  return m;
}

}  // namespace aquiledger::bench
