#include "mesh/polyline_crossing.hpp"

#include <algorithm>
#include <cmath>
#include <unordered_map>

namespace aquiledger {

namespace {

/// Parameters t in (0, 1) where the segment a + t (b - a) meets one of the edges.
void add_crossings(double a, double b, std::span<const double> edges, std::vector<double>& t) {
  if (a == b) return;
  const double lo = std::min(a, b), hi = std::max(a, b);
  for (double e : edges)
    if (e > lo && e < hi) t.push_back((e - a) / (b - a));
}

void add_weight(std::vector<std::pair<std::size_t, double>>& weights, std::size_t vertex,
                double w) {
  for (auto& [v, sum] : weights)
    if (v == vertex) {
      sum += w;
      return;
    }
  weights.emplace_back(vertex, w);
}

}  // namespace

PolylineCrossing cross_polyline(const RectilinearGrid& grid,
                                std::span<const std::array<double, 2>> points) {
  PolylineCrossing out;
  std::unordered_map<std::int32_t, std::size_t> slot;  // cell -> position in out.active
  std::vector<double> t;
  for (std::size_t s = 0; s + 1 < points.size(); ++s) {
    const auto& a = points[s];
    const auto& b = points[s + 1];
    const double length = std::hypot(b[0] - a[0], b[1] - a[1]);
    out.total_length += length;
    if (length == 0.0) continue;
    t.assign({0.0, 1.0});
    add_crossings(a[0], b[0], grid.x_edges(), t);
    add_crossings(a[1], b[1], grid.y_edges(), t);
    std::sort(t.begin(), t.end());
    for (std::size_t k = 0; k + 1 < t.size(); ++k) {
      const double piece = length * (t[k + 1] - t[k]);
      if (piece <= 0.0) continue;
      const double tm = 0.5 * (t[k] + t[k + 1]);
      const auto cell = grid.locate(a[0] + tm * (b[0] - a[0]), a[1] + tm * (b[1] - a[1]));
      if (!cell) {
        out.outside_length += piece;
      } else if (!grid.is_active(*cell)) {
        out.inactive_length += piece;
      } else {
        auto [it, fresh] = slot.try_emplace(cell->value, out.active.size());
        if (fresh) out.active.push_back({*cell, 0.0, {}});
        CellLength& cl = out.active[it->second];
        cl.length += piece;
        add_weight(cl.vertex_weights, s, piece * (1.0 - tm));
        add_weight(cl.vertex_weights, s + 1, piece * tm);
      }
    }
  }
  return out;
}

}  // namespace aquiledger
