#pragma once
// What an estimation fits and to what: the parameters (with bounds, transform and prior) and
// the measured targets (heads, drawdowns, head differences, feature flows), resolved against
// one model (docs/estimation.md). Plain data; the set-up file is read in io/model_file/.
#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "solver/model.hpp"
#include "solver/model_parameter.hpp"
#include "solver/stress_flows.hpp"

namespace aquiledger {

struct EstimatedParameter {
  ModelParameter parameter;
  double start = 1.0;  ///< the property's unit, or - for a multiplier
  double lower = 0.0;  ///< as start, > 0
  double upper = 0.0;  ///< as start, >= start
  bool log = true;     ///< estimated as ln p
  /// Tikhonov regularisation: the prior value (as start) and its weight, 1 / variance of the
  /// prior in the estimated quantity (ln p when log, else p).
  std::optional<double> prior;
  double prior_weight = 0.0;
};

enum class TargetKind {
  head,             ///< L, the head at a bore
  drawdown,         ///< L, initial head minus head at a bore
  head_difference,  ///< L, head at bore minus head at other_bore
  flow              ///< L3/T, net flow from the aquifer into a feature (out - in)
};

/// "head", "drawdown", "head_difference", "flow" as written in the set-up file.
const char* target_kind_label(TargetKind kind);

/// One measured series and how to compute it from a run.
struct EstimationTarget {
  std::string name;
  TargetKind kind = TargetKind::head;
  std::size_t bore = 0;                           ///< position in model.observations (not flow)
  std::size_t other_bore = 0;                     ///< head_difference only
  FeatureRef feature{"", FeatureKind::river, 0};  ///< flow only
  std::vector<double> times;                      ///< T, model time of each measurement, ascending
  std::vector<double> values;                     ///< L (L3/T for flow), measured
  std::vector<double> weights;  ///< 1 / standard deviation^2 per value (or a relative weight)
};

/// How the objective's gradient at the estimates is computed: from the fit's forward
/// sensitivities (J^T W r, no extra run), by the adjoint method (one run and one backward
/// pass), or automatically: the adjoint when the parameters outnumber the measurement times.
enum class GradientMethod { automatic, forward, adjoint };

/// "auto", "forward", "adjoint" as written in the set-up file.
const char* gradient_method_label(GradientMethod method);

struct EstimationSetup {
  std::vector<EstimatedParameter> parameters;
  std::vector<EstimationTarget> targets;
  int max_iterations = 50;  ///< of the Levenberg-Marquardt iteration
  GradientMethod gradient = GradientMethod::automatic;
  int n_measurements() const;
  /// Distinct times (T) over every target.
  int n_measurement_times() const;
};

/// The model with every parameter at its value (values: one per parameter, in order).
Model model_with_parameters(const Model& base, const EstimationSetup& setup,
                            const std::vector<double>& values);

}  // namespace aquiledger
