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
double papadopulos_drawdown(double q, double tx, double ty, double storativity, double x, double y,
                            double t);

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

/// The same strip made of two conductivity zones meeting at x = interface (L): k_west on
/// [0, interface], k_east beyond. Derived here from the same Dupuit discharge law: the
/// discharge per unit width q(x) = -k d(h^2 / 2)/dx grows with the recharge as q = q0 + n x;
/// integrating h^2 over each zone with h (so h^2) and q continuous at the interface gives
///   h^2 = h1^2 - (2 / k_west) (q0 x + n x^2 / 2)                       for x <= interface,
///   h^2 = h_a^2 - (2 / k_east) (q0 (x - a) + n (x^2 - a^2) / 2)       beyond it (a = interface),
///   q0 = [ (h1^2 - h2^2) / 2 - n a^2 / (2 k_west) - n (L^2 - a^2) / (2 k_east) ]
///        / (a / k_west + (L - a) / k_east).
/// With k_west = k_east it is dupuit_recharge_head.
double dupuit_two_zone_head(double h1, double h2, double length, double n, double k_west,
                            double k_east, double interface, double x);

/// Dupuit-Thiem steady flow to a well in a water-table aquifer (Thiem, 1906; Dupuit, 1863):
/// head (L above the base) at radius r (L) for a well pumping q (L3/T) from an aquifer of
/// conductivity k (L/T) held at head h_outer at radius r_outer:
/// h^2 = h_outer^2 - q / (pi k) ln(r_outer / r).
double dupuit_thiem_head(double q, double k, double h_outer, double r_outer, double r);

/// Glover and Balmer (1954): fraction of the pumping supplied by a straight, fully
/// penetrating river at distance d (L), erfc(sqrt(d^2 S / (4 T t))).
double glover_balmer_depletion_fraction(double distance, double transmissivity, double storativity,
                                        double t);

}  // namespace aquiledger
