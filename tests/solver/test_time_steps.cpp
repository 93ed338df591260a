// Step lengths of a period (solver/time_steps.hpp): a geometric series that sums to the
// period's length.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/time_steps.hpp"

using namespace aquiledger;

TEST_CASE("first and last step lengths of a growing period", "[time_steps]") {
  // n steps growing by g sum to L: dt1 (g^n - 1) / (g - 1) = L (sum of a geometric series).
  const Period p{"p", 120.0, 12, 1.2, false};
  const double dt1 = first_step_length(p);
  double sum = 0.0;
  for (int k = 0; k < p.steps; ++k) sum += dt1 * std::pow(p.growth, k);
  CHECK(sum == Approx(120.0).epsilon(1e-13));
  CHECK(last_step_length(p) == Approx(dt1 * std::pow(1.2, 11)).epsilon(1e-14));
  CHECK(first_step_length(Period{"q", 30.0, 4, 1.0, false}) == Approx(7.5));  // L / n when g = 1
  CHECK(first_step_length(Period{"s", 365.0, 1, 1.0, true}) == 365.0);
}

TEST_CASE("step lengths grow geometrically and end on the period end", "[time_steps]") {
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
