// The residual norms both engines' Newton tests use (solver/newton_solver.hpp): the same
// largest, worst equation and Euclidean norm however the equations are split.
#include <Eigen/Core>
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/newton_solver.hpp"

using namespace aquiledger;

TEST_CASE("residual norms: largest with ties to the lowest index, Euclidean norm",
          "[newton_solver]") {
  Eigen::VectorXd r(6);
  r << 0.5, -3.0, 2.0, 3.0, -1.0, 0.0;
  const ResidualNorms norms = residual_norms(r);
  CHECK(norms.max_abs == 3.0);
  CHECK(norms.worst == 1);  // |-3| at 1 and |3| at 3: the lower index, as a serial scan finds
  // sqrt(0.25 + 9 + 4 + 9 + 1) = sqrt(23.25), by hand.
  CHECK(norms.norm == Approx(std::sqrt(23.25)).epsilon(1e-15));
}

TEST_CASE("residual scans of disjoint ranges merge into the scan of their union",
          "[newton_solver]") {
  // As ranks (or threads) holding 0..2 and 3..5 would: merged in either order, the result
  // is the scan of all six.
  const double r[] = {0.5, -3.0, 2.0, 3.0, -1.0, 0.0};
  ResidualScan whole, low, high;
  for (int i = 0; i < 6; ++i) whole.add(r[i], i);
  for (int i = 0; i < 3; ++i) low.add(r[i], i);
  for (int i = 3; i < 6; ++i) high.add(r[i], i);
  for (const bool low_first : {true, false}) {
    ResidualScan merged;
    merged.merge(low_first ? low : high);
    merged.merge(low_first ? high : low);
    CHECK(merged.norms().max_abs == whole.norms().max_abs);
    CHECK(merged.norms().worst == 1);
    CHECK(merged.norms().norm == Approx(whole.norms().norm).epsilon(1e-15));
  }
  // No equation at all (a rank without unknowns): nothing is worst.
  CHECK(ResidualScan{}.norms().worst == -1);
  CHECK(ResidualScan{}.norms().max_abs == 0.0);
}
