// A delay bed (solver/delay_bed.hpp) after a step change of the aquifer's head, against
// Terzaghi's (1925) series solution of one-dimensional consolidation.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/delay_bed.hpp"

using namespace aquiledger;

namespace {

/// Degree of consolidation U(Tv) of a layer drained on both faces after a step change of
/// head at its faces (Terzaghi, 1925): U = 1 - sum_m 8 / ((2m+1)^2 pi^2)
/// exp(-(2m+1)^2 pi^2 Tv / 4), Tv = cv t / H^2, H = half the thickness (drainage path).
double terzaghi_u(double tv) {
  double sum = 0.0;
  for (int m = 0; m < 2000; ++m) {
    const double k = (2.0 * m + 1.0) * M_PI;
    sum += 8.0 / (k * k) * std::exp(-k * k * tv / 4.0);
  }
  return 1.0 - sum;
}

}  // namespace

TEST_CASE("Terzaghi series: the commonly tabulated points", "[delay_bed]") {
  // From memory (soil mechanics textbooks' table of U against Tv for a uniform initial
  // excess): U = 50 % at Tv = 0.197, U = 90 % at Tv = 0.848; and U = sqrt(4 Tv / pi) for
  // U < 60 % (the early-time form of the same series).
  CHECK(terzaghi_u(0.197) == Approx(0.50).margin(1e-3));
  CHECK(terzaghi_u(0.848) == Approx(0.90).margin(1e-3));
  CHECK(terzaghi_u(0.05) == Approx(std::sqrt(4.0 * 0.05 / M_PI)).margin(1e-6));
}

TEST_CASE("delay bed: degree of consolidation after a step change of head", "[delay_bed]") {
  // A clay bed 10 m thick, Kv 1e-4 m/d, Ss 1e-3 1/m: cv = Kv / Ss = 0.1 m2/d, H = 5 m.
  DelayBed bed;
  bed.thickness = 10.0;
  bed.vertical_k = 1e-4;
  bed.specific_storage = 1e-3;
  bed.head.assign(200, 0.0);
  const double cv = bed.vertical_k / bed.specific_storage, half = 0.5 * bed.thickness;
  const double drop = 1.0;  // the aquifer's head falls by 1 m at t = 0 and stays there
  const double dtv = 1e-4, dt = dtv * half * half / cv;
  double released = 0.0, tv = 0.0;
  for (double check : {0.01, 0.05, 0.1, 0.2, 0.5, 1.0}) {
    while (tv < check - 0.5 * dtv) {
      const DelayBedStep s = advance_delay_bed(bed, -drop, dt);
      // The bed's own balance: what it lost equals the end-of-step flow out of its faces
      // times dt (backward Euler), to rounding.
      CHECK(s.released == Approx(delay_bed_face_flow(bed, -drop) * dt).epsilon(1e-9));
      released += s.released;
      tv += dtv;
    }
    // U = released / (Ss b drop), the final release being Ss b drop.
    const double u = released / (bed.specific_storage * bed.thickness * drop);
    INFO("Tv = " << check);
    // Backward Euler with Tv steps of 1e-4 on 200 slices: error measured 1.6e-4 at Tv = 0.01,
    // 2e-5 to 7e-5 later (first order in time, largest at early Tv); tolerance 5e-4.
    CHECK(u == Approx(terzaghi_u(check)).margin(5e-4));
  }
}
