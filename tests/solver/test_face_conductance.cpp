// Face conductance and the blended face thickness (solver/face_conductance.hpp); every
// derivative against a central finite difference of its own function.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/face_conductance.hpp"

using namespace aquiledger;

namespace {
constexpr double fd_step = 1e-6;
}

TEST_CASE("face conductance: harmonic mean and upstream derivatives", "[face_conductance]") {
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

TEST_CASE("blended face thickness: derivatives at wet, drying and dry states",
          "[face_conductance]") {
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

TEST_CASE("blended face thickness: mean where wet, upstream at a dry cell", "[face_conductance]") {
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
