#include "postproc/observation_sampler.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace aquiledger {
namespace {

/// Where a coordinate lies among the cell centres along one axis: between centres lo and
/// lo + 1 at fraction t (0 at lo, 1 at lo + 1), or beyond the outermost centres.
struct Bracket {
  bool inside = false;
  int lo = 0;
  double t = 0.0;
};

/// centres must be monotonic (ascending or descending) with at least one entry.
Bracket bracket(const std::vector<double>& centres, double v) {
  const int n = static_cast<int>(centres.size());
  if (n < 2) return {};
  const bool ascending = centres.back() > centres.front();
  const double first = centres.front();
  const double last = centres.back();
  const bool beyond = ascending ? (v < first || v > last) : (v > first || v < last);
  if (beyond) return {};
  int lo = 0;
  while (lo + 2 < n && (ascending ? v >= centres[lo + 1] : v <= centres[lo + 1])) ++lo;
  const double t = (v - centres[lo]) / (centres[lo + 1] - centres[lo]);
  return {true, lo, std::clamp(t, 0.0, 1.0)};
}

}  // namespace

ObservationSampler::ObservationSampler(const RectilinearGrid& grid,
                                       const std::vector<Observation>& observations)
    : whole_(GridPart::whole(grid)) {
  std::vector<double> xc(static_cast<std::size_t>(grid.n_cols()));
  std::vector<double> yc(static_cast<std::size_t>(grid.n_rows()));  // north to south
  for (int j = 0; j < grid.n_cols(); ++j) xc[j] = grid.x_center(j);
  for (int i = 0; i < grid.n_rows(); ++i) yc[i] = grid.y_center(i);

  stencils_.reserve(observations.size());
  for (const Observation& obs : observations) {
    Stencil s;
    const std::optional<CellIndex> home = grid.locate(obs.x, obs.y);
    if (!home) {  // outside the grid: no head (NaN)
      stencils_.push_back(s);
      continue;
    }
    const RowCol rc = grid.row_col(*home);
    const Bracket bx = bracket(xc, obs.x);
    const Bracket by = bracket(yc, obs.y);
    // Candidate corners (row, col, weight); rows follow the raster order, so by.lo is the
    // northern centre and t grows southward.
    struct Corner {
      int row, col;
      double w;
    };
    std::vector<Corner> corners;
    if (bx.inside && by.inside) {
      corners = {{by.lo, bx.lo, (1 - bx.t) * (1 - by.t)},
                 {by.lo, bx.lo + 1, bx.t * (1 - by.t)},
                 {by.lo + 1, bx.lo, (1 - bx.t) * by.t},
                 {by.lo + 1, bx.lo + 1, bx.t * by.t}};
    } else if (by.inside) {  // beyond the outermost column centres: along y only
      corners = {{by.lo, rc.col, 1 - by.t}, {by.lo + 1, rc.col, by.t}};
    } else if (bx.inside) {  // beyond the outermost row centres: along x only
      corners = {{rc.row, bx.lo, 1 - bx.t}, {rc.row, bx.lo + 1, bx.t}};
    }
    const bool all_active =
        !corners.empty() && std::all_of(corners.begin(), corners.end(), [&](const Corner& c) {
          return grid.is_active(grid.cell(c.row, c.col));
        });
    if (all_active) {
      s.n = static_cast<int>(corners.size());
      for (int k = 0; k < s.n; ++k) {
        s.cells[k] = grid.cell(corners[k].row, corners[k].col);
        s.weights[k] = corners[k].w;
      }
    } else {  // corner half-cells, or an inactive neighbour: the containing cell's head
      s.n = 1;
      s.cells[0] = *home;
      s.weights[0] = 1.0;
    }
    stencils_.push_back(s);
  }
}

std::vector<double> ObservationSampler::sample(std::span<const double> head) const {
  return sample(head, whole_);
}

std::vector<double> ObservationSampler::sample(CellValues head, const GridPart& part) const {
  std::vector<double> values(stencils_.size(), std::numeric_limits<double>::quiet_NaN());
  for (std::size_t k = 0; k < stencils_.size(); ++k) {
    const Stencil& s = stencils_[k];
    if (s.n == 0) continue;
    double sum = 0.0;
    // Zero weights are skipped so that a point on a centre line ignores the far cells.
    for (int i = 0; i < s.n; ++i)
      if (s.weights[i] != 0.0 && part.owns(s.cells[i]))
        sum += s.weights[i] * head[static_cast<std::size_t>(s.cells[i].value)];
    values[k] = sum;
  }
  return values;
}

void ObservationSampler::add_transposed(std::size_t observation, double a,
                                        std::span<double> g) const {
  const Stencil& s = stencils_[observation];
  for (int i = 0; i < s.n; ++i)
    if (s.weights[i] != 0.0) g[static_cast<std::size_t>(s.cells[i].value)] += a * s.weights[i];
}

}  // namespace aquiledger
