#pragma once
// Small helpers that build aquiledger::Model objects directly in C++ for the stress tests.
#include <cmath>
#include <cstddef>
#include <span>
#include <vector>

#include "solver/model.hpp"
#include "solver/simulation.hpp"

namespace aquiledger::stress_tests {

/// Uniform aquifer properties of a test model.
struct UniformAquifer {
  Condition condition = Condition::confined;
  double top = 0.0;                ///< L
  double bottom = -10.0;           ///< L
  double k = 10.0;                 ///< L/T
  double specific_storage = 1e-5;  ///< 1/L
  double specific_yield = 0.2;     ///< -
  double initial_head = 0.0;       ///< L
};

/// A grid of uniform widths dx (L) by dy (L) with the given aquifer and one period.
inline Model uniform_model(int n_rows, int n_cols, double dx, double dy, const UniformAquifer& a) {
  Model model;
  model.title = "stress test";
  model.grid = RectilinearGrid(std::vector<double>(static_cast<std::size_t>(n_cols), dx),
                               std::vector<double>(static_cast<std::size_t>(n_rows), dy), 0.0, 0.0);
  const auto n = static_cast<std::size_t>(model.grid.n_cells());
  Aquifer& aq = model.aquifer;
  aq.condition = a.condition;
  aq.top.assign(n, a.top);
  aq.bottom.assign(n, a.bottom);
  aq.kx.assign(n, a.k);
  aq.ky.assign(n, a.k);
  aq.specific_storage.assign(n, a.specific_storage);
  if (a.condition != Condition::confined) aq.specific_yield.assign(n, a.specific_yield);
  model.initial.head.assign(n, a.initial_head);
  model.periods.push_back(Period{"p1", 1.0, 1, 1.0, false});
  return model;
}

/// A grid whose column widths and row heights grow geometrically away from a central
/// column / row of width `inner` (L), to a half extent of at least `half_extent` (L), so a
/// well in the central cell sees a near-radial field over a large domain.
inline std::vector<double> telescoping_widths(double inner, double growth, double half_extent) {
  std::vector<double> half;
  double w = inner, sum = 0.5 * inner;
  while (sum < half_extent) {
    w *= growth;
    half.push_back(w);
    sum += w;
  }
  std::vector<double> widths(half.rbegin(), half.rend());
  widths.push_back(inner);
  widths.insert(widths.end(), half.begin(), half.end());
  return widths;
}

/// Every cell of the grid, in raster order.
inline std::vector<CellIndex> all_cells(const Model& model) {
  std::vector<CellIndex> cells;
  for (int i = 0; i < model.grid.n_cells(); ++i) cells.push_back(CellIndex{i});
  return cells;
}

/// A 10 x 12 switching aquifer starting confined (head 21 over a top at 20) with every kind
/// of stress, in three periods: transient, steady, transient with more pumping and a
/// negative recharge.
inline Model every_stress_model() {
  UniformAquifer a;
  a.condition = Condition::switching;
  a.top = 20.0;
  a.bottom = 0.0;
  a.k = 5.0;
  a.specific_storage = 1e-5;
  a.specific_yield = 0.15;
  a.initial_head = 21.0;
  Model m = uniform_model(10, 12, 100.0, 100.0, a);
  const RectilinearGrid& g = m.grid;
  auto column = [&](int col) {
    std::vector<CellIndex> cells;
    for (int r = 0; r < g.n_rows(); ++r) cells.push_back(g.cell(r, col));
    return cells;
  };
  auto per_period = [](std::vector<double> values) {
    std::vector<std::vector<double>> tables;
    std::vector<std::uint32_t> map;
    for (double v : values) {
      map.push_back(static_cast<std::uint32_t>(tables.size()));
      tables.push_back({v});
    }
    return PeriodValues(tables, map);
  };
  m.periods = {Period{"wet", 30.0, 10, 1.2, false}, Period{"steady", 10.0, 1, 1.0, true},
               Period{"dry", 100.0, 12, 1.3, false}};
  m.wells.push_back(Well{"supply", 550.0, 550.0, g.cell(4, 5), per_period({800.0, 800.0, 2500.0})});
  m.wells.push_back(Well{"injector", 950.0, 250.0, g.cell(7, 9), PeriodValues(-100.0)});
  m.fixed_heads.push_back(FixedHead{"lake", column(0), PeriodValues(18.0)});
  m.recharges.push_back(Recharge{"rain", all_cells(m), per_period({5e-4, 5e-4, -2e-4})});
  std::vector<CellIndex> river_cells = column(8);
  m.rivers.push_back(River{"creek", river_cells, std::vector<double>(river_cells.size(), 100.0),
                           PeriodValues(19.0), PeriodValues(18.5), PeriodValues(30.0)});
  m.drains.push_back(Drain{"tiles",
                           {g.cell(0, 3), g.cell(0, 4), g.cell(0, 5), g.cell(0, 6)},
                           PeriodValues(20.5),
                           PeriodValues(50.0)});
  m.external_heads.push_back(
      ExternalHead{"regional", column(11), PeriodValues(22.0), PeriodValues(20.0)});
  std::vector<CellIndex> meadow;
  for (int c = 1; c < 8; ++c) {
    meadow.push_back(g.cell(8, c));
    meadow.push_back(g.cell(9, c));
  }
  m.evapotranspiration.push_back(Evapotranspiration{"meadow", meadow, PeriodValues(21.0),
                                                    PeriodValues(2e-3), PeriodValues(2.0)});
  m.leakage = Leakage{"leakage", all_cells(m), PeriodValues(23.0), PeriodValues(1e-4)};
  // Compressibility route: the elastic storage splits into skeleton and water shares.
  m.aquifer.compressibility = Compressibility{};
  m.aquifer.skeleton_share.assign(static_cast<std::size_t>(g.n_cells()), 0.6);
  return m;
}

/// Keeps every accepted step's end time, length, period and heads.
class RecordingObserver : public SimulationObserver {
 public:
  struct Step {
    StepInfo info;
    std::vector<double> head_old;
    std::vector<double> head;
  };
  std::vector<double> initial;
  std::vector<Step> steps;

  void initial_state(std::span<const double> head) override {
    initial.assign(head.begin(), head.end());
  }
  void step_done(const StepInfo& info, std::span<const double> head_old,
                 std::span<const double> head_new) override {
    steps.push_back({info, {head_old.begin(), head_old.end()}, {head_new.begin(), head_new.end()}});
  }
  void period_done(std::size_t) override {}
};

}  // namespace aquiledger::stress_tests
