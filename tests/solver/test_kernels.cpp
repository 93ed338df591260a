// Pointwise kernels: storage function, face conductance, saturated thickness, time steps.
// Every derivative is checked against a central finite difference of its own function.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/face_conductance.hpp"
#include "solver/storage_function.hpp"
#include "solver/system_layout.hpp"
#include "solver/time_steps.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {
constexpr double fd_step = 1e-6;
}

TEST_CASE("storage function W(h): values, exact changes, slope", "[kernels]") {
  CellStorage s{Condition::switching, 2e-4, 0.15, 30.0, 10.0};
  // Piecewise-linear definition (physics decisions): elastic S max(h - top, 0), drainage
  // Sy (min(h, top) - bottom).
  CHECK(stored_water(s, 35.0).elastic == Approx(2e-4 * 5.0));
  CHECK(stored_water(s, 35.0).drainage == Approx(0.15 * 20.0));
  CHECK(stored_water(s, 20.0).elastic == 0.0);
  CHECK(stored_water(s, 20.0).drainage == Approx(0.15 * 10.0));
  // A change across the top equals the difference of W at both ends (mass conservation).
  const StoredWater d = stored_water_change(s, 33.0, 25.0);
  CHECK(d.elastic == Approx(stored_water(s, 25.0).elastic - stored_water(s, 33.0).elastic));
  CHECK(d.drainage == Approx(stored_water(s, 25.0).drainage - stored_water(s, 33.0).drainage));
  for (Condition c : {Condition::confined, Condition::water_table, Condition::switching}) {
    s.condition = c;
    for (double h : {5.0, 12.0, 29.0, 31.0, 40.0}) {
      const double fd =
          (stored_water(s, h + fd_step).total() - stored_water(s, h - fd_step).total()) /
          (2 * fd_step);
      // Rounding of W ~ 3 over a difference 2e-6 leaves ~1e-9 absolute.
      CHECK(stored_water_slope(s, h) == Approx(fd).margin(1e-8));
    }
  }
}

TEST_CASE("face conductance: harmonic mean and upstream derivatives", "[kernels]") {
  // Two equal half cells in series: K w / d (Darcy's law over the centre distance d).
  CHECK(harmonic_face_factor(5.0, 2.0, 10.0, 2.0, 10.0) == Approx(2.0 * 5.0 / 10.0));
  // Series resistances d/2 / (K w) add (harmonic mean of half-cell conductances).
  const double expect = 1.0 / (5.0 / (2.0 * 3.0) + 15.0 / (8.0 * 3.0));
  CHECK(harmonic_face_factor(3.0, 2.0, 10.0, 8.0, 30.0) == Approx(expect));

  auto thickness = [](double h) { return smooth_ramp(h - 1.0, 0.5); };
  for (auto [hi, hj] : {std::pair{3.0, 2.0}, {2.0, 3.0}, {1.2, 1.4}, {1.3, 1.1}}) {
    const FaceFlow f = upstream_face_flow(0.7, hi, thickness(hi), hj, thickness(hj));
    auto q = [&](double a, double b) {
      return upstream_face_flow(0.7, a, thickness(a), b, thickness(b)).q;
    };
    CHECK(f.dq_dhi ==
          Approx((q(hi + fd_step, hj) - q(hi - fd_step, hj)) / (2 * fd_step)).epsilon(1e-6));
    CHECK(f.dq_dhj ==
          Approx((q(hi, hj + fd_step) - q(hi, hj - fd_step)) / (2 * fd_step)).epsilon(1e-6));
    // The upstream cell's thickness carries the flow (docs/model-format.md, Face thickness).
    CHECK(f.q == Approx(0.7 * thickness(std::max(hi, hj)).value * (hj - hi)));
  }
}

TEST_CASE("blended face thickness: derivatives at wet, drying and dry states", "[kernels]") {
  auto thickness = [](double h) { return smooth_ramp(h - 1.0, 0.05); };
  auto q = [&](double a, double b) {
    return blended_face_flow(0.7, a, thickness(a), b, thickness(b)).q;
  };
  // Both wet (ratio above mean_thickness_ratio), one thinning through the blend, one in the
  // base smoothing interval, one dry, each with either cell upstream.
  for (auto [hi, hj] : {std::pair{3.0, 2.5},
                        {2.5, 3.0},
                        {3.0, 1.8},
                        {1.8, 3.0},
                        {3.0, 1.2},
                        {1.2, 3.0},
                        {1.03, 2.0},
                        {2.0, 1.03},
                        {0.5, 2.0},
                        {2.0, 0.5}}) {
    const FaceFlow f = blended_face_flow(0.7, hi, thickness(hi), hj, thickness(hj));
    CHECK(f.dq_dhi ==
          Approx((q(hi + fd_step, hj) - q(hi - fd_step, hj)) / (2 * fd_step)).epsilon(1e-6));
    CHECK(f.dq_dhj ==
          Approx((q(hi, hj + fd_step) - q(hi, hj - fd_step)) / (2 * fd_step)).epsilon(1e-6));
    // Seen from the other cell the flow is exactly the opposite (mass conservation).
    CHECK(blended_face_flow(0.7, hj, thickness(hj), hi, thickness(hi)).q == -f.q);
  }
}

