#include <catch2/catch.hpp>
#include <cmath>

#include "postproc/calibration_statistics.hpp"

using namespace aquiledger;

// Definitions (Anderson, Woessner & Hunt 2015, Applied Groundwater Modeling, 2nd ed., ch. 9;
// from memory): residual e = simulated - measured; mean error = sum(e)/n; mean absolute
// error = sum|e|/n; RMSE = sqrt(sum(e^2)/n); scaled RMSE = RMSE / (range of measured heads).
//
// Hand-computed table. Bore A: simulated times 0, 10, 20 with heads 50, 48, 47
//   measured (5, 48.5): simulated 50 + 0.5 (48 - 50) = 49.0, e = +0.5
//   measured (10, 48.2): simulated 48.0, e = -0.2
//   measured (15, 47.0): simulated 48 + 0.5 (47 - 48) = 47.5, e = +0.5
//   measured (25, 46.0): after the last output time, no pair
// Bore B (one measured head, as in a steady calibration): simulated 40 throughout,
//   measured (10, 41.0), e = -1.0
// All bores: n = 4, mean error = -0.2/4 = -0.05, mean absolute error = 2.2/4 = 0.55,
//   RMSE = sqrt(1.54/4) = sqrt(0.385), range = 48.5 - 41.0 = 7.5.
// Bore A: mean error 0.8/3, mean absolute error 1.2/3 = 0.4, RMSE sqrt(0.18).
// Tolerance: the inputs carry about 1e-16 relative rounding; 1e-12 leaves ample room.
namespace {
const std::vector<double> times = {0.0, 10.0, 20.0};
const std::vector<double> bore_a = {50.0, 48.0, 47.0};
const std::vector<double> bore_b = {40.0, 40.0, 40.0};
const std::vector<MeasuredHead> measured_a = {
    {5.0, 48.5}, {10.0, 48.2}, {15.0, 47.0}, {25.0, 46.0}};
const std::vector<MeasuredHead> measured_b = {{10.0, 41.0}};
}  // namespace

TEST_CASE("measured heads pair with the simulated series interpolated in time",
          "[postproc][calibration]") {
  const std::vector<HeadPair> a = pair_measured_heads(measured_a, times, bore_a);
  REQUIRE(a.size() == 3);
  CHECK(a[0].simulated == Approx(49.0).epsilon(1e-12));
  CHECK(a[1].simulated == Approx(48.0).epsilon(1e-12));
  CHECK(a[2].simulated == Approx(47.5).epsilon(1e-12));
  CHECK(a[2].measured == 47.0);
  CHECK(pair_measured_heads({{30.0, 1.0}}, times, bore_a).empty());
  CHECK_THROWS_AS(pair_measured_heads(measured_a, times, std::vector<double>{1.0}),
                  std::invalid_argument);
}

TEST_CASE("calibration statistics match a hand computation over all bores and per bore",
          "[postproc][calibration]") {
  const std::vector<HeadPair> a = pair_measured_heads(measured_a, times, bore_a);
  const std::vector<HeadPair> b = pair_measured_heads(measured_b, times, bore_b);
  std::vector<HeadPair> all = a;
  all.insert(all.end(), b.begin(), b.end());
  const double range = measured_range(all);
  CHECK(range == Approx(7.5).epsilon(1e-12));

  const CalibrationStatistics s = calibration_statistics(all, range);
  CHECK(s.count == 4);
  CHECK(*s.mean_error == Approx(-0.05).epsilon(1e-12));
  CHECK(*s.mean_absolute_error == Approx(0.55).epsilon(1e-12));
  CHECK(*s.rmse == Approx(std::sqrt(0.385)).epsilon(1e-12));
  CHECK(*s.scaled_rmse == Approx(std::sqrt(0.385) / 7.5).epsilon(1e-12));

  const CalibrationStatistics sa = calibration_statistics(a, range);
  CHECK(sa.count == 3);
  CHECK(*sa.mean_error == Approx(0.8 / 3.0).epsilon(1e-12));
  CHECK(*sa.mean_absolute_error == Approx(0.4).epsilon(1e-12));
  CHECK(*sa.rmse == Approx(std::sqrt(0.18)).epsilon(1e-12));
  CHECK(*sa.scaled_rmse == Approx(std::sqrt(0.18) / 7.5).epsilon(1e-12));
}

TEST_CASE("one measured head or none leaves statistics not defined, never NaN",
          "[postproc][calibration]") {
  const std::vector<HeadPair> b = pair_measured_heads(measured_b, times, bore_b);
  CHECK(measured_range(b) == 0.0);
  const CalibrationStatistics one = calibration_statistics(b, measured_range(b));
  CHECK(one.count == 1);
  CHECK(*one.mean_error == Approx(-1.0).epsilon(1e-12));
  CHECK(*one.rmse == Approx(1.0).epsilon(1e-12));
  CHECK_FALSE(one.scaled_rmse.has_value());

  const CalibrationStatistics none = calibration_statistics(std::vector<HeadPair>{}, 0.0);
  CHECK(none.count == 0);
  CHECK_FALSE(none.mean_error.has_value());
  CHECK_FALSE(none.rmse.has_value());
  CHECK_FALSE(none.scaled_rmse.has_value());
}
