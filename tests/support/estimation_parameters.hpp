#pragma once
// Parameters for the estimation tests (tests/postproc/test_parameter_estimation.cpp,
// test_adjoint_gradient.cpp): a multiplier on cells or features, the cells of a band of
// columns to put one on, and bores to measure heads at.
#include <string>
#include <utility>
#include <vector>

#include "postproc/estimation_setup.hpp"
#include "solver/model.hpp"

namespace aquiledger::test {

/// A multiplier parameter starting at 1, bounded to 0.05..20.
inline EstimatedParameter multiplier_parameter(const std::string& name, ParameterProperty prop,
                                               std::vector<int> cells,
                                               std::vector<std::size_t> features = {}) {
  EstimatedParameter e;
  e.parameter = {name, prop, ParameterForm::multiplier, std::move(cells), std::move(features)};
  e.start = 1.0;
  e.lower = 0.05;
  e.upper = 20.0;
  return e;
}

/// The cells (raster indices) of columns first..last (0-based, both included).
inline std::vector<int> cells_in_columns(const Model& m, int first, int last) {
  std::vector<int> cells;
  for (int c = 0; c < m.grid.n_cells(); ++c) {
    const int col = m.grid.row_col(CellIndex{c}).col;
    if (col >= first && col <= last) cells.push_back(c);
  }
  return cells;
}

/// Bores "bore 1", "bore 2", ... at the given points, each in the cell holding it.
inline void add_bores(Model& m, const std::vector<std::pair<double, double>>& points) {
  for (std::size_t b = 0; b < points.size(); ++b) {
    Observation o;
    o.name = "bore " + std::to_string(b + 1);
    o.x = points[b].first;
    o.y = points[b].second;
    o.cell = *m.grid.locate(o.x, o.y);
    m.observations.push_back(o);
  }
}

}  // namespace aquiledger::test
