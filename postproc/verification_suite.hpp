#pragma once
// The analytical benchmark suite behind `aquiledger verify`: each benchmark builds its own
// model in memory, runs it and compares with a closed form from the literature. Numerics
// only: printing, CSV and HTML are in io/.
#include <functional>
#include <string>
#include <vector>

namespace aquiledger {

/// One compared series: numerical and analytical values at the same abscissae.
struct VerificationCurve {
  std::string name;                ///< file stem, e.g. "theis_profile"
  std::string title;               ///< e.g. "Drawdown along the well's row at t = 10 d"
  std::string x_label;             ///< with unit, e.g. "distance from the well (m)"
  std::string y_label;             ///< with unit, e.g. "drawdown (m)"
  std::vector<double> x;           ///< abscissa (L or T)
  std::vector<double> numerical;   ///< simulated value
  std::vector<double> analytical;  ///< closed-form value
};

/// Outcome of one benchmark. Every compared point has an error and a tolerance (fixed, or
/// an error budget per point); the row reports the point where error / tolerance is largest.
struct VerificationResult {
  std::string name;            ///< short key, e.g. "theis"
  std::string title;           ///< e.g. "Pumped confined aquifer"
  std::string source;          ///< published source, e.g. "Theis (1935)"
  std::string quantity;        ///< what is compared, e.g. "drawdown, relative error"
  std::string unit;            ///< unit of error and tolerance ("-" for relative)
  double largest_error = 0.0;  ///< error at the worst point
  double tolerance = 0.0;      ///< tolerance at the worst point
  int points = 0;              ///< compared points
  bool passed = false;         ///< every point within its tolerance
  double seconds = 0.0;        ///< wall time of the benchmark
  std::vector<VerificationCurve> curves;
};

/// Error bookkeeping shared by the benchmarks.
struct WorstPoint {
  double error = 0.0;
  double tolerance = 0.0;
  double ratio = -1.0;
  int points = 0;
  bool passed = true;
  /// error and tolerance of one compared point (same unit); NaN errors fail.
  void add(double error_value, double tolerance_value);
};

/// Runs every benchmark (units: metres and days throughout), calling on_done after each.
std::vector<VerificationResult> run_verification_suite(
    const std::function<void(const VerificationResult&)>& on_done = {});

}  // namespace aquiledger
