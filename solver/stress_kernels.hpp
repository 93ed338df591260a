#pragma once
// Pointwise kernels of the head-dependent stresses. Each returns the flow INTO the aquifer
// cell (L3/T) and its derivative with respect to the cell's head (L2/T), so that Newton's
// Jacobian is exact. Pure functions, no loops: stress_flows.cpp owns the loops.
//
// Every kink of a piecewise-linear law is rounded with smooth_ramp (solver/saturation.hpp)
// over a width delta (layout.smoothing_length of the cell). The ramp is applied on the side
// of the kink where the law keeps changing with head, so each kernel is exact outside the
// interval [kink, kink + delta] written beside it and C1 everywhere.
#include <cmath>

#include "solver/saturation.hpp"

namespace aquiledger {

/// The flow of one stress into a cell's aquifer with its slope, and the part of a requested
/// withdrawal the cell could not deliver (zero for every stress but a reduced withdrawal).
struct StressFlow {
  ValueSlope q;            ///< L3/T into the aquifer (negative for a withdrawal), L2/T slope
  double shortfall = 0.0;  ///< L3/T of the requested withdrawal not delivered
};

/// Well with rate Q (L3/T, positive = withdrawal). A withdrawal is scaled by
/// phi = smoothstep(b, reduction_length) when `reducible` (water-table or switching cells,
/// where the saturated thickness b(h) can vanish), so a draining cell delivers less and the
/// rest is a shortfall Q (1 - phi). Exact (phi = 1) once b >= reduction_length. Injection
/// (Q < 0) is never reduced.
/// thickness: b (L) and db/dh (-); reduction_length: L.
inline StressFlow well_flow(double rate, ValueSlope thickness, double reduction_length,
                            bool reducible) {
  if (rate <= 0.0 || !reducible) return {{-rate, 0.0}, 0.0};
  const ValueSlope phi = smoothstep(thickness.value, reduction_length);
  return {{-rate * phi.value, -rate * phi.slope * thickness.slope}, rate * (1.0 - phi.value)};
}

/// Head (L) at which the reduction factor phi of a reducible withdrawal has its inflection point:
/// bottom + reduction_length / 2. There the saturated thickness equals h - bottom, since the
/// base's smoothing width is smaller than reduction_length / 2 (system_layout.hpp).
inline double withdrawal_inflection_head(double bottom, double reduction_length) {
  return bottom + smoothstep_inflection(reduction_length);
}

/// Areal recharge rate (L/T) over a cell of area A (L2): q = rate A. A negative rate is a
/// spread withdrawal and is reduced exactly like a well's withdrawal of -rate A.
inline StressFlow recharge_flow(double rate, double area, ValueSlope thickness,
                                double reduction_length, bool reducible) {
  return well_flow(-rate * area, thickness, reduction_length, reducible);
}

/// River reach with stage s (L), bed bottom z (L) and conductance C (L2/T):
/// q = C (s - z - r(h - z, delta)). That is C (s - h) for h >= z + delta (losing when
/// h < s, gaining when h > s) and the disconnected seepage C (s - z) for h <= z, however far
/// the head falls. Smoothed over [z, z + delta].
inline ValueSlope river_flow(double head, double stage, double bed_bottom, double conductance,
                             double delta) {
  const ValueSlope r = smooth_ramp(head - bed_bottom, delta);
  return {conductance * (stage - bed_bottom - r.value), -conductance * r.slope};
}

/// Drain at elevation e (L), conductance C (L2/T): q = -C r(h - e, delta), so -C (h - e)
/// for h >= e + delta and zero for h <= e. Smoothed over [e, e + delta].
inline ValueSlope drain_flow(double head, double elevation, double conductance, double delta) {
  const ValueSlope r = smooth_ramp(head - elevation, delta);
  return {-conductance * r.value, -conductance * r.slope};
}

/// External head H (L) behind a conductance C (L2/T): q = C (H - h). Linear, no kink.
inline ValueSlope external_head_flow(double head, double external_head, double conductance) {
  return {conductance * (external_head - head), -conductance};
}

/// Evapotranspiration from a cell of area A (L2): rate max_rate (L/T) with the head at or
/// above the surface (L), falling linearly to zero at z0 = surface - extinction_depth (L).
/// f = (r(h - z0, delta) - r(h - surface, delta)) / extinction_depth, q = -A max_rate f.
/// Exact outside [z0, z0 + delta] and [surface, surface + delta]: f = 0 below z0, f = 1
/// above surface + delta (the second ramp starts at the surface, so the full rate is reached
/// delta above it; below the surface the law is the plain linear one).
inline ValueSlope evapotranspiration_flow(double head, double surface, double max_rate,
                                          double extinction_depth, double area, double delta) {
  const ValueSlope lower = smooth_ramp(head - (surface - extinction_depth), delta);
  const ValueSlope upper = smooth_ramp(head - surface, delta);
  const double scale = -area * max_rate / extinction_depth;
  return {scale * (lower.value - upper.value), scale * (lower.slope - upper.slope)};
}

/// Leakage through an aquitard of leakance L (1/T) from a source layer at head H (L) into a
/// cell of area A (L2) whose top is at z (L): q = A L (H - z - r(h - z, delta)), that is
/// A L (H - h) for h >= z + delta and fixed at A L (H - z) once the head falls below the top
/// (the aquitard then drains freely). Smoothed over [z, z + delta]. With no top (NaN, a
/// water-table aquifer) the exchange is A L (H - h) at every head.
inline ValueSlope leakage_flow(double head, double source_head, double top, double leakance,
                               double area, double delta) {
  const double al = area * leakance;
  if (std::isnan(top)) return {al * (source_head - head), -al};
  const ValueSlope r = smooth_ramp(head - top, delta);
  return {al * (source_head - top - r.value), -al * r.slope};
}

}  // namespace aquiledger
