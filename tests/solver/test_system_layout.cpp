// The per-cell layout of a model (solver/system_layout.hpp): the smoothed saturated
// thickness and its slope against a central finite difference.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/system_layout.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

TEST_CASE("saturated thickness is C1 and exact outside the smoothing intervals",
          "[system_layout]") {
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
