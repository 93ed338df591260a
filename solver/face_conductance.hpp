#pragma once
// Conductance of the face between two neighbouring cells and the flow across it, with exact
// derivatives for Newton's method. Distances are full cell widths along the flow direction;
// the half-cell resistances d/2 / (K w b) add in series (harmonic mean).
#include "solver/saturation.hpp"

namespace aquiledger {

/// Face conductance per unit saturated thickness (L/T): 2 w Ki Kj / (Ki dj + Kj di).
/// w: face width (L); ki, kj: conductivities (L/T); di, dj: cell widths along the flow (L).
inline double harmonic_face_factor(double w, double ki, double di, double kj, double dj) {
  const double denom = ki * dj + kj * di;
  return denom > 0.0 ? 2.0 * w * ki * kj / denom : 0.0;
}

/// Confined face conductance (L2/T): 2 w Ti Tj / (Ti dj + Tj di); ti, tj transmissivities (L2/T).
inline double confined_face_conductance(double w, double ti, double di, double tj, double dj) {
  return harmonic_face_factor(w, ti, di, tj, dj);
}

/// Flow into cell i across the face (L3/T) and its derivatives (L2/T) with respect to hi, hj.
struct FaceFlow {
  double q = 0.0;
  double dq_dhi = 0.0;
  double dq_dhj = 0.0;
};

/// Fixed conductance c (L2/T): q = c (hj - hi).
inline FaceFlow linear_face_flow(double c, double hi, double hj) { return {c * (hj - hi), -c, c}; }

/// Upstream-thickness flow: q = factor * b_up (hj - hi), b_up the saturated thickness of the
/// cell with the higher head (tie: cell i). factor from harmonic_face_factor (L/T);
/// bi, bj: saturated thickness (L) and its head derivative at hi, hj.
inline FaceFlow upstream_face_flow(double factor, double hi, ValueSlope bi, double hj,
                                   ValueSlope bj) {
  const double dh = hj - hi;
  if (hi >= hj)
    return {factor * bi.value * dh, factor * (bi.slope * dh - bi.value), factor * bi.value};
  return {factor * bj.value * dh, -factor * bj.value, factor * (bj.slope * dh + bj.value)};
}

}  // namespace aquiledger
