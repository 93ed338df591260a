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

namespace {

/// A bed of 6 m, Kv 2e-4 m/d, Ske 1e-5, Skv 4e-4 1/m, 12 slices of each half, with node heads
/// and preconsolidation heads that put some nodes above and some below their kink.
struct MixedBed {
  DelayBedLaw law{6.0, 2e-4, 1e-5, 4e-4, 12};
  std::vector<double> head_old, pc;
  MixedBed() {
    for (int j = 0; j < law.nodes; ++j) {
      head_old.push_back(10.0 - 0.15 * j);
      pc.push_back(9.2 + 0.07 * j - (j % 3 == 0 ? 0.5 : 0.0));
    }
  }
  DelayBedStepResult at(double h, double dt, std::vector<double>& out) const {
    out.assign(head_old.size(), 0.0);
    return solve_delay_bed_step(law, head_old, pc, h, dt, out);
  }
};

}  // namespace

TEST_CASE("delay bed: the step solve satisfies the bed's equations exactly", "[delay_bed]") {
  // Backward Euler on the half-bed (Terzaghi, 1925): each node's storage change over dt equals
  // the flow from its neighbours at the end of the step; the aquifer gains what the bed lost.
  const MixedBed bed;
  std::vector<double> h;
  for (double h_aq : {8.7, 9.6, 10.8}) {
    const double dt = 30.0;
    const DelayBedStepResult r = bed.at(h_aq, dt, h);
    REQUIRE(r.iterations > 0);
    const double dz = bed.law.slice(), g = bed.law.vertical_k / dz, g0 = 2.0 * g;
    double scale = 0.0, worst = 0.0;
    for (std::size_t j = 0; j < h.size(); ++j) {
      const double pc = bed.pc[j];
      const double stored = dz *
                            (bed.law.elastic_storage *
                                 (std::max(h[j] - pc, 0.0) - std::max(bed.head_old[j] - pc, 0.0)) +
                             bed.law.inelastic_storage *
                                 (std::min(h[j] - pc, 0.0) - std::min(bed.head_old[j] - pc, 0.0))) /
                            dt;
      const double left = j == 0 ? g0 * (h_aq - h[j]) : g * (h[j - 1] - h[j]);
      const double right = j + 1 < h.size() ? g * (h[j + 1] - h[j]) : 0.0;
      worst = std::max(worst, std::abs(stored - left - right));
      scale = std::max(scale, std::abs(left) + std::abs(right));
    }
    INFO("h_aquifer = " << h_aq);
    CHECK(worst <= 1e-12 * scale);
    // Both halves drain through their face: flow = 2 g0 (h_0 - h_aquifer).
    CHECK(r.flow == Approx(2.0 * g0 * (h[0] - h_aq)).epsilon(1e-9));
    CHECK(r.flow == Approx((r.elastic + r.inelastic) / dt).epsilon(1e-14));
  }
}

TEST_CASE("delay bed: d flow / d h_aquifer against central differences", "[delay_bed]") {
  // The condensed derivative 2 g0 (g0 (J^-1)_00 - 1) against central differences with
  // step 1e-6 m (truncation ~ 0 between kinks: the bed is piecewise linear; rounding
  // ~ 1e-16 flow / 1e-6), as for the storage function's slope (test_storage_function.cpp).
  const MixedBed bed;
  std::vector<double> h;
  for (double h_aq : {8.7, 9.35, 9.6, 10.8}) {
    for (double dt : {0.5, 30.0, 2000.0}) {
      const DelayBedStepResult r = bed.at(h_aq, dt, h);
      const double d = 1e-6;
      const double fd = (bed.at(h_aq + d, dt, h).flow - bed.at(h_aq - d, dt, h).flow) / (2 * d);
      INFO("h_aquifer = " << h_aq << ", dt = " << dt);
      CHECK(r.flow_slope == Approx(fd).epsilon(1e-7));
      CHECK(r.flow_slope < 0.0);  // a higher aquifer head draws less from the bed
    }
  }
}

TEST_CASE("delay bed: below pc the bed consolidates with Skv, recovery is elastic only",
          "[delay_bed]") {
  // Nodes at their preconsolidation head: a fall of 1 m drives every node below it, so the
  // bed consolidates with cv = Kv / Skv (Terzaghi, 1925): U(Tv) from the series above; a later
  // rise of the aquifer's head is taken up elastically (Ske) and nothing inelastic returns.
  DelayBedLaw law{4.0, 1e-4, 1e-5, 5e-4, 100};
  std::vector<double> head(100, 0.0), pc(100, 0.0), next(100);
  const double half = 2.0, cv = law.vertical_k / law.inelastic_storage;
  const double dtv = 1e-4, dt = dtv * half * half / cv;
  double inelastic = 0.0, tv = 0.0;
  while (tv < 0.2 - 0.5 * dtv) {
    const DelayBedStepResult r = solve_delay_bed_step(law, head, pc, -1.0, dt, next);
    CHECK(r.elastic == Approx(0.0).margin(1e-15));
    inelastic += r.inelastic;
    for (std::size_t j = 0; j < pc.size(); ++j) pc[j] = std::min(pc[j], next[j]);
    head = next;
    tv += dtv;
  }
  // Measured error 4e-5 with these steps (first order in time); tolerance 5e-4 as above.
  CHECK(inelastic / (law.inelastic_storage * law.thickness) ==
        Approx(terzaghi_u(0.2)).margin(5e-4));
  // The aquifer's head comes back to 0: the beds take water back elastically only; the
  // interior, still above the face's old level, may go on consolidating (inelastic release
  // >= 0), but nothing released below pc ever returns.
  double uptake = 0.0;
  for (int k = 0; k < 50; ++k) {
    const DelayBedStepResult r = solve_delay_bed_step(law, head, pc, 0.0, 100.0 * dt, next);
    CHECK(r.inelastic >= 0.0);
    CHECK(r.elastic <= 0.0);
    inelastic += r.inelastic;
    uptake -= r.elastic;
    for (std::size_t j = 0; j < pc.size(); ++j) pc[j] = std::min(pc[j], next[j]);
    head = next;
  }
  CHECK(inelastic <= law.inelastic_storage * law.thickness * 1.0);
  // The whole bed back near 0 from pc >= -1: the elastic uptake is at most Ske b 1 m.
  CHECK(uptake > 0.0);
  CHECK(uptake <= law.elastic_storage * law.thickness * 1.0);
}