TEST_CASE("blended face thickness: mean where wet, upstream at a dry cell", "[kernels]") {
  auto thickness = [](double h) { return smooth_ramp(h, 0.01); };
  // Both wet: the Girinskii potential difference, K (hj^2 - hi^2) / 2 per unit factor
  // (Dupuit-Forchheimer discharge over a flat base).
  CHECK(blended_face_flow(0.7, 8.0, thickness(8.0), 6.0, thickness(6.0)).q ==
        Approx(0.7 * (36.0 - 64.0) / 2.0));
  // A dry downstream cell wets from its neighbour through the upstream thickness.
  CHECK(blended_face_flow(0.7, 0.0, thickness(0.0), 5.0, thickness(5.0)).q ==
        Approx(0.7 * 5.0 * 5.0));
  // A dry upstream cell gives nothing: it holds no water to lose.
  CHECK(blended_face_flow(0.7, -0.5, thickness(-0.5), -1.0, thickness(-1.0)).q == 0.0);
  // A thin upstream cell gives at most b_up (1 + 1.5 / r0) of face thickness (the bound in
  // face_conductance.hpp), so its outflow vanishes with its own thickness.
  for (double b_up : {1e-4, 1e-3, 1e-2, 0.1, 1.0}) {
    const double f = blended_face_flow(1.0, b_up, thickness(b_up), -3.0, {4.0, 0.0}).q;
    CHECK(-f / (b_up + 3.0) <= b_up * (1.0 + 1.5 / mean_thickness_ratio));
  }
  // Continuity of the flow and of both derivatives where the weight reaches one (r = r0)
  // and where the thinner cell changes (bi = bj).
  const double hj = 4.0;
  for (double hi : {mean_thickness_ratio * hj, hj}) {
    const FaceFlow lo =
        blended_face_flow(0.7, hi - 1e-9, thickness(hi - 1e-9), hj + 1.0, {hj, 0.0});
    const FaceFlow up =
        blended_face_flow(0.7, hi + 1e-9, thickness(hi + 1e-9), hj + 1.0, {hj, 0.0});
    CHECK(lo.q == Approx(up.q).margin(1e-7));
    CHECK(lo.dq_dhi == Approx(up.dq_dhi).margin(1e-6));
    CHECK(lo.dq_dhj == Approx(up.dq_dhj).margin(1e-6));
  }
}

TEST_CASE("saturated thickness is C1 and exact outside the smoothing intervals", "[kernels]") {
  test::AquiferSpec a;
  a.condition = Condition::switching;
  a.top = 10.0;
  a.bottom = 0.0;
  const Model m = test::make_model({1.0}, {1.0}, a);
  const SystemLayout layout = make_system_layout(m);
  const CellIndex c{0};
  const double eps = layout.smoothing_length[0];
  CHECK(eps == Approx(smoothing_fraction * 10.0));
  CHECK(saturated_thickness(m, layout, c, 12.0).value == 10.0);
  CHECK(saturated_thickness(m, layout, c, 4.0).value == Approx(4.0));
  CHECK(saturated_thickness(m, layout, c, -1.0).value == 0.0);
  for (double h : {0.3 * eps, 0.7 * eps, 5.0, 10.0 - 0.6 * eps, 10.0 - 0.2 * eps, 11.0}) {
    const auto f = [&](double x) { return saturated_thickness(m, layout, c, x).value; };
    const double fd = (f(h + 1e-9) - f(h - 1e-9)) / 2e-9;
    CHECK(saturated_thickness(m, layout, c, h).slope == Approx(fd).margin(1e-5));
  }
  // Continuity of value and slope at the joins (base ramp end, top ramp ends).
  for (double h : {eps, 10.0 - eps, 10.0}) {
    const auto lo = saturated_thickness(m, layout, c, h - 1e-10);
    const auto hi = saturated_thickness(m, layout, c, h + 1e-10);
    CHECK(lo.value == Approx(hi.value).margin(1e-8));
    CHECK(lo.slope == Approx(hi.slope).margin(1e-6));
  }
}

TEST_CASE("step lengths grow geometrically and end on the period end", "[kernels]") {
  Period p;
  p.length = 120.0;
  p.steps = 12;
  p.growth = 1.2;
  const auto ends = step_end_times(p, 365.0);
  // Geometric series: dt1 = L (g - 1) / (g^n - 1).
  const double dt1 = 120.0 * 0.2 / (std::pow(1.2, 12) - 1.0);
  CHECK(ends[0] - 365.0 == Approx(dt1));
  CHECK((ends[2] - ends[1]) / (ends[1] - ends[0]) == Approx(1.2));
  CHECK(ends.back() == 485.0);
  p.growth = 1.0;
  CHECK(step_end_times(p, 0.0)[0] == Approx(10.0));
}
