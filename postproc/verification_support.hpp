#pragma once
// Helpers shared by the benchmark files of the verification suite (not a public seam).
#include <cstddef>
#include <span>
#include <vector>

#include "postproc/verification_suite.hpp"
#include "postproc/water_budget.hpp"
#include "solver/model.hpp"
#include "solver/simulation.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger::verification {

/// Uniform aquifer of a benchmark model.
struct UniformAquifer {
  Condition condition = Condition::confined;
  double top = 10.0;               ///< L
  double bottom = 0.0;             ///< L
  double kx = 10.0;                ///< L/T
  double ky = 10.0;                ///< L/T
  double specific_storage = 1e-5;  ///< 1/L
  double specific_yield = 0.2;     ///< -
  double initial_head = 20.0;      ///< L
};

/// Column widths dx (L, west to east) and row heights dy (L, north to south).
Model uniform_model(std::vector<double> dx, std::vector<double> dy, const UniformAquifer& a);

/// Widths growing by `growth` away from a central one of width `inner` (L) until the half
/// extent reaches `half_extent` (L).
std::vector<double> telescoping_widths(double inner, double growth, double half_extent);

/// Every cell of the grid in raster order.
std::vector<CellIndex> all_cells(const Model& model);

/// A constant value in every period.
inline PeriodValues constant(double v) { return PeriodValues(v); }

/// Keeps every accepted step (and optionally its heads and budget).
class Recorder final : public SimulationObserver {
 public:
  Recorder(const Model& model, bool keep_budget);
  void initial_state(std::span<const double> head) override;
  void step_done(const StepInfo& info, std::span<const double> head_old,
                 std::span<const double> head_new) override;
  void period_done(std::size_t) override {}

  std::vector<double> initial;
  std::vector<StepInfo> steps;
  std::vector<std::vector<double>> heads;  ///< per step, per grid cell
  std::vector<WaterBudget> budgets;        ///< per step (rates, L3/T) when kept
  WaterBudget cumulative;                  ///< volumes (L3) since the start, when kept

 private:
  const Model& model_;
  SystemLayout layout_;
  bool keep_budget_;
};

/// Runs the model; throws std::runtime_error when it does not converge.
void run_or_throw(const Model& model, Recorder& recorder);

/// Step closest in time to t.
std::size_t step_nearest(const Recorder& r, double t);

/// Copies the tally into the result row.
void finish(VerificationResult& result, const WorstPoint& worst);

// The benchmarks (one per closed form).
VerificationResult benchmark_theis();
VerificationResult benchmark_papadopulos();
VerificationResult benchmark_hantush_jacob();
VerificationResult benchmark_glover_balmer();
VerificationResult benchmark_step_response();
VerificationResult benchmark_dupuit();
VerificationResult benchmark_drainage();
VerificationResult benchmark_compressibility();

}  // namespace aquiledger::verification
