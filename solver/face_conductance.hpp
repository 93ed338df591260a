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

/// The elasticities of harmonic_face_factor F with respect to ki and kj (-):
/// d ln F / d ln ki = kj di / (ki dj + kj di), and symmetrically; they add up to 1 (F is
/// homogeneous of degree one in the two conductivities). A face flow is F times a function
/// of the heads, so d q / d ln ki = q times the elasticity (parameter sensitivities).
struct FaceElasticity {
  double i = 0.0;  ///< -, d ln F / d ln ki
  double j = 0.0;  ///< -, d ln F / d ln kj
};
inline FaceElasticity harmonic_face_factor_elasticities(double ki, double di, double kj,
                                                        double dj) {
  const double denom = ki * dj + kj * di;
  if (!(denom > 0.0)) return {};
  return {kj * di / denom, ki * dj / denom};
}

/// Flow into cell i across the face (L3/T) and its derivatives (L2/T) with respect to hi, hj.
struct FaceFlow {
  double q = 0.0;
  double dq_dhi = 0.0;
  double dq_dhj = 0.0;
};

/// Fixed conductance c (L2/T): q = c (hj - hi).
inline FaceFlow linear_face_flow(double c, double hi, double hj) { return {c * (hj - hi), -c, c}; }

/// How a face between two cells whose saturated thickness depends on head takes its thickness.
enum class FaceThickness {
  /// Mean of the two cells' thicknesses where both are wet, blended smoothly toward the
  /// upstream thickness near a drying front (blended_face_flow): second order in space.
  mean,
  /// Thickness of the cell with the higher head (upstream_face_flow): first order, the most
  /// robust as cells drain and wet again.
  upstream,
};

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

/// Thickness ratio (thinner over thicker cell, -) from which the blended face takes the plain
/// mean. Below it the weight of the mean falls smoothly (cubic smoothstep) to zero at a dry
/// cell. Chosen by measurement (docs/model-format.md, "Face thickness"): with 0.5 the Newton
/// iterations of the switching benchmarks stay those of the upstream scheme, while every face
/// of a wet aquifer whose thickness changes by less than a factor of two from cell to cell
/// takes the mean.
inline constexpr double mean_thickness_ratio = 0.5;

/// Blended-thickness flow: q = factor * b_f (hj - hi) with
///   b_f = b_up + w(r) (b_mean - b_up),  b_mean = (bi + bj) / 2,
///   r = min(bi, bj) / max(bi, bj),      w = smoothstep(r, mean_thickness_ratio).
/// With both cells wet (r >= mean_thickness_ratio) this is factor * (phi_j - phi_i) for the
/// Girinskii potential phi = b^2 / 2 of a flat-based cell, so Dupuit-Forchheimer flow is
/// second-order accurate (exact for uniform K). As either cell dries, r -> 0 and the face
/// takes the upstream thickness: a dry cell rewets from a wet neighbour, and a draining cell
/// gives at most b_up (1 + 1.5 / mean_thickness_ratio) of thickness, vanishing with its own
/// (w <= 3 r^2 / r0^2). b_f is C1 in both heads: the kink of min/max at bi = bj multiplies
/// b_mean - b_up = 0. The choice of b_up switches where hi = hj, where q = 0, as in
/// upstream_face_flow. Written symmetrically so that q seen from j is exactly -q from i.
inline FaceFlow blended_face_flow(double factor, double hi, ValueSlope bi, double hj,
                                  ValueSlope bj) {
  const double dh = hj - hi;
  const bool i_up = hi >= hj;
  const ValueSlope up = i_up ? bi : bj;
  const double mean = 0.5 * (bi.value + bj.value);
  // r and its derivatives with respect to hi and hj.
  double r = 0.0, dr_dhi = 0.0, dr_dhj = 0.0;
  if (bi.value <= bj.value) {
    if (bj.value > 0.0) {
      r = bi.value / bj.value;
      dr_dhi = bi.slope / bj.value;
      dr_dhj = -r * bj.slope / bj.value;
    }
  } else {
    r = bj.value / bi.value;
    dr_dhj = bj.slope / bi.value;
    dr_dhi = -r * bi.slope / bi.value;
  }
  const ValueSlope w = smoothstep(r, mean_thickness_ratio);
  const double diff = mean - up.value;
  const double b = up.value + w.value * diff;
  const double dup_dhi = i_up ? bi.slope : 0.0;
  const double dup_dhj = i_up ? 0.0 : bj.slope;
  const double db_dhi = dup_dhi + w.slope * dr_dhi * diff + w.value * (0.5 * bi.slope - dup_dhi);
  const double db_dhj = dup_dhj + w.slope * dr_dhj * diff + w.value * (0.5 * bj.slope - dup_dhj);
  return {factor * b * dh, factor * (db_dhi * dh - b), factor * (db_dhj * dh + b)};
}

/// Flow into cell i across a face whose thickness depends on head, by the chosen scheme.
inline FaceFlow thickness_face_flow(FaceThickness scheme, double factor, double hi, ValueSlope bi,
                                    double hj, ValueSlope bj) {
  return scheme == FaceThickness::mean ? blended_face_flow(factor, hi, bi, hj, bj)
                                       : upstream_face_flow(factor, hi, bi, hj, bj);
}

}  // namespace aquiledger
