#pragma once
// Closed-form solutions from the literature used by the verification suite. Pure functions,
// no I/O; special functions from Boost.Math.

namespace aquiledger {

/// Theis (1935) well function W(u) = E1(u), the exponential integral.
double theis_well_function(double u);

/// Hantush and Jacob (1955) leaky well function
/// W(u, r/B) = integral_u^inf exp(-y - (r/B)^2 / (4 y)) / y dy, by double-exponential
/// quadrature on [u, inf).
double leaky_well_function(double u, double r_over_b);

/// Modified Bessel function of the second kind, order 0 (steady leaky limit 2 K0(r/B)).
double bessel_k0(double x);

/// Complementary error function.
double complementary_error_function(double x);

/// Theis drawdown (L): q (L3/T, positive = withdrawal), transmissivity (L2/T),
/// storativity (-), r (L), t (T).
double theis_drawdown(double q, double transmissivity, double storativity, double r, double t);

/// Drawdown (L) around a well in a homogeneous anisotropic confined aquifer with principal
/// axes along x and y (Papadopulos, 1965): Theis with T_e = sqrt(Tx Ty) and
/// u = S / (4 t) (x^2 / Tx + y^2 / Ty). tx, ty in L2/T; x, y (L) from the well.
double papadopulos_drawdown(double q, double tx, double ty, double storativity, double x,
                            double y, double t);

/// Hantush and Jacob (1955) drawdown (L); leakage_factor B = sqrt(T / leakance) (L).
double hantush_jacob_drawdown(double q, double transmissivity, double storativity,
                              double leakage_factor, double r, double t);

/// Steady leaky drawdown (L), the t -> inf limit: q / (2 pi T) K0(r / B).
double steady_leaky_drawdown(double q, double transmissivity, double leakage_factor, double r);

/// Carslaw and Jaeger (1959): head change (L) at distance x (L) in a semi-infinite aquifer
/// after a step dh (L) at its boundary, diffusivity T / S (L2/T), time t (T).
double step_response(double dh, double diffusivity, double x, double t);

/// Dupuit (1863), Forchheimer (1886): unconfined steady head (L) between fixed heads h1 at
/// x = 0 and h2 at x = length (L above the base), recharge n (L/T), conductivity k (L/T).
double dupuit_recharge_head(double h1, double h2, double length, double n, double k, double x);

/// Glover and Balmer (1954): fraction of the pumping supplied by a straight, fully
/// penetrating river at distance d (L), erfc(sqrt(d^2 S / (4 T t))).
double glover_balmer_depletion_fraction(double distance, double transmissivity,
                                        double storativity, double t);

}  // namespace aquiledger
