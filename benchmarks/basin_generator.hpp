#pragma once
// Synthetic basin models of any size for benchmarks: a smooth heterogeneous K field, a well
// field, areal recharge, a fixed-head west edge and two transient periods (pumping, recovery).
#include <cmath>
#include <numbers>
#include <string>

#include "solver/model.hpp"

namespace aquiledger::bench {

struct BasinSpec {
  int n_rows = 100;
  int n_cols = 100;
  bool switching = false;      ///< false: confined
  int steps_per_period = 30;
  int n_wells = 16;
};

inline Model make_basin(const BasinSpec& spec) {
  Model m;
  m.title = "benchmark basin";
  const double cell = 100.0;  // m
  m.grid = RectilinearGrid(std::vector<double>(spec.n_cols, cell), std::vector<double>(spec.n_rows, cell), 0.0, 0.0);
  const std::size_t n = static_cast<std::size_t>(m.grid.n_cells());
  Aquifer& a = m.aquifer;
  a.condition = spec.switching ? Condition::switching : Condition::confined;
  a.top.assign(n, 40.0);
  a.bottom.assign(n, 0.0);
  a.kx.resize(n);
  const double lx = spec.n_cols * cell, ly = spec.n_rows * cell;
  for (int r = 0; r < spec.n_rows; ++r)
    for (int c = 0; c < spec.n_cols; ++c) {
      const double x = m.grid.x_center(c) / lx, y = m.grid.y_center(r) / ly;
      a.kx[m.grid.cell(r, c).value] =
          10.0 * std::exp(0.8 * std::sin(2 * std::numbers::pi * 3 * x) * std::cos(2 * std::numbers::pi * 2 * y));
    }
  a.ky = a.kx;
  a.specific_storage.assign(n, 2.0e-6);
  if (spec.switching) a.specific_yield.assign(n, 0.15);
  m.initial.head.assign(n, spec.switching ? 40.5 : 60.0);

  for (int p = 0; p < 2; ++p)
    m.periods.push_back({p == 0 ? "pumping" : "recovery", 365.0, spec.steps_per_period, 1.0, false});

  FixedHead west{"west edge", {}, PeriodValues(spec.switching ? 40.5 : 60.0)};
  for (int r = 0; r < spec.n_rows; ++r) west.cells.push_back(m.grid.cell(r, 0));
  m.fixed_heads.push_back(std::move(west));

  Recharge rch{"areal recharge", {}, PeriodValues(2.0e-4)};
  for (int i = 0; i < m.grid.n_cells(); ++i) rch.cells.push_back(CellIndex{i});
  m.recharges.push_back(std::move(rch));

  const int side = static_cast<int>(std::ceil(std::sqrt(spec.n_wells)));
  // Rates scale with the basin area so that drawdowns are alike at every size.
  const double rate = 0.5 * 2.0e-4 * lx * ly / spec.n_wells * (spec.switching ? 6.0 : 2.0);
  for (int k = 0; k < spec.n_wells; ++k) {
    const int r = (2 * (k / side) + 1) * spec.n_rows / (2 * side);
    const int c = spec.n_cols / 4 + (2 * (k % side) + 1) * (3 * spec.n_cols / 4) / (2 * side);
    Well w;
    w.name = "well " + std::to_string(k + 1);
    w.cell = m.grid.cell(std::min(r, spec.n_rows - 1), std::min(c, spec.n_cols - 1));
    const RowCol rc = m.grid.row_col(w.cell);
    w.x = m.grid.x_center(rc.col);
    w.y = m.grid.y_center(rc.row);
    w.rate = PeriodValues({{rate}, {0.0}}, {0, 1});
    m.wells.push_back(std::move(w));
  }
  m.output.fields = FieldCadence::none;
  return m;
}

}  // namespace aquiledger::bench
