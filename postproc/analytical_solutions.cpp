#include "postproc/analytical_solutions.hpp"

#include <boost/math/constants/constants.hpp>
#include <boost/math/quadrature/exp_sinh.hpp>
#include <boost/math/special_functions/bessel.hpp>
#include <boost/math/special_functions/erf.hpp>
#include <boost/math/special_functions/expint.hpp>
#include <cmath>
#include <limits>

namespace aquiledger {

namespace {
constexpr double pi = boost::math::constants::pi<double>();
}

double theis_well_function(double u) { return boost::math::expint(1, u); }

double leaky_well_function(double u, double r_over_b) {
  boost::math::quadrature::exp_sinh<double> integrator;
  const double c = 0.25 * r_over_b * r_over_b;
  auto f = [c](double y) { return std::exp(-y - c / y) / y; };
  return integrator.integrate(f, u, std::numeric_limits<double>::infinity());
}

double bessel_k0(double x) { return boost::math::cyl_bessel_k(0, x); }

double complementary_error_function(double x) { return boost::math::erfc(x); }

double theis_drawdown(double q, double transmissivity, double storativity, double r, double t) {
  const double u = r * r * storativity / (4.0 * transmissivity * t);
  return q / (4.0 * pi * transmissivity) * theis_well_function(u);
}

double papadopulos_drawdown(double q, double tx, double ty, double storativity, double x, double y,
                            double t) {
  const double te = std::sqrt(tx * ty);
  const double u = storativity / (4.0 * t) * (x * x / tx + y * y / ty);
  return q / (4.0 * pi * te) * theis_well_function(u);
}

double hantush_jacob_drawdown(double q, double transmissivity, double storativity,
                              double leakage_factor, double r, double t) {
  const double u = r * r * storativity / (4.0 * transmissivity * t);
  return q / (4.0 * pi * transmissivity) * leaky_well_function(u, r / leakage_factor);
}

double steady_leaky_drawdown(double q, double transmissivity, double leakage_factor, double r) {
  return q / (2.0 * pi * transmissivity) * bessel_k0(r / leakage_factor);
}

double step_response(double dh, double diffusivity, double x, double t) {
  return dh * complementary_error_function(x / std::sqrt(4.0 * diffusivity * t));
}

double dupuit_recharge_head(double h1, double h2, double length, double n, double k, double x) {
  return std::sqrt(h1 * h1 - (h1 * h1 - h2 * h2) * x / length + n / k * x * (length - x));
}

double dupuit_two_zone_head(double h1, double h2, double length, double n, double k_west,
                            double k_east, double interface, double x) {
  const double a = interface;
  const double q0 = (0.5 * (h1 * h1 - h2 * h2) - n * a * a / (2.0 * k_west) -
                     n * (length * length - a * a) / (2.0 * k_east)) /
                    (a / k_west + (length - a) / k_east);
  auto west = [&](double s) { return h1 * h1 - 2.0 / k_west * (q0 * s + 0.5 * n * s * s); };
  if (x <= a) return std::sqrt(west(x));
  return std::sqrt(west(a) - 2.0 / k_east * (q0 * (x - a) + 0.5 * n * (x * x - a * a)));
}

double dupuit_thiem_head(double q, double k, double h_outer, double r_outer, double r) {
  return std::sqrt(h_outer * h_outer - q / (pi * k) * std::log(r_outer / r));
}

double glover_balmer_depletion_fraction(double distance, double transmissivity, double storativity,
                                        double t) {
  return complementary_error_function(
      std::sqrt(distance * distance * storativity / (4.0 * transmissivity * t)));
}

}  // namespace aquiledger
