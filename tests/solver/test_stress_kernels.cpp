// Pointwise stress kernels: each law against its defining formula away from its kinks, its
// limits, and each derivative against a centred finite difference (also inside the
// smoothing intervals, where the laws are cubic in head).
#include <catch2/catch.hpp>
#include <cmath>
#include <functional>
#include <vector>

#include "solver/stress_kernels.hpp"

using namespace aquiledger;

namespace {

constexpr double delta = 0.02;  ///< L, smoothing width (1e-3 of a 20 m aquifer, as in the layout)

/// Centred difference of f at h with step s. For a cubic piece the truncation error is
/// s^2 |f'''| / 6; the ramp's cubic has |r'''| = 6 / delta^2, so with s = 1e-5 delta the
/// error is 1e-10 of the coefficient, and round-off is ~1e-16 |f| / s. Both sit far below
/// the 1e-7 relative tolerance used.
double centred_difference(const std::function<double(double)>& f, double h,
                          double s = 1e-5 * delta) {
  return (f(h + s) - f(h - s)) / (2.0 * s);
}

/// Heads spread across a kink at z: outside on both sides and inside [z, z + delta]. None
/// sits on a kink itself (there f'' jumps and a centred difference is only O(s) accurate).
std::vector<double> heads_around(double z) {
  return {z - 1.7,         z - 0.5 * delta,  z + 0.1 * delta, z + 0.37 * delta,
          z + 0.5 * delta, z + 0.83 * delta, z + 1.5 * delta, z + 2.3};
}

void check_slope(const std::function<ValueSlope(double)>& kernel, double h, double scale) {
  const double fd = centred_difference([&](double x) { return kernel(x).value; }, h);
  INFO("head " << h << " analytic " << kernel(h).slope << " finite difference " << fd);
  CHECK(std::abs(kernel(h).slope - fd) <= 1e-7 * scale);
}

}  // namespace

TEST_CASE("well withdrawal is delivered in full above the reduction length", "[stress_kernels]") {
  const double q = 500.0, reduction = 0.2;
  // Definition of the reduced withdrawal (project physics decisions): q = -Q phi(b),
  // phi = 1 for b >= reduction length, shortfall Q (1 - phi).
  const StressFlow full = well_flow(q, {5.0, 1.0}, reduction, true);
  CHECK(full.q.value == -q);
  CHECK(full.q.slope == 0.0);
  CHECK(full.shortfall == 0.0);
  // A dry cell (b = 0) delivers nothing; the whole request is shortfall.
  const StressFlow dry = well_flow(q, {0.0, 0.0}, reduction, true);
  CHECK(dry.q.value == 0.0);
  CHECK(dry.shortfall == q);
  // Injection is never reduced, confined cells never reduce.
  CHECK(well_flow(-q, {0.0, 0.0}, reduction, true).q.value == q);
  CHECK(well_flow(q, {0.0, 0.0}, reduction, false).q.value == -q);
  // Delivered + shortfall = requested at every thickness (mass bookkeeping of the request).
  for (double b : {0.0, 0.01, 0.05, 0.1, 0.19, 0.3}) {
    const StressFlow w = well_flow(q, {b, 1.0}, reduction, true);
    CHECK(std::abs(-w.q.value + w.shortfall - q) <= 1e-12 * q);
  }
}

TEST_CASE("well and negative recharge slopes match finite differences", "[stress_kernels]") {
  const double bottom = 10.0, reduction = 0.2, area = 2500.0;
  // Thickness of a water-table cell, b = r(h - bottom, delta).
  auto thickness = [&](double h) { return smooth_ramp(h - bottom, delta); };
  auto well = [&](double h) { return well_flow(300.0, thickness(h), reduction, true).q; };
  auto recharge = [&](double h) {
    return recharge_flow(-2e-3, area, thickness(h), reduction, true).q;
  };
  for (double h : {bottom - 1.0, bottom + 0.3 * delta, bottom + 0.8 * delta, bottom + 0.05,
                   bottom + 0.1, bottom + 0.17, bottom + 0.5}) {
    check_slope(well, h, 300.0 / reduction);
    check_slope(recharge, h, 5.0 / reduction);
  }
}

TEST_CASE("recharge is rate times area; a negative rate is reduced like a withdrawal",
          "[stress_kernels]") {
  const double area = 2500.0, reduction = 0.2;
  // Areal recharge over a cell: q = rate A (definition of an areal flux, L/T over L2).
  const StressFlow wet = recharge_flow(4e-4, area, {0.0, 0.0}, reduction, true);
  CHECK(wet.q.value == Approx(4e-4 * area).epsilon(1e-15));
  CHECK(wet.shortfall == 0.0);
  const StressFlow spread = recharge_flow(-4e-4, area, {8.0, 1.0}, reduction, true);
  CHECK(spread.q.value == Approx(-4e-4 * area).epsilon(1e-15));
  const StressFlow dry = recharge_flow(-4e-4, area, {0.0, 0.0}, reduction, true);
  CHECK(dry.q.value == 0.0);
  CHECK(dry.shortfall == Approx(4e-4 * area).epsilon(1e-15));
}

