#include "postproc/well_test_models.hpp"

#include <algorithm>
#include <boost/math/quadrature/gauss.hpp>
#include <boost/math/special_functions/bessel.hpp>
#include <cassert>
#include <cmath>
#include <numbers>
#include <stdexcept>

#include "postproc/analytical_solutions.hpp"
#include "postproc/laplace_inversion.hpp"

namespace aquiledger {

std::string model_name(WellTestModel model) {
  switch (model) {
    case WellTestModel::theis:
      return "theis";
    case WellTestModel::cooper_jacob:
      return "cooper-jacob";
    case WellTestModel::hantush_jacob:
      return "hantush-jacob";
    case WellTestModel::neuman:
      return "neuman";
    case WellTestModel::papadopulos_cooper:
      return "papadopulos-cooper";
    case WellTestModel::hantush_aquitard_storage:
      return "hantush-aquitard-storage";
    case WellTestModel::hantush_partial_penetration:
      return "hantush-partial-penetration";
    case WellTestModel::numerical:
      return "numerical";
  }
  return "";
}

std::vector<std::string> model_parameter_names(WellTestModel model) {
  if (model == WellTestModel::hantush_jacob)
    return {"transmissivity", "storativity", "leakage_factor"};
  if (model == WellTestModel::neuman)
    return {"transmissivity", "storativity", "specific_yield", "drainage_length"};
  if (model == WellTestModel::hantush_aquitard_storage)
    return {"transmissivity", "storativity", "leakage_factor", "aquitard_storativity"};
  if (model == WellTestModel::hantush_partial_penetration)
    return {"transmissivity", "storativity", "anisotropy_ratio"};
  return {"transmissivity", "storativity"};
}

int n_model_parameters(WellTestModel model) {
  return static_cast<int>(model_parameter_names(model).size());
}

double unit_rate_drawdown(WellTestModel model, const std::vector<double>& parameters, double r,
                          double t, const PumpedWellRadii& radii,
                          const PartialPenetration& screens) {
  assert(static_cast<int>(parameters.size()) == n_model_parameters(model) ||
         (model == WellTestModel::hantush_partial_penetration && parameters.size() == 2));
  if (t <= 0.0) return 0.0;
  const double transmissivity = parameters[0];
  const double storativity = parameters[1];
  switch (model) {
    case WellTestModel::theis:
      return theis_drawdown(1.0, transmissivity, storativity, r, t);
    case WellTestModel::cooper_jacob:
      return std::log(2.25 * transmissivity * t / (r * r * storativity)) /
             (4.0 * std::numbers::pi * transmissivity);
    case WellTestModel::hantush_jacob:
      return hantush_jacob_drawdown(1.0, transmissivity, storativity, parameters[2], r, t);
    case WellTestModel::neuman:
      return neuman_drawdown(1.0, transmissivity, storativity, parameters[2], parameters[3], r, t);
    case WellTestModel::papadopulos_cooper:
      if (!(radii.well > 0.0 && radii.casing > 0.0))
        throw std::invalid_argument(
            "papadopulos-cooper needs the pumped well's radius and casing radius");
      if (r < radii.well)
        throw std::invalid_argument("papadopulos-cooper: a distance below the well radius");
      return papadopulos_cooper_drawdown(1.0, transmissivity, storativity, radii.well, radii.casing,
                                         r, t);
    case WellTestModel::hantush_aquitard_storage:
      return hantush_aquitard_storage_drawdown(1.0, transmissivity, storativity, parameters[2],
                                               parameters[3], r, t);
    case WellTestModel::hantush_partial_penetration: {
      if (!(screens.thickness > 0.0))
        throw std::invalid_argument(
            "hantush-partial-penetration needs the screens and the "
            "aquifer's thickness");
      const double ratio = parameters.size() > 2 ? parameters[2] : screens.anisotropy_ratio;
      return hantush_partial_penetration_drawdown(1.0, transmissivity, storativity, ratio, r, t,
                                                  screens);
    }
    case WellTestModel::numerical:
      throw std::invalid_argument("the numerical model has no closed-form drawdown");
  }
  return 0.0;
}

double schedule_drawdown(WellTestModel model, const std::vector<double>& parameters,
                         const std::vector<RateStep>& schedule, double r, double t,
                         const std::vector<ImageWell>& images, const PumpedWellRadii& radii,
                         const PartialPenetration& screens) {
  double s = 0.0;
  double previous_rate = 0.0;
  for (const RateStep& step : schedule) {
    if (step.start >= t) break;
    const double change = step.rate - previous_rate;
    previous_rate = step.rate;
    if (change == 0.0) continue;
    const double since = t - step.start;
    double unit = unit_rate_drawdown(model, parameters, r, since, radii, screens);
    for (const ImageWell& image : images) {
      const double si =
          unit_rate_drawdown(model, parameters, image.image_distance, since, radii, screens);
      unit += image.recharge ? -si : si;
    }
    s += change * unit;
  }
  return s;
}

double papadopulos_cooper_drawdown(double q, double transmissivity, double storativity,
                                   double r_well, double r_casing, double r, double t) {
  if (t <= 0.0) return 0.0;
  const double t_d = transmissivity * t / (storativity * r_well * r_well);
  const double r_d = r / r_well;
  const double c_d = r_casing * r_casing / (2.0 * storativity * r_well * r_well);
  auto transform = [&](double p) {
    const double root = std::sqrt(p);
    return std::cyl_bessel_k(0.0, r_d * root) /
           (p * (root * std::cyl_bessel_k(1.0, root) + c_d * p * std::cyl_bessel_k(0.0, root)));
  };
  return q / (2.0 * std::numbers::pi * transmissivity) * stehfest_inverse(transform, t_d);
}

std::complex<double> bessel_k0(std::complex<double> z) {
  // Terms fall below e^-45 of K0's scale e^-z once Re z (cosh u - 1) > 45.
  constexpr double h = 0.05;
  std::complex<double> sum = 0.5 * std::exp(-z);
  for (int k = 1; k < 20000; ++k) {
    const double c = std::cosh(k * h);
    sum += std::exp(-z * c);
    if (z.real() * (c - 1.0) > 45.0) break;
  }
  return h * sum;
}

namespace {

/// x coth x, with its series 1 + x^2/3 - x^4/45 for small x (the aquitard without storage).
std::complex<double> x_coth_x(std::complex<double> x) {
  if (std::abs(x) < 1e-3) return 1.0 + x * x / 3.0 - x * x * x * x / 45.0;
  const std::complex<double> e = std::exp(-2.0 * x);  // Re x > 0: no overflow
  return x * (1.0 + e) / (1.0 - e);
}

/// The argument of K0 in Hantush's (1960) Laplace form over r: sqrt(S p / T + x coth x / B^2).
std::complex<double> hantush_aquitard_root(double transmissivity, double storativity,
                                           double leakage_factor, double aquitard_storativity,
                                           std::complex<double> p) {
  const std::complex<double> x =
      leakage_factor * std::sqrt(aquitard_storativity * p / transmissivity);
  return std::sqrt(storativity * p / transmissivity +
                   x_coth_x(x) / (leakage_factor * leakage_factor));
}

}  // namespace

std::complex<double> hantush_aquitard_storage_laplace(double transmissivity, double storativity,
                                                      double leakage_factor,
                                                      double aquitard_storativity, double r,
                                                      std::complex<double> p) {
  const std::complex<double> root =
      hantush_aquitard_root(transmissivity, storativity, leakage_factor, aquitard_storativity, p);
  return bessel_k0(r * root) / (2.0 * std::numbers::pi * transmissivity * p);
}

double hantush_aquitard_storage_drawdown(double q, double transmissivity, double storativity,
                                         double leakage_factor, double aquitard_storativity,
                                         double r, double t, int stehfest_terms) {
  if (t <= 0.0) return 0.0;
  auto transform = [&](double p) {
    // Real p: the real K0 of the standard library.
    const double root = hantush_aquitard_root(transmissivity, storativity, leakage_factor,
                                              aquitard_storativity, {p, 0.0})
                            .real();
    return std::cyl_bessel_k(0.0, r * root) / (2.0 * std::numbers::pi * transmissivity * p);
  };
  return q * stehfest_inverse(transform, t, stehfest_terms);
}

namespace {

/// The root of e tan e = alpha (alpha >= 0) in [n pi, n pi + pi/2), written as
/// g(e) = e - n pi - atan(alpha / e) = 0 (tan e = tan(e - n pi)): g rises (g' = 1 +
/// alpha / (e^2 + alpha^2) lies in [1, 2]) and is concave from g(n pi) <= 0 to
/// g(n pi + pi/2) >= 0, so Newton, kept in the bracket, converges from either side; one atan a
/// step. Start: for alpha above m = n pi + pi/2 the root lies just below m, where
/// tan e ~ 1 / (m - e) gives e ~ m alpha / (alpha + 1); below it, near n pi, where
/// tan e ~ e - n pi gives e ~ n pi + alpha / (n pi) (for n = 0, e ~ sqrt(alpha)).
double neuman_eigenvalue(double n, double alpha) {
  const double lo = n * std::numbers::pi, hi = lo + 0.5 * std::numbers::pi;
  if (alpha == 0.0) return lo;
  double e =
      alpha > hi ? hi * alpha / (alpha + 1.0) : (n == 0.0 ? std::sqrt(alpha) : lo + alpha / lo);
  e = std::clamp(e, n == 0.0 ? 1e-300 : lo, hi);
  for (int k = 0; k < 60; ++k) {
    const double g = e - lo - std::atan(alpha / e);
    const double next = std::clamp(e - g / (1.0 + alpha / (e * e + alpha * alpha)), lo, hi);
    if (std::abs(next - e) <= 1e-15 * std::max(1.0, e)) return next;
    e = next;
  }
  return e;
}

/// The weight of the n-th term, 2 sin^2 e / (e (e + sin e cos e)), from tan e = alpha / e
/// alone: sin^2 e = alpha^2 / (e^2 + alpha^2) and sin e cos e = alpha e / (e^2 + alpha^2), so
/// the weight is 2 alpha^2 / (e^2 (e^2 + alpha^2 + alpha)); it tends to 1 for n = 0 as
/// alpha -> 0 (e^2 -> alpha) and is 0 for n > 0 at alpha = 0.
using neuman_bessel_policy =
    boost::math::policies::policy<boost::math::policies::promote_double<false>>;

double neuman_term_weight(double e, double alpha) {
  if (alpha == 0.0) return e == 0.0 ? 1.0 : 0.0;
  return 2.0 * alpha * alpha / (e * e * (e * e + alpha * alpha + alpha));
}

}  // namespace

double neuman_laplace_drawdown(double transmissivity, double storativity, double specific_yield,
                               double drainage_length, double r, double p) {
  const double alpha = specific_yield * p * drainage_length * drainage_length / transmissivity;
  const double elastic = storativity * p / transmissivity;
  // The n-th term as a function of a real n: the root of e - n pi = atan(alpha / e) moves
  // smoothly with n, and so does the term.
  auto term_at = [&](double n) {
    const double e = neuman_eigenvalue(n, alpha);
    // K0 from Boost.Math's double-precision rational approximations (no promotion to long
    // double): measured on cases/03, far faster than std::cyl_bessel_k (docs/pumping-tests.md).
    return neuman_term_weight(e, alpha) *
           boost::math::cyl_bessel_k(
               0, r * std::sqrt(e * e / (drainage_length * drainage_length) + elastic),
               neuman_bessel_policy{});
  };
  // The first terms one by one. They fall like 2 / (n pi)^2 until r e_n / L_v passes 1, then
  // as K0's exp(-r n pi / L_v): a long drainage length (small r / L_v, the fit of data without
  // delayed yield drives L_v there) needs about 10 L_v / r terms.
  constexpr int exact_terms = 40;
  double sum = 0.0;
  for (int n = 0; n < exact_terms; ++n) {
    const double term = term_at(n);
    sum += term;
    if (n > 2 && term < 1e-13 * sum) return sum / (2.0 * std::numbers::pi * transmissivity * p);
  }
  // The rest by the midpoint rule, sum_{n >= N} f(n) = int_{N - 1/2}^inf f(nu) dnu with an
  // error of about f''(N) / 24 summed, 1 / (12 N^2) of the rest for f ~ 1 / n^2 (from the
  // Euler-Maclaurin formula; Abramowitz and Stegun, 1964, 23.1.30), 5e-5 of a rest that is
  // itself under 1 / N of the sum. The integral in u = ln(nu / nu0), where f nu is smooth and
  // falls like e^-u, by 30-point Gauss-Legendre up to where K0 has fallen below e^-40.
  const double nu0 = exact_terms - 0.5;
  const double u_end =
      std::log(std::max(2.0, 40.0 * drainage_length / (std::numbers::pi * r * nu0)));
  const double rest = boost::math::quadrature::gauss<double, 30>::integrate(
      [&](double u) {
        const double nu = nu0 * std::exp(u);
        return term_at(nu) * nu;
      },
      0.0, u_end);
  return (sum + rest) / (2.0 * std::numbers::pi * transmissivity * p);
}

double neuman_drawdown(double q, double transmissivity, double storativity, double specific_yield,
                       double drainage_length, double r, double t, int stehfest_terms) {
  if (t <= 0.0) return 0.0;
  auto transform = [&](double p) {
    return neuman_laplace_drawdown(transmissivity, storativity, specific_yield, drainage_length, r,
                                   p);
  };
  return q * stehfest_inverse(transform, t, stehfest_terms);
}

std::vector<double> logarithmic_derivative(const std::vector<double>& times,
                                           const std::vector<double>& drawdowns, double smoothing) {
  assert(times.size() == drawdowns.size());
  const std::size_t n = times.size();
  std::vector<double> derivative(n, std::nan(""));
  if (n < 2) return derivative;
  for (std::size_t i = 0; i < n; ++i) {
    const double x = std::log(times[i]);
    std::size_t left = i, right = i;
    while (left > 0 && x - std::log(times[left]) < smoothing) --left;
    while (right + 1 < n && std::log(times[right]) - x < smoothing) ++right;
    const double dl = x - std::log(times[left]);
    const double dr = std::log(times[right]) - x;
    const double slope_left = dl > 0.0 ? (drawdowns[i] - drawdowns[left]) / dl : std::nan("");
    const double slope_right = dr > 0.0 ? (drawdowns[right] - drawdowns[i]) / dr : std::nan("");
    if (dl > 0.0 && dr > 0.0)  // Bourdet et al. (1989), their eq. for the weighted slope
      derivative[i] = (slope_left * dr + slope_right * dl) / (dl + dr);
    else
      derivative[i] = dl > 0.0 ? slope_left : slope_right;
  }
  return derivative;
}

}  // namespace aquiledger
