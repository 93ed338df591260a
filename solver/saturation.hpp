#pragma once
// Pointwise kernels for saturated thickness and the well-reduction factor. Pure functions,
// no state; each returns the value and its derivative with respect to head so that Newton's
// Jacobian is exact.
#include <cmath>

namespace aquiledger {

struct ValueSlope {
  double value = 0.0;
  double slope = 0.0;  ///< derivative with respect to head
};

/// C1 ramp from 0 to d over [0, eps]: r(d) = d^2 (2 eps - d) / eps^2 there, d above, 0 below.
/// It equals d exactly for d >= eps, so thickness is unbiased once a cell holds more than eps.
inline ValueSlope smooth_ramp(double d, double eps) {
  if (d <= 0.0) return {0.0, 0.0};
  if (d >= eps) return {d, 1.0};
  const double x = d / eps;
  return {d * x * (2.0 - x), x * (4.0 - 3.0 * x)};
}

/// Cubic smoothstep from 0 at b = 0 to 1 at b = width (value and derivative with respect to b).
inline ValueSlope smoothstep(double b, double width) {
  if (b <= 0.0) return {0.0, 0.0};
  if (b >= width) return {1.0, 0.0};
  const double x = b / width;
  return {x * x * (3.0 - 2.0 * x), 6.0 * x * (1.0 - x) / width};
}

/// The inflection point of smoothstep (L): b = width / 2, where its second derivative
/// 6 (1 - 2x) / width^2 changes sign and its slope is largest (1.5 / width).
inline double smoothstep_inflection(double width) { return 0.5 * width; }

}  // namespace aquiledger
