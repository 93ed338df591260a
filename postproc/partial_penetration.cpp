#include "postproc/partial_penetration.hpp"

#include <boost/math/special_functions/bessel.hpp>
#include <cassert>
#include <cmath>
#include <numbers>

#include "postproc/analytical_solutions.hpp"

namespace aquiledger {
namespace {
/// Boost.Math's K0 in double precision (its default promotes to long double, several times
/// slower; the same choice as Neuman's series in well_test_models.cpp).
using partial_penetration_bessel_policy =
    boost::math::policies::policy<boost::math::policies::promote_double<false>>;
}  // namespace

double hantush_partial_penetration_drawdown(double q, double transmissivity, double storativity,
                                            double anisotropy_ratio, double r, double t,
                                            const PartialPenetration& screens) {
  if (t <= 0.0) return 0.0;
  constexpr double pi = std::numbers::pi;
  const double b = screens.thickness;
  const double d = screens.pumped_top, l = screens.pumped_bottom;
  const double d_obs = screens.observed_top, l_obs = screens.observed_bottom;
  assert(b > 0.0 && 0.0 <= d && d < l && l <= b && 0.0 <= d_obs && d_obs <= l_obs && l_obs <= b);
  assert(anisotropy_ratio > 0.0 && r > 0.0);
  const double u = r * r * storativity / (4.0 * transmissivity * t);
  const double theis = theis_well_function(u);
  // A fully penetrating screen (either well) has every c_n = 0 (sin(n pi) = 0): Theis exactly.
  if ((d == 0.0 && l == b) || (d_obs == 0.0 && l_obs == b))
    return q / (4.0 * pi * transmissivity) * theis;
  // beta_n = n k: the vertical wavenumber n pi / b scaled by sqrt(K_z / K_r), times r.
  const double k = pi * r * std::sqrt(anisotropy_ratio) / b;
  const bool point = screens.observed_is_point();
  const double scale =
      point ? 2.0 * b / (pi * (l - d)) : 2.0 * b * b / (pi * pi * (l - d) * (l_obs - d_obs));
  double sum = 0.0;
  for (long n = 1;; ++n) {
    const double beta = static_cast<double>(n) * k;
    const double below_u = beta * beta / (4.0 * u);  // the exponent of the integrand at y = u
    // The terms left are under e^-40 of W(u): for beta < 2u, W(u, beta) / W(u) is about
    // exp(-beta^2 / (4 u)); beyond, W(u, beta) <= 2 K0(beta) ~ exp(-beta) against
    // W(u) > exp(-u) / (1 + u) (Abramowitz and Stegun, 1964, 5.1.19).
    if (below_u > 40.0 && beta > u + 40.0 + std::log1p(u)) break;
    const double a = static_cast<double>(n) * pi / b;
    const double pumped = std::sin(a * l) - std::sin(a * d);
    const double observed =
        point ? std::cos(a * d_obs)
              : (std::sin(a * l_obs) - std::sin(a * d_obs)) / static_cast<double>(n);
    const double c = scale * pumped * observed / static_cast<double>(n);
    if (c == 0.0) continue;
    // W(u, beta) = 2 K0(beta) - int_0^u exp(-y - beta^2 / (4 y)) / y dy, and that part is
    // under E1(beta^2 / (4 u)) (exp(-y) <= 1, then y -> beta^2 / (4 y)).
    const double w = below_u > 40.0 ? 2.0 * boost::math::cyl_bessel_k(
                                                0, beta, partial_penetration_bessel_policy{})
                                    : leaky_well_function(u, beta);
    sum += c * w;
  }
  return q / (4.0 * pi * transmissivity) * (theis + sum);
}

}  // namespace aquiledger
