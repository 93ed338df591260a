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

 private:
  struct Stencil {
    int n = 0;
    CellIndex cells[4];
    double weights[4] = {0, 0, 0, 0};
  };
  std::vector<Stencil> stencils_;
  GridPart whole_;
};

/// Residual statistics of simulated against measured heads (for reports).
struct ResidualStatistics {
  int count = 0;
  double mean_error = 0.0;   ///< L, mean of (simulated - measured)
  double rmse = 0.0;         ///< L
  double scaled_rmse = 0.0;  ///< -, rmse over the range of measured heads
};

/// Compares measured heads with one observation's simulated series. times (T, ascending) and
/// simulated (L) are the output times and heads of the run; simulated heads are interpolated
/// linearly in time at each measured time. Measured times outside [times.front(),
/// times.back()] and NaN heads are left out of the count. scaled_rmse is rmse / (max - min)
/// of the measured heads used, NaN when they are all equal; all fields 0 when count is 0.
ResidualStatistics residual_statistics(const std::vector<MeasuredHead>& measured,
                                       std::span<const double> times,
                                       std::span<const double> simulated);

}  // namespace aquiledger
