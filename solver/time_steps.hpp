#pragma once
// Step lengths of a period: each step `growth` times longer than the one before, the first
// dt1 = L (g - 1) / (g^n - 1) (a geometric series summing to L; L / n when g = 1).
#include <algorithm>
#include <cmath>
#include <vector>

#include "solver/model.hpp"

namespace aquiledger {

/// Length of the first step of a period (T): dt1 = L (g - 1) / (g^n - 1), or L / n when
/// g = 1, so that the n steps growing by g sum to L.
inline double first_step_length(const Period& p) {
  const int n = std::max(p.steps, 1);
  const double g = p.growth;
  return std::abs(g - 1.0) < 1e-12 ? p.length / n : p.length * (g - 1.0) / (std::pow(g, n) - 1.0);
}

/// Length of the last step of a period (T): dt1 g^(n-1).
inline double last_step_length(const Period& p) {
  return first_step_length(p) * std::pow(p.growth, std::max(p.steps, 1) - 1);
}

/// End times of the steps of a period starting at `start` (T); the last is exactly start + L.
inline std::vector<double> step_end_times(const Period& p, double start) {
  const int n = std::max(p.steps, 1);
  std::vector<double> ends(static_cast<std::size_t>(n));
  const double g = p.growth;
  double dt = first_step_length(p);
  double t = start;
  for (int k = 0; k < n; ++k) {
    t += dt;
    ends[static_cast<std::size_t>(k)] = t;
    dt *= g;
  }
  ends.back() = start + p.length;  // no drift from rounding: the period ends where it says
  return ends;
}

}  // namespace aquiledger
