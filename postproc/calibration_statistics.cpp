#include "postproc/calibration_statistics.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace aquiledger {

std::vector<HeadPair> pair_measured_heads(const std::vector<MeasuredHead>& measured,
                                          std::span<const double> times,
                                          std::span<const double> simulated) {
  if (times.size() != simulated.size())
    throw std::invalid_argument("pair_measured_heads: times and simulated differ in length");
  std::vector<HeadPair> pairs;
  if (times.empty()) return pairs;
  for (const MeasuredHead& m : measured) {
    if (m.time < times.front() || m.time > times.back() || std::isnan(m.head)) continue;
    // First output time >= the measured time; interpolate from the one before it.
    const auto it = std::lower_bound(times.begin(), times.end(), m.time);
    const std::size_t hi = static_cast<std::size_t>(it - times.begin());
    double sim;
    if (times[hi] == m.time || hi == 0) {
      sim = simulated[hi];
    } else {
      const std::size_t lo = hi - 1;
      const double f = (m.time - times[lo]) / (times[hi] - times[lo]);
      sim = simulated[lo] + f * (simulated[hi] - simulated[lo]);
    }
    if (std::isnan(sim)) continue;
    pairs.push_back({m.time, m.head, sim});
  }
  return pairs;
}

double measured_range(std::span<const HeadPair> pairs) {
  if (pairs.size() < 2) return 0.0;
  const auto [lo, hi] = std::minmax_element(
      pairs.begin(), pairs.end(),
      [](const HeadPair& a, const HeadPair& b) { return a.measured < b.measured; });
  return hi->measured - lo->measured;
}

CalibrationStatistics calibration_statistics(std::span<const HeadPair> pairs,
                                             double measured_range) {
  CalibrationStatistics s;
  s.count = static_cast<int>(pairs.size());
  if (pairs.empty()) return s;
  double sum = 0.0, sum_abs = 0.0, sum_sq = 0.0;
  for (const HeadPair& p : pairs) {
    const double e = p.simulated - p.measured;
    sum += e;
    sum_abs += std::abs(e);
    sum_sq += e * e;
  }
  const double n = static_cast<double>(pairs.size());
  s.mean_error = sum / n;
  s.mean_absolute_error = sum_abs / n;
  s.rmse = std::sqrt(sum_sq / n);
  if (measured_range > 0.0) s.scaled_rmse = *s.rmse / measured_range;
  return s;
}

}  // namespace aquiledger
