#pragma once
#include <span>
#include <vector>

#include "mesh/grid_part.hpp"
#include "mesh/rectilinear_grid.hpp"
#include "solver/model.hpp"

namespace aquiledger {

/// Interpolates heads at observation points as the format contract prescribes: bilinear
/// among the four surrounding active cell centres; along one direction only where the point
/// lies beyond the outermost centres in the other; otherwise the containing cell's head.
class ObservationSampler {
 public:
  ObservationSampler(const RectilinearGrid& grid, const std::vector<Observation>& observations);
  /// Head at every observation (L), in the order given.
  std::vector<double> sample(std::span<const double> head) const;
  /// The share of the stencil cells a part owns (head must hold them): summed over every
  /// part, the heads above. Points outside the grid are NaN on every part.
  std::vector<double> sample(CellValues head, const GridPart& part) const;
  /// The transpose of sample() for one observation: g[cell] += a * d(sampled head)/d head[cell]
  /// (g per grid cell); nothing for a point outside the grid.
  void add_transposed(std::size_t observation, double a, std::span<double> g) const;

 private:
  struct Stencil {
    int n = 0;
    CellIndex cells[4];
    double weights[4] = {0, 0, 0, 0};
  };
  std::vector<Stencil> stencils_;
  GridPart whole_;
};

}  // namespace aquiledger
