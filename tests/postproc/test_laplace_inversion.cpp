// Stehfest and de Hoog inversions on transforms with known inverses, and against each other.
#include <catch2/catch.hpp>
#include <cmath>
#include <complex>

#include "postproc/analytical_solutions.hpp"
#include "postproc/laplace_inversion.hpp"

using namespace aquiledger;
using C = std::complex<double>;

// Stehfest with 12 terms in double precision is good to about 1e-4 of the function's scale, not
// relatively (Stehfest, 1970, reports 12..16 terms in double; the scale here is 1; from memory);
// measured here: 1.5e-4 for exp(-t) at t = 5, under 5e-5 for the diffusive transforms.
constexpr double stehfest_margin = 2e-4;

TEST_CASE("Laplace inversions reproduce known inverses", "[laplace_inversion]") {
  // Transform pairs from Abramowitz and Stegun (1964), 29.3: 1/(p+1) <-> exp(-t), 1/p^2 <-> t,
  // exp(-sqrt p)/p <-> erfc(1 / (2 sqrt t)) (29.3.83), 1/(p^2+1) <-> sin t.
  for (double t : {0.1, 1.0, 5.0}) {
    CHECK(stehfest_inverse([](double p) { return 1.0 / (p + 1.0); }, t) ==
          Approx(std::exp(-t)).margin(stehfest_margin));
    CHECK(de_hoog_inverse([](C p) { return 1.0 / (p + 1.0); }, t) ==
          Approx(std::exp(-t)).epsilon(1e-8));
    CHECK(de_hoog_inverse([](C p) { return 1.0 / (p * p); }, t) == Approx(t).epsilon(1e-8));
    const double erfc_value = std::erfc(1.0 / (2.0 * std::sqrt(t)));
    CHECK(stehfest_inverse([](double p) { return std::exp(-std::sqrt(p)) / p; }, t) ==
          Approx(erfc_value).margin(stehfest_margin));
    CHECK(de_hoog_inverse([](C p) { return std::exp(-std::sqrt(p)) / p; }, t) ==
          Approx(erfc_value).epsilon(1e-7));
    CHECK(de_hoog_inverse([](C p) { return 1.0 / (p * p + 1.0); }, t) ==
          Approx(std::sin(t)).margin(1e-7));
  }
  // Theis in Laplace form: K0(r sqrt(p / D)) / p <-> E1(r^2 / (4 D t)) / 2 (Carslaw and
  // Jaeger, 1959, for the continuous line source).
  for (double t : {0.01, 0.1, 1.0})
    CHECK(stehfest_inverse([](double p) { return std::cyl_bessel_k(0.0, std::sqrt(p)) / p; }, t) ==
          Approx(0.5 * theis_well_function(1.0 / (4.0 * t))).margin(stehfest_margin));
}

TEST_CASE("Stehfest and de Hoog agree on a drawdown-like transform", "[laplace_inversion]") {
  // exp(-2 sqrt p) / p^1.5 (a smooth, monotone response): the two methods against each other.
  for (double t : {0.05, 0.5, 5.0, 50.0}) {
    const double stehfest = stehfest_inverse(
        [](double p) { return std::exp(-2.0 * std::sqrt(p)) / std::pow(p, 1.5); }, t);
    const double de_hoog =
        de_hoog_inverse([](C p) { return std::exp(-2.0 * std::sqrt(p)) / std::pow(p, 1.5); }, t);
    CHECK(stehfest == Approx(de_hoog).margin(stehfest_margin));
  }
}
