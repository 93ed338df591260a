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
