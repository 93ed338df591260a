#pragma once
// Hantush (1961): drawdown around a partially penetrating well in a confined, vertically
// anisotropic aquifer, averaged over an observation well's screen or at a piezometer's tip.
// Pure numerics, no I/O.

namespace aquiledger {

/// The screens of the pumped and of one observation well, as depths below the aquifer's top
/// (Hantush's d, l and d', l'; 0 <= top < bottom <= thickness for a screen, top == bottom for
/// a piezometer's tip). A well screened from 0 to the thickness is fully penetrating.
struct PartialPenetration {
  double thickness = 0.0;        ///< L, b, the aquifer's saturated thickness
  double pumped_top = 0.0;       ///< L, d: depth of the top of the pumped well's screen
  double pumped_bottom = 0.0;    ///< L, l: depth of its bottom (> pumped_top)
  double observed_top = 0.0;     ///< L, d': depth of the top of the observation screen
  double observed_bottom = 0.0;  ///< L, l': its bottom (== observed_top for a piezometer)
  /// K_z / K_r (-) when held; 0 when it is the model's third parameter (fitted).
  double anisotropy_ratio = 0.0;
  bool observed_is_point() const { return observed_bottom == observed_top; }
};

/// Drawdown (L) at radius r (L), time t (T), for a rate q (L3/T) from the pumped well's
/// screen, in a confined aquifer of transmissivity T (L2/T), storativity S (-) and
/// K_z / K_r = anisotropy_ratio (-), with impervious top and base (Hantush, 1961, "Drawdown
/// around a partially penetrating well", J. Hydraul. Div. ASCE 87(HY4), from memory; the same
/// series by separation in z, a cosine series between the no-flow planes, derived here):
///   s = q / (4 pi T) [W(u) + sum_n c_n W(u, n pi r / b sqrt(K_z / K_r))],  u = r^2 S / (4 T t),
/// averaged over an observation screen
///   c_n = 2 b^2 / (pi^2 n^2 (l - d)(l' - d')) [sin(n pi l / b) - sin(n pi d / b)]
///                                             [sin(n pi l' / b) - sin(n pi d' / b)],
/// at a piezometer's depth z
///   c_n = 2 b / (pi n (l - d)) [sin(n pi l / b) - sin(n pi d / b)] cos(n pi z / b),
/// with W(u) the Theis (1935) and W(u, beta) the Hantush and Jacob (1955) leaky well function
/// (postproc/analytical_solutions.hpp). A term's W(u, beta) is 2 K0(beta) where the part of its
/// integral below u is under E1(beta^2 / (4 u)) < 1e-19 (beta^2 / (4 u) > 40), and the series
/// stops where the terms left are under e^-40 of W(u) (beta^2 / (4 u) > 40 and
/// beta > u + 40 + ln(1 + u)). The cost grows as b / (r sqrt(K_z / K_r)): about 13 terms per
/// unit of it at late time (docs/pumping-tests.md, measured cost and accuracy).
double hantush_partial_penetration_drawdown(double q, double transmissivity, double storativity,
                                            double anisotropy_ratio, double r, double t,
                                            const PartialPenetration& screens);

}  // namespace aquiledger
