#pragma once
// Builds aquiledger::Model values directly for tests (no TOML): a uniform aquifer on a
// rectilinear grid, with helpers to add periods and stresses.
#include <algorithm>
#include <cmath>
#include <vector>

#include "solver/model.hpp"

namespace aquiledger::test {

struct AquiferSpec {
  Condition condition = Condition::confined;
  double top = 10.0;               ///< L
  double bottom = 0.0;             ///< L
  double k = 10.0;                 ///< L/T
  double specific_storage = 1e-5;  ///< 1/L
  double specific_yield = 0.2;     ///< -
  double initial_head = 20.0;      ///< L
};

/// Widths growing geometrically away from a central cell: mirrored side, centre, side, with
/// the side extended until it spans at least `half_span` (L).
inline std::vector<double> geometric_spacing(double centre, double growth, double half_span) {
  std::vector<double> side;
  double w = centre, sum = 0.5 * centre;
  while (sum < half_span) {
    w *= growth;
    side.push_back(w);
    sum += w;
  }
  std::vector<double> all(side.rbegin(), side.rend());
  all.push_back(centre);
  all.insert(all.end(), side.begin(), side.end());
  return all;
}

inline Model make_model(std::vector<double> dx, std::vector<double> dy, const AquiferSpec& a) {
  Model m;
  m.title = "test";
  m.grid = RectilinearGrid(std::move(dx), std::move(dy), 0.0, 0.0);
  const auto n = static_cast<std::size_t>(m.grid.n_cells());
  Aquifer& aq = m.aquifer;
  aq.condition = a.condition;
  aq.top.assign(n, a.top);
  aq.bottom.assign(n, a.bottom);
  aq.kx.assign(n, a.k);
  aq.ky.assign(n, a.k);
  aq.specific_storage.assign(n, a.specific_storage);
  if (a.condition != Condition::confined) aq.specific_yield.assign(n, a.specific_yield);
  m.initial.head.assign(n, a.initial_head);
  return m;
}

inline void add_period(Model& m, double length, int steps, double growth = 1.0,
                       bool steady = false) {
  Period p;
  p.name = "period " + std::to_string(m.periods.size() + 1);
  p.length = length;
  p.steps = steps;
  p.growth = growth;
  p.steady = steady;
  m.periods.push_back(p);
}

/// rates: one value per period, or one for all.
inline void add_well(Model& m, int row, int col, std::vector<double> rates) {
  Well w;
  w.name = "well " + std::to_string(m.wells.size() + 1);
  w.cell = m.grid.cell(row, col);
  w.x = m.grid.x_center(col);
  w.y = m.grid.y_center(row);
  std::vector<std::vector<double>> tables;
  std::vector<std::uint32_t> map;
  for (double r : rates)
    tables.push_back({r}), map.push_back(static_cast<std::uint32_t>(map.size()));
  w.rate = rates.size() == 1 ? PeriodValues(rates[0]) : PeriodValues(tables, map);
  m.wells.push_back(w);
}

inline void add_fixed_head(Model& m, std::vector<CellIndex> cells, double head) {
  FixedHead f;
  f.name = "fixed " + std::to_string(m.fixed_heads.size() + 1);
  f.cells = std::move(cells);
  f.head = PeriodValues(head);
  m.fixed_heads.push_back(f);
}

/// Uniform recharge over every active cell; rates one per period or one for all (L/T).
inline void add_recharge(Model& m, std::vector<double> rates) {
  Recharge r;
  r.name = "recharge " + std::to_string(m.recharges.size() + 1);
  for (int i = 0; i < m.grid.n_cells(); ++i)
    if (m.grid.is_active(CellIndex{i})) r.cells.push_back(CellIndex{i});
  std::vector<std::vector<double>> tables;
  std::vector<std::uint32_t> map;
  for (double v : rates)
    tables.push_back({v}), map.push_back(static_cast<std::uint32_t>(map.size()));
  r.rate = rates.size() == 1 ? PeriodValues(rates[0]) : PeriodValues(tables, map);
  m.recharges.push_back(r);
}

/// Uniform no-delay interbeds of total thickness b (L), Ske and Skv (1/L), the initial
/// preconsolidation head `offset` (L) below the initial head.
inline void add_interbeds(Model& m, double b, double ske, double skv, double offset) {
  const auto n = static_cast<std::size_t>(m.grid.n_cells());
  Interbeds ib;
  ib.thickness.assign(n, b);
  ib.elastic_storage.assign(n, ske);
  ib.inelastic_storage.assign(n, skv);
  ib.preconsolidation_offset = offset;
  m.aquifer.interbeds = ib;
}

/// Uniform delay beds in every cell: `count` beds of equivalent thickness b (L), Kv (L/T),
/// Ske and Skv (1/L), `nodes` slices per half-bed (needs add_interbeds first).
inline void add_delay_beds(Model& m, double count, double b, double kv, double ske, double skv,
                           int nodes) {
  const auto n = static_cast<std::size_t>(m.grid.n_cells());
  DelayBeds d;
  d.count.assign(n, count);
  d.thickness.assign(n, b);
  d.vertical_k.assign(n, kv);
  d.elastic_storage.assign(n, ske);
  d.inelastic_storage.assign(n, skv);
  d.nodes = nodes;
  m.aquifer.interbeds->delay = d;
}

inline std::vector<CellIndex> column_cells(const Model& m, int col) {
  std::vector<CellIndex> cells;
  for (int r = 0; r < m.grid.n_rows(); ++r) cells.push_back(m.grid.cell(r, col));
  return cells;
}

/// 5 x 5 water-table aquifer, 2 m saturated, a well in the centre pumping more than the
/// aquifer can deliver, then recharge.
inline Model drying_model() {
  AquiferSpec a;
  a.condition = Condition::water_table;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 0.5;
  a.specific_yield = 0.1;
  a.initial_head = 2.0;
  Model m = make_model(std::vector<double>(5, 10.0), std::vector<double>(5, 10.0), a);
  add_period(m, 20.0, 20, 1.1);
  add_period(m, 40.0, 20, 1.1);
  add_well(m, 2, 2, {20.0, 0.0});
  add_recharge(m, {0.0, 0.01});
  return m;
}

}  // namespace aquiledger::test
