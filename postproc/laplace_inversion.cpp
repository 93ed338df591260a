#include "postproc/laplace_inversion.hpp"

#include <cassert>
#include <cmath>
#include <numbers>
#include <vector>

namespace aquiledger {

namespace {

double factorial(int n) { return std::tgamma(n + 1.0); }

}  // namespace

double stehfest_inverse(const std::function<double(double)>& transform, double t, int n_terms) {
  assert(n_terms > 0 && n_terms % 2 == 0 && t > 0.0);
  const int half = n_terms / 2;
  const double ln2_t = std::numbers::ln2 / t;
  double sum = 0.0;
  for (int k = 1; k <= n_terms; ++k) {
    double v = 0.0;  // Stehfest's weight V_k
    for (int j = (k + 1) / 2; j <= std::min(k, half); ++j)
      v += std::pow(j, half) * factorial(2 * j) /
           (factorial(half - j) * factorial(j) * factorial(j - 1) * factorial(k - j) *
            factorial(2 * j - k));
    if ((k + half) % 2 != 0) v = -v;
    sum += v * transform(k * ln2_t);
  }
  return ln2_t * sum;
}

double de_hoog_inverse(const std::function<std::complex<double>(std::complex<double>)>& transform,
                       double t, int m, double tolerance, double scale) {
  assert(m > 0 && t > 0.0);
  using C = std::complex<double>;
  const double period = scale * t;
  const double gamma = -std::log(tolerance) / (2.0 * period);
  const int n = 2 * m;
  std::vector<C> a(n + 1);
  for (int k = 0; k <= n; ++k) a[k] = transform(C(gamma, k * std::numbers::pi / period));
  a[0] *= 0.5;
  // Quotient-difference algorithm: the continued-fraction coefficients d_0..d_2m.
  std::vector<C> e(n + 1, C(0.0)), q(n);
  for (int i = 0; i < n; ++i) q[i] = a[i + 1] / a[i];
  std::vector<C> d(n + 1);
  d[0] = a[0];
  d[1] = -q[0];
  for (int r = 1; r <= m; ++r) {
    for (int i = 0; i <= n - 2 * r; ++i) e[i] = q[i + 1] - q[i] + e[i + 1];
    d[2 * r] = -e[0];
    if (r < m) {
      for (int i = 0; i <= n - 2 * r - 1; ++i) q[i] = q[i + 1] * e[i + 1] / e[i];
      d[2 * r + 1] = -q[0];
    }
  }
  // The continued fraction at z = exp(i pi t / T) by its recurrences, the last convergent
  // improved with the remainder estimate of de Hoog et al. (1982).
  const C z = std::polar(1.0, std::numbers::pi * t / period);
  std::vector<C> big_a(n + 2), big_b(n + 2);  // index shifted by one: [0] is A_{-1}
  big_a[0] = 0.0;
  big_b[0] = 1.0;
  big_a[1] = d[0];
  big_b[1] = 1.0;
  for (int k = 1; k < n; ++k) {
    big_a[k + 1] = big_a[k] + d[k] * z * big_a[k - 1];
    big_b[k + 1] = big_b[k] + d[k] * z * big_b[k - 1];
  }
  const C h = 0.5 * (1.0 + (d[n - 1] - d[n]) * z);
  const C remainder = -h * (1.0 - std::sqrt(1.0 + d[n] * z / (h * h)));
  const C a_last = big_a[n] + remainder * big_a[n - 1];
  const C b_last = big_b[n] + remainder * big_b[n - 1];
  return std::exp(gamma * t) / period * (a_last / b_last).real();
}

}  // namespace aquiledger
