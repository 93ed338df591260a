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
