#pragma once
// Drawdown models for interpreting a pumping test: a unit-rate response of each published
// solution, superposed in time over a rate schedule (steps and recovery) and in space over
// image wells for a straight boundary. Pure numerics, no I/O.

#include <complex>
#include <string>
#include <vector>

#include "postproc/partial_penetration.hpp"

namespace aquiledger {

/// The closed-form models a test can be fitted with.
enum class WellTestModel {
  theis,               ///< Theis (1935): parameters T, S
  cooper_jacob,        ///< Cooper and Jacob (1946) straight line: parameters T, S
  hantush_jacob,       ///< Hantush and Jacob (1955) leaky: parameters T, S, B
  neuman,              ///< Neuman (1974) delayed yield: parameters T, S, Sy, L_v
  papadopulos_cooper,  ///< Papadopulos and Cooper (1967) large-diameter well: T, S (radii given)
  hantush_aquitard_storage,  ///< Hantush (1960) leaky with aquitard storage: T, S, B, S'
  /// Hantush (1961) partially penetrating wells in a confined aquifer: T, S, K_z / K_r (the
  /// last given instead when PartialPenetration::anisotropy_ratio holds it); screens given
  hantush_partial_penetration,
  /// The program's own flow model on a radial-telescoping grid (numerical_well_test.hpp):
  /// T, S (and Sy with the aquifer's geometry); no closed form, so unit_rate_drawdown and
  /// schedule_drawdown refuse it.
  numerical,
};

/// Plain name used in files and messages ("theis", "cooper-jacob", "hantush-jacob", ...).
std::string model_name(WellTestModel model);
/// Names of the parameters in fitting order, e.g. {"transmissivity", "storativity"} (for the
/// numerical model those of a confined aquifer; numerical_parameter_names gives a test's).
std::vector<std::string> model_parameter_names(WellTestModel model);
int n_model_parameters(WellTestModel model);

/// One step of the pumping rate: `rate` (L3/T, positive = withdrawal) from `start` (T, since
/// the start of the test) until the next step's start. A step with rate 0 is recovery.
struct RateStep {
  double start = 0.0;  ///< T
  double rate = 0.0;   ///< L3/T
};

/// A straight boundary seen from one observation well, represented by an image well at
/// `image_distance` (L) from it (Ferris et al., 1962): a barrier adds the image's drawdown,
/// a recharge boundary (fixed head) subtracts it.
struct ImageWell {
  double image_distance = 0.0;  ///< L
  bool recharge = false;
};

/// The pumped well's construction, given (not fitted), for the models that need it
/// (Papadopulos and Cooper, 1967): the radius of the screen or open hole and the inside radius
/// of the casing in which the water level falls. 0 when not given.
struct PumpedWellRadii {
  double well = 0.0;    ///< L, r_w
  double casing = 0.0;  ///< L, r_c
};

/// Drawdown (L) for a unit rate, time t (T) after the pumping began, at radius r (L), for the
/// model's parameters (T in L2/T, S dimensionless, B in L). Zero for t <= 0. The Cooper-Jacob
/// line q/(4 pi T) ln(2.25 T t / (r^2 S)) is returned as is (negative at early times); it
/// approximates Theis for u = r^2 S / (4 T t) small (u < 0.01, Cooper and Jacob, 1946).
/// Papadopulos and Cooper (1967) needs radii.well > 0, radii.casing > 0 and r >= radii.well;
/// Hantush (1961) needs screens.thickness > 0 (std::invalid_argument otherwise), and takes
/// K_z / K_r from parameters[2], or from screens.anisotropy_ratio with two parameters.
double unit_rate_drawdown(WellTestModel model, const std::vector<double>& parameters, double r,
                          double t, const PumpedWellRadii& radii = {},
                          const PartialPenetration& screens = {});

/// Drawdown (L) at time t (T) at radius r (L) from the pumped well with the rate schedule
/// (sorted by start) superposed in time, s(t) = sum_i (Q_i - Q_{i-1}) s_1(t - t_i)
/// (Theis, 1935, for recovery; the principle of superposition), and the image wells in space.
/// An image well is a well of the same construction (radii, screen) at the image distance.
double schedule_drawdown(WellTestModel model, const std::vector<double>& parameters,
                         const std::vector<RateStep>& schedule, double r, double t,
                         const std::vector<ImageWell>& images = {},
                         const PumpedWellRadii& radii = {}, const PartialPenetration& screens = {});

/// Papadopulos and Cooper (1967): drawdown (L) at radius r >= r_well (L) around a
/// large-diameter well with casing radius r_casing (L) whose stored water supplies part of the
/// rate q (L3/T) early on. In the Laplace domain, with t_D = T t / (S r_well^2), r_D = r / r_well
/// and C_D = r_casing^2 / (2 S r_well^2) (derived from their well-bore balance):
///   s_D = 2 pi T s / q,  s_D(p) = K0(r_D sqrt p) / (p [sqrt p K1(sqrt p) + C_D p K0(sqrt p)]),
/// inverted by Stehfest (1970). With C_D -> 0 and r_well -> 0 it is Theis.
double papadopulos_cooper_drawdown(double q, double transmissivity, double storativity,
                                   double r_well, double r_casing, double r, double t);

/// Neuman (1974): drawdown (L) averaged over a fully penetrating observation well at radius r
/// (L), time t (T), for a fully penetrating pumped well at rate q (L3/T) in a water-table
/// aquifer with delayed (instantaneous-drainage) yield. Parameters: transmissivity T (L2/T),
/// elastic storativity S, specific yield Sy and the vertical drainage length
/// L_v = b sqrt(K_r / K_z) (L; Neuman's beta = r^2 / L_v^2). Laplace form, derived from his
/// boundary-value problem by separation in z:
///   s(p) = q / (2 pi T p) sum_n 2 sin^2 e_n / (e_n (e_n + sin e_n cos e_n)) K0(r q_n),
///   e_n tan e_n = Sy p L_v^2 / T (e_n in (n pi, n pi + pi/2)), q_n^2 = e_n^2 / L_v^2 + S p / T,
/// inverted by Stehfest (1970). Sy -> 0 gives Theis with S; late time Theis with S + Sy.
double neuman_drawdown(double q, double transmissivity, double storativity, double specific_yield,
                       double drainage_length, double r, double t, int stehfest_terms = 12);
/// The Laplace transform of neuman_drawdown for q = 1 at a real p > 0 (1/T), for checks.
double neuman_laplace_drawdown(double transmissivity, double storativity, double specific_yield,
                               double drainage_length, double r, double p);

/// Hantush (1960): drawdown (L) at radius r (L), time t (T), for a rate q (L3/T), in a leaky
/// aquifer (transmissivity T, storativity S) under one aquitard that stores water (its
/// storativity S' = S_s' b') with a constant head beyond it, leakage factor B = sqrt(T b' / K')
/// (L). Laplace form, derived from Hantush's boundary-value problem (aquitard: S_s' ds'/dt =
/// K' d2s'/dz2, s' = s at the aquifer, s' = 0 at the far side; separation in z):
///   s(p) = q / (2 pi T p) K0(r sqrt(S p / T + x coth(x) / B^2)),  x = B sqrt(S' p / T),
/// inverted by Stehfest (1970). S' -> 0 gives Hantush and Jacob (1955); early time Theis
/// (1935), and Hantush's (1960) early-time H(u, beta), beta = r / (4 B) sqrt(S' / S), for
/// t < S' B^2 / (10 T).
double hantush_aquitard_storage_drawdown(double q, double transmissivity, double storativity,
                                         double leakage_factor, double aquitard_storativity,
                                         double r, double t, int stehfest_terms = 12);
/// Its Laplace transform for q = 1 at a complex p with Re p > 0 (for de Hoog's inversion).
std::complex<double> hantush_aquitard_storage_laplace(double transmissivity, double storativity,
                                                      double leakage_factor,
                                                      double aquitard_storativity, double r,
                                                      std::complex<double> p);

/// The modified Bessel function K0(z) for complex z with Re z > 0, from its integral
/// K0(z) = int_0^inf exp(-z cosh u) du (Abramowitz and Stegun, 1964, 9.6.24) by the trapezoidal
/// rule (step 0.05, which converges geometrically for this analytic integrand), for the
/// complex samples of de Hoog's inversion.
std::complex<double> bessel_k0(std::complex<double> z);

/// Logarithmic derivative ds/d ln t of a series (Bourdet et al., 1989): for each point the
/// slopes to the first neighbours at least `smoothing` (in ln t) away on each side, weighted
/// by the distance to them. Points without a neighbour on one side use the one-sided slope.
std::vector<double> logarithmic_derivative(const std::vector<double>& times,
                                           const std::vector<double>& drawdowns,
                                           double smoothing = 0.2);

}  // namespace aquiledger
