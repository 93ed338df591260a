#pragma once
// Calibration statistics: simulated against measured heads at the bores, per bore and over
// all bores (mean error, mean absolute error, root mean squared error, and that error over
// the range of all measured heads; the definitions of Anderson, Woessner & Hunt 2015,
// Applied Groundwater Modeling, 2nd ed., ch. 9).
#include <optional>
#include <span>
#include <vector>

#include "solver/model.hpp"

namespace aquiledger {

/// A measured head and the simulated head at the same place and time.
struct HeadPair {
  double time = 0.0;       ///< T
  double measured = 0.0;   ///< L
  double simulated = 0.0;  ///< L
};

/// Pairs each measured head with one observation's simulated series. times (T, ascending)
/// and simulated (L) are the output times and heads of the run; the simulated heads are
/// interpolated linearly in time. Measured times outside [times.front(), times.back()] and
/// NaN heads give no pair. Throws std::invalid_argument when times and simulated differ in
/// length.
std::vector<HeadPair> pair_measured_heads(const std::vector<MeasuredHead>& measured,
                                          std::span<const double> times,
                                          std::span<const double> simulated);

/// Statistics of the residuals simulated - measured. A statistic that is not defined (no
/// pair; a zero range) is empty, never NaN.
struct CalibrationStatistics {
  int count = 0;
  std::optional<double> mean_error;           ///< L, mean of (simulated - measured)
  std::optional<double> mean_absolute_error;  ///< L
  std::optional<double> rmse;                 ///< L
  std::optional<double> scaled_rmse;          ///< -, rmse / measured_range
};

/// max - min of the measured heads of every pair (L); 0 for fewer than two pairs.
double measured_range(std::span<const HeadPair> pairs);

/// The statistics of the pairs; scaled_rmse divides by measured_range (L), which the caller
/// takes over all bores so that per-bore values compare; it is empty when measured_range is
/// not positive (one measured value, or all equal, as in many steady calibrations).
CalibrationStatistics calibration_statistics(std::span<const HeadPair> pairs,
                                             double measured_range);

}  // namespace aquiledger
