// The storage function W(h) (solver/storage_function.hpp): values, exact changes and the
// slope against a central finite difference.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/storage_function.hpp"

using namespace aquiledger;

namespace {
constexpr double fd_step = 1e-6;
}

TEST_CASE("storage function W(h): values, exact changes, slope", "[storage_function]") {
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

TEST_CASE("storage release rate: a falling head releases water by mechanism",
          "[storage_function]") {
  // Definitions of storativity (volume released per unit area per unit decline of head under
  // pressure; Jacob, 1940) and specific yield (volume drained per unit area per unit decline
  // of the water table): a decline releases water, counted positive into the flow.
  const CellStorage confined{Condition::confined, 1e-4, 0.0, 10.0, 0.0};
  const StorageRelease c = storage_release_rate(confined, 100.0, 10.0, 9.0, 2.0);
  CHECK(c.elastic == Approx(100.0 * 1e-4 * 1.0 / 2.0));  // 5e-3 L3/T
  CHECK(c.drainage == 0.0);
  // A switching cell falling from 0.5 above its top to 0.5 below: the elastic part releases
  // S x 0.5, the drainage part Sy x 0.5, per unit area over dt = 1.
  const CellStorage switching{Condition::switching, 1e-4, 0.2, 10.0, 0.0};
  const StorageRelease s = storage_release_rate(switching, 1.0, 10.5, 9.5, 1.0);
  CHECK(s.elastic == Approx(1e-4 * 0.5));
  CHECK(s.drainage == Approx(0.2 * 0.5));
  // A rise stores water: the same rates with the opposite sign.
  const StorageRelease r = storage_release_rate(switching, 1.0, 9.5, 10.5, 1.0);
  CHECK(r.elastic == Approx(-s.elastic));
  CHECK(r.drainage == Approx(-s.drainage));
}

TEST_CASE("interbeds: elastic above the preconsolidation head, inelastic below",
          "[storage_function][interbeds]") {
  // No-delay interbeds (physics decisions, docs/subsidence.md): the beds give Ske b per unit
  // decline of head above the preconsolidation head and Skv b below it (Terzaghi, 1925, one-
  // dimensional consolidation; the preconsolidation head as the stress history's memory).
  CellStorage s{Condition::confined, 1e-4, 0.0, 10.0, 0.0};
  s.interbed_elastic = 2e-5 * 8.0;    // Ske b
  s.interbed_inelastic = 1e-3 * 8.0;  // Skv b
  s.preconsolidation = 40.0;
  // Above pc: only the elastic part changes, by Ske b dh.
  StoredWater d = stored_water_change(s, 45.0, 42.0);
  CHECK(d.interbed_elastic == Approx(-2e-5 * 8.0 * 3.0));
  CHECK(d.interbed_inelastic == 0.0);
  // Across pc from above: Ske b down to pc, Skv b below it.
  d = stored_water_change(s, 42.0, 37.0);
  CHECK(d.interbed_elastic == Approx(-2e-5 * 8.0 * 2.0));
  CHECK(d.interbed_inelastic == Approx(-1e-3 * 8.0 * 3.0));
  CHECK(d.elastic == Approx(-1e-4 * 5.0));
  // The change is W(h_new) - W(h_old) with the same pc (mass conservation within a step).
  CHECK(d.total() == Approx(stored_water(s, 37.0).total() - stored_water(s, 42.0).total()));
  // Slope: the elastic (upper) one at the kink, as at the top of a switching cell.
  CHECK(stored_water_slope(s, 40.0) == Approx(1e-4 + 2e-5 * 8.0));
  CHECK(stored_water_slope(s, 39.0) == Approx(1e-4 + 1e-3 * 8.0));
  // The preconsolidation head only goes down.
  CHECK(lowered_preconsolidation(40.0, 37.0) == 37.0);
  CHECK(lowered_preconsolidation(40.0, 43.0) == 40.0);
  // Release rates by mechanism, per unit area over dt = 2: a decline releases water.
  const StorageRelease r = storage_release_rate(s, 1.0, 42.0, 37.0, 2.0);
  CHECK(r.interbed_elastic == Approx(2e-5 * 8.0 * 2.0 / 2.0));
  CHECK(r.interbed_inelastic == Approx(1e-3 * 8.0 * 3.0 / 2.0));
}

TEST_CASE("interbeds: the slope of W(h) against a central finite difference",
          "[storage_function][interbeds]") {
  CellStorage s{Condition::switching, 2e-4, 0.15, 30.0, 10.0};
  s.interbed_elastic = 3e-5 * 5.0;
  s.interbed_inelastic = 6e-4 * 5.0;
  for (Condition c : {Condition::confined, Condition::water_table, Condition::switching})
    for (double pc : {20.0, 30.0, 35.0}) {
      s.condition = c;
      s.preconsolidation = pc;
      for (double h : {5.0, 12.0, 19.0, 21.0, 29.0, 31.0, 34.0, 36.0, 40.0}) {
        const double fd =
            (stored_water(s, h + fd_step).total() - stored_water(s, h - fd_step).total()) /
            (2 * fd_step);
        // As above: rounding of W ~ 3 over a difference 2e-6 leaves ~1e-9 absolute.
        CHECK(stored_water_slope(s, h) == Approx(fd).margin(1e-8));
      }
    }
}
