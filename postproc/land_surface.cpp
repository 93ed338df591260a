#include "postproc/land_surface.hpp"

#include <algorithm>
#include <cmath>

namespace aquiledger {

HeadsAboveSurface heads_above_land_surface(const Model& model, const GridPart& part,
                                           CellValues head, std::size_t n_worst) {
  HeadsAboveSurface out;
  const CellArray<double>& ground = model.aquifer.land_surface;
  if (ground.empty()) return out;
  for (std::int32_t i = part.first_owned(); i < part.end_owned(); ++i) {
    const CellIndex c{i};
    const auto k = static_cast<std::size_t>(i);
    if (!model.grid.is_active(c) || !(head[k] > ground[k])) continue;
    ++out.cells;
    out.worst.push_back({c, head[k] - ground[k]});
    std::sort(out.worst.begin(), out.worst.end(),
              [](const auto& a, const auto& b) { return a.excess > b.excess; });
    if (out.worst.size() > n_worst) out.worst.pop_back();
  }
  return out;
}

std::vector<double> depth_to_water(const Model& model, const GridPart& part, CellValues head) {
  const CellArray<double>& ground = model.aquifer.land_surface;
  if (ground.empty()) return {};
  std::vector<double> depth(part.n_owned(), std::nan(""));
  for (std::size_t k = 0; k < depth.size(); ++k) {
    const auto i = static_cast<std::size_t>(part.first_owned()) + k;
    if (model.grid.is_active(CellIndex{static_cast<std::int32_t>(i)}))
      depth[k] = ground[i] - head[i];
  }
  return depth;
}

}  // namespace aquiledger