TEST_CASE("river seepage: linear above the bed bottom, disconnected below", "[stress_kernels]") {
  const double stage = 36.0, bed = 34.5, c = 15.0;
  auto river = [&](double h) { return river_flow(h, stage, bed, c, delta); };
  // Linear bed-resistance law q = C (stage - h) (common practice: Darcy flow across a
  // riverbed of given conductance) once the head is above the bed bottom plus delta.
  for (double h : {bed + delta, 35.0, 36.0, 37.5, 50.0})
    CHECK(std::abs(river(h).value - c * (stage - h)) <= 1e-12 * c * 20.0);
  CHECK(river(38.0).value < 0.0);  // gaining: head above stage
  CHECK(river(35.0).value > 0.0);  // losing
  // Disconnected: seepage stays C (stage - bed bottom) however far the head falls
  // (percolation through an unsaturated zone under the bed, common practice).
  for (double h : {bed, bed - 0.01, bed - 10.0, bed - 1.0e6})
    CHECK(river(h).value == Approx(c * (stage - bed)).epsilon(1e-15));
  CHECK(river(bed - 100.0).slope == 0.0);
  // Inside the interval the seepage lies between the two linear laws (the ramp stays below d).
  const double hin = bed + 0.5 * delta;
  CHECK(river(hin).value > c * (stage - hin));
  CHECK(river(hin).value < c * (stage - bed));
  for (double h : heads_around(bed)) check_slope(river, h, c);
}

TEST_CASE("drain: nothing below its elevation, conductance times excess above",
          "[stress_kernels]") {
  const double elevation = 37.0, c = 50.0;
  auto drain = [&](double h) { return drain_flow(h, elevation, c, delta); };
  // Drain law q = -C (h - e) for h > e, zero otherwise (common practice).
  for (double h : {elevation, elevation - 0.001, elevation - 30.0}) {
    CHECK(drain(h).value == 0.0);
    CHECK(drain(h).slope == 0.0);
  }
  for (double h : {elevation + delta, 38.0, 45.0})
    CHECK(std::abs(drain(h).value + c * (h - elevation)) <= 1e-12 * c * 10.0);
  for (double h : heads_around(elevation)) check_slope(drain, h, c);
}

TEST_CASE("external head: conductance times head difference", "[stress_kernels]") {
  // General head boundary q = C (H - h) (common practice).
  const double c = 20.0, outside = 41.0;
  for (double h : {-5.0, 30.0, 41.0, 60.0}) {
    const ValueSlope q = external_head_flow(h, outside, c);
    CHECK(q.value == Approx(c * (outside - h)).margin(1e-12));
    CHECK(q.slope == -c);
  }
}

TEST_CASE("evapotranspiration: linear between extinction depth and surface", "[stress_kernels]") {
  const double surface = 39.0, rate = 3e-3, depth = 3.0, area = 2500.0;
  const double z0 = surface - depth;
  auto et = [&](double h) { return evapotranspiration_flow(h, surface, rate, depth, area, delta); };
  // Linear rate-depth law, maximum at the surface, zero at the extinction depth (common
  // practice): q = -A max_rate (h - z0) / extinction_depth between the two.
  for (double h : {z0 + delta, 37.0, 38.2, surface})
    CHECK(std::abs(et(h).value + area * rate * (h - z0) / depth) <= 1e-12 * area * rate);
  // Zero below extinction, whatever the depth.
  for (double h : {z0, z0 - 0.5, z0 - 1e4}) CHECK(et(h).value == 0.0);
  // Maximum rate above the surface (reached delta above it).
  for (double h : {surface + delta, surface + 1.0, surface + 1e4})
    CHECK(std::abs(et(h).value + area * rate) <= 1e-12 * area * rate);
  CHECK(et(surface + 2.0).slope == 0.0);
  for (double h : heads_around(z0)) check_slope(et, h, area * rate / depth);
  for (double h : heads_around(surface)) check_slope(et, h, area * rate / depth);
}

TEST_CASE("leakage: leakance times head difference, fixed below the aquifer top",
          "[stress_kernels]") {
  const double source = 42.0, top = 40.0, leakance = 2e-5, area = 2500.0;
  auto leak = [&](double h) { return leakage_flow(h, source, top, leakance, area, delta); };
  // Leakage through an aquitard, q = A (K'/b') (H - h) (Hantush and Jacob, 1955).
  for (double h : {top + delta, 41.0, 42.0, 45.0})
    CHECK(std::abs(leak(h).value - area * leakance * (source - h)) <=
          1e-12 * area * leakance * 5.0);
  // Below the top the aquitard drains freely under a unit gradient set by its own base:
  // the exchange stays A L (H - top) (project contract, model-format "Leakage").
  for (double h : {top, top - 1.0, top - 1e5})
    CHECK(leak(h).value == Approx(area * leakance * (source - top)).epsilon(1e-14));
  for (double h : heads_around(top)) check_slope(leak, h, area * leakance);
  // With no top (water-table aquifer) the linear law holds everywhere.
  const ValueSlope no_top = leakage_flow(10.0, source, std::nan(""), leakance, area, delta);
  CHECK(no_top.value == Approx(area * leakance * (source - 10.0)).epsilon(1e-14));
  CHECK(no_top.slope == -area * leakance);
}
