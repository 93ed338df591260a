// The closed forms of the verification suite against tabulated values and known limits.
#include <catch2/catch.hpp>
#include <cmath>

#include "postproc/analytical_solutions.hpp"

using namespace aquiledger;

TEST_CASE("well functions match tabulated values and their limits", "[analytical_solutions]") {
  // Abramowitz and Stegun (1964), Table 5.1: E1(0.1) = 1.8229239584, E1(1) = 0.2193839344
  // (from memory, 10 digits).
  CHECK(theis_well_function(0.1) == Approx(1.8229239584).epsilon(1e-9));
  CHECK(theis_well_function(1.0) == Approx(0.2193839344).epsilon(1e-9));
  // Hantush and Jacob (1955): W(u, r/B -> 0) = W(u); W(u -> 0, r/B) = 2 K0(r/B).
  CHECK(leaky_well_function(0.1, 1e-6) == Approx(theis_well_function(0.1)).epsilon(1e-9));
  CHECK(leaky_well_function(1e-6, 0.5) == Approx(2.0 * bessel_k0(0.5)).epsilon(1e-9));
  // Abramowitz and Stegun (1964), Table 9.8: K0(1) = 0.4210244382 (from memory).
  CHECK(bessel_k0(1.0) == Approx(0.4210244382).epsilon(1e-9));
}

TEST_CASE("drawdown solutions reduce to each other where they must", "[analytical_solutions]") {
  // Papadopulos (1965) with Tx = Ty is Theis (1935).
  CHECK(papadopulos_drawdown(1000.0, 100.0, 100.0, 1e-4, 30.0, 40.0, 2.0) ==
        Approx(theis_drawdown(1000.0, 100.0, 1e-4, 50.0, 2.0)).epsilon(1e-14));
  // Along the x axis an anisotropic aquifer is Theis with T_e = sqrt(Tx Ty) at the scaled
  // radius x sqrt(T_e / Tx) (Papadopulos, 1965).
  CHECK(papadopulos_drawdown(1000.0, 400.0, 100.0, 1e-4, 300.0, 0.0, 2.0) ==
        Approx(theis_drawdown(1000.0, 200.0, 1e-4, 300.0 * std::sqrt(200.0 / 400.0), 2.0))
            .epsilon(1e-12));
  // Glover and Balmer (1954): depletion fraction erfc(1) = 0.1572992070 at t = d^2 S / (4 T)
  // (Abramowitz and Stegun, 1964, Table 7.1, from memory).
  CHECK(glover_balmer_depletion_fraction(200.0, 100.0, 1e-4, 0.01) ==
        Approx(0.1572992070).epsilon(1e-9));
  // Carslaw and Jaeger (1959): the full step at the boundary, none far away.
  CHECK(step_response(2.0, 1e4, 0.0, 1.0) == 2.0);
  CHECK(step_response(2.0, 1e4, 1e4, 1.0) < 1e-30);
  // Dupuit-Forchheimer: the fixed heads at both ends; without recharge h^2 is linear in x.
  CHECK(dupuit_recharge_head(10.0, 6.0, 200.0, 0.002, 5.0, 0.0) == Approx(10.0));
  CHECK(dupuit_recharge_head(10.0, 6.0, 200.0, 0.002, 5.0, 200.0) == Approx(6.0));
  CHECK(dupuit_recharge_head(10.0, 6.0, 200.0, 0.0, 5.0, 100.0) == Approx(std::sqrt(68.0)));
}

TEST_CASE("two-zone Dupuit strip: ends, one-zone limit, continuity at the interface",
          "[analytical]") {
  // The closed form is derived in analytical_solutions.hpp from Dupuit's discharge law
  // q = -k d(h^2 / 2)/dx (Dupuit, 1863; Forchheimer, 1886); check what the derivation imposes.
  const double h1 = 20.0, h2 = 12.0, length = 1500.0, n = 2e-3, a = 750.0;
  CHECK(dupuit_two_zone_head(h1, h2, length, n, 20.0, 5.0, a, 0.0) == Approx(h1));
  CHECK(dupuit_two_zone_head(h1, h2, length, n, 20.0, 5.0, a, length) == Approx(h2));
  for (double x : {100.0, 749.0, 1200.0})
    CHECK(dupuit_two_zone_head(h1, h2, length, n, 7.0, 7.0, a, x) ==
          Approx(dupuit_recharge_head(h1, h2, length, n, 7.0, x)).epsilon(1e-12));
  // Discharge continuity: k (h^2)' equal on both sides of the interface; and the discharge
  // grows by the recharge between two points, q(x2) - q(x1) = n (x2 - x1).
  auto discharge = [&](double x, double k) {
    const double d = 1e-4;
    const double hp = dupuit_two_zone_head(h1, h2, length, n, 20.0, 5.0, a, x + d);
    const double hm = dupuit_two_zone_head(h1, h2, length, n, 20.0, 5.0, a, x - d);
    return -k * (hp * hp - hm * hm) / (4.0 * d);
  };
  // Across the interface (2 mm apart) the discharge grows only by the recharge between,
  // 4e-6 m2/d. The central differences are exact for the quadratic h^2; rounding of h^2
  // ~ 300 m2 over 2e-4 m, times k, leaves ~ 2e-9 m2/d: margin 1e-8.
  CHECK(discharge(a + 1e-3, 5.0) - discharge(a - 1e-3, 20.0) == Approx(n * 2e-3).margin(1e-8));
  CHECK(discharge(1300.0, 5.0) - discharge(200.0, 20.0) == Approx(n * 1100.0).epsilon(1e-6));
}

TEST_CASE("Dupuit-Thiem head: outer head and the h^2 logarithm", "[analytical]") {
  // Thiem (1906) with Dupuit's (1863) assumption: h^2 - h_w^2 = q / (pi k) ln(r / r_w).
  CHECK(dupuit_thiem_head(1000.0, 10.0, 20.0, 2000.0, 2000.0) == Approx(20.0));
  const double h10 = dupuit_thiem_head(1000.0, 10.0, 20.0, 2000.0, 10.0);
  const double h100 = dupuit_thiem_head(1000.0, 10.0, 20.0, 2000.0, 100.0);
  CHECK(h100 * h100 - h10 * h10 ==
        Approx(1000.0 / (3.14159265358979323846 * 10.0) * std::log(10.0)));
}
