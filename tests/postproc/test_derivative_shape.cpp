// Reading the shape of the logarithmic derivative (Bourdet et al., 1989): each signature of the
// trade drawn from the program's closed forms (each checked against published tables or scipy
// in test_well_test_models.cpp, test_neuman_delayed_yield.cpp and
// test_analytical_solutions.cpp), noise-free and with seeded noise.
//
// Why "at least 9 of 10" seeds: the noise is normal with a standard deviation of 1 cm on
// drawdowns of one to a few metres (a water-level dipper reads to about 1 cm; common practice,
// from memory), 0.03 to 1 % of the largest drawdown. Each bin median of the derivative rests on
// about 3 to 8 points whose scatter the chosen window brings to about a tenth of the derivative, so
// a bin median is off by 10 % or more in a few per cent of bins; a reading errs only when such a
// bin sits where a threshold (30 % dip, 60 % fall, 20 % flat, 50 % rise) is nearly met. One seed in
// ten is allowed that chance; a rule that misread the shape itself would fail every seed, as the
// thirds-of-ln-t rule it replaces failed the clean cases/03 curves.
#include <catch2/catch.hpp>
#include <cmath>
#include <random>

#include "postproc/pumping_test_fit.hpp"
#include "postproc/well_test_models.hpp"

using namespace aquiledger;

namespace {

/// One well's drawdowns over one constant-rate step (Q = 1000 m3/d from t = 0), at `n` times
/// evenly spaced in log t from t_first to t_last (days), with normal noise of standard deviation
/// `noise` (m) when seed > 0.
DerivativeReading read_signature(WellTestModel model, const std::vector<double>& p, double r,
                                 double t_first, double t_last, int n, unsigned seed,
                                 std::vector<ImageWell> images = {}, PumpedWellRadii radii = {},
                                 double noise = 0.01) {
  const std::vector<RateStep> schedule{{0.0, 1000.0}};
  std::vector<double> t, s;
  for (int i = 0; i < n; ++i) {
    t.push_back(t_first * std::pow(t_last / t_first, static_cast<double>(i) / (n - 1)));
    s.push_back(schedule_drawdown(model, p, schedule, r, t.back(), images, radii));
  }
  if (seed > 0) {
    std::mt19937 generator(seed);
    std::normal_distribution<double> normal(0.0, noise);
    for (double& v : s) v += normal(generator);
  }
  return read_derivative_shape(t, s);
}

/// Noise-free, then seeds 1..10: the expected shape noise-free and in at least 9 of 10.
template <typename Read>
void check_signature(Read read, DerivativeShape expected, bool unit_slope = false) {
  const DerivativeReading clean = read(0u);
  CHECK(clean.shape == expected);
  CHECK(clean.unit_slope_start == unit_slope);
  int right = 0;
  for (unsigned seed = 1; seed <= 10; ++seed) {
    const DerivativeReading noisy = read(seed);
    right += noisy.shape == expected && noisy.unit_slope_start == unit_slope ? 1 : 0;
  }
  CHECK(right >= 9);
}

}  // namespace

TEST_CASE("derivative shape: Theis levels off", "[derivative_shape]") {
  // Radial flow: ds/d ln t = Q e^-u / (4 pi T) -> Q / (4 pi T) (Theis, 1935).
  check_signature(
      [](unsigned seed) {
        return read_signature(WellTestModel::theis, {420.0, 3e-4}, 20.0, 1e-4, 1.0, 60, seed);
      },
      DerivativeShape::plateau);
}

TEST_CASE("derivative shape: Neuman's delayed-yield trough", "[derivative_shape]") {
  // The parameters of cases/03 (its make_test.py), both its wells, its sampling (40 times from
  // 10^-3.5 to 10 d): Neuman (1974), T 150 m2/d, S 5e-4, Sy 0.12, L_v 200 m.
  for (double r : {6.0, 20.0})
    check_signature(
        [r](unsigned seed) {
          return read_signature(WellTestModel::neuman, {150.0, 5e-4, 0.12, 200.0}, r,
                                std::pow(10.0, -3.5), 10.0, 40, seed);
        },
        DerivativeShape::dip_and_return);
  // Another aquifer (that of test_neuman_delayed_yield.cpp's trough): T 200, S 2e-4, Sy 0.15,
  // L_v 300 m, at 8 m, 1e-4 to 60 d.
  check_signature(
      [](unsigned seed) {
        return read_signature(WellTestModel::neuman, {200.0, 2e-4, 0.15, 300.0}, 8.0, 1e-4, 60.0,
                              60, seed);
      },
      DerivativeShape::dip_and_return);
}

TEST_CASE("derivative shape: leakage falls off", "[derivative_shape]") {
  // Hantush and Jacob (1955): the derivative is Q / (4 pi T) exp(-u - r^2 / (4 B^2 u)), which
  // falls to zero once t is well past S B^2 / T.
  check_signature(
      [](unsigned seed) {
        return read_signature(WellTestModel::hantush_jacob, {250.0, 1e-4, 300.0}, 20.0, 1e-4, 10.0,
                              60, seed);
      },
      DerivativeShape::falls_off);
}

TEST_CASE("derivative shape: a barrier doubles, a recharge line falls", "[derivative_shape]") {
  // Ferris et al. (1962) images at 2 x 200 m: a barrier adds a pumping image (the late
  // derivative doubles), a recharge line an injecting one (it falls towards zero).
  check_signature(
      [](unsigned seed) {
        return read_signature(WellTestModel::theis, {600.0, 5e-4}, 20.0, 1e-4, 30.0, 60, seed,
                              {{400.0, false}});
      },
      DerivativeShape::rises_late);
  check_signature(
      [](unsigned seed) {
        return read_signature(WellTestModel::theis, {600.0, 5e-4}, 20.0, 1e-4, 30.0, 60, seed,
                              {{400.0, true}});
      },
      DerivativeShape::falls_off);
}

TEST_CASE("derivative shape: well-bore storage's early unit slope", "[derivative_shape]") {
  // Papadopulos and Cooper (1967): in a large-diameter well (r_w 0.6 m, casing 0.5 m, T 50 m2/d,
  // S 2e-3) the casing gives the water at first, s = Q t / (pi r_c^2); read in the well itself
  // from 1e-4 d, over 5 log cycles so that radial flow (from about 250 r_c^2 / T = 1.25 d,
  // Papadopulos and Cooper, 1967) levels off after it.
  check_signature(
      [](unsigned seed) {
        return read_signature(WellTestModel::papadopulos_cooper, {50.0, 2e-3}, 0.6, 1e-4, 1e3, 80,
                              seed, {}, {0.6, 0.5});
      },
      DerivativeShape::plateau, true);
}

TEST_CASE("derivative shape: too few points say nothing", "[derivative_shape]") {
  const DerivativeReading few =
      read_signature(WellTestModel::theis, {420.0, 3e-4}, 20.0, 1e-4, 1.0, 8, 0u);
  CHECK(few.shape == DerivativeShape::too_few_points);
  CHECK_FALSE(few.unit_slope_start);
}
