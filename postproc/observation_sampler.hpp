#pragma once
#include <span>
#include <vector>

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

 private:
  struct Stencil {
    int n = 0;
    CellIndex cells[4];
    double weights[4] = {0, 0, 0, 0};
  };
  std::vector<Stencil> stencils_;
};

/// Residual statistics of simulated against measured heads (for reports).
struct ResidualStatistics {
  int count = 0;
  double mean_error = 0.0;   ///< L, mean of (simulated - measured)
  double rmse = 0.0;         ///< L
  double scaled_rmse = 0.0;  ///< -, rmse over the range of measured heads
};

}  // namespace aquiledger
