#include "postproc/estimation_setup.hpp"

#include <algorithm>
#include <stdexcept>

namespace aquiledger {

const char* target_kind_label(TargetKind kind) {
  switch (kind) {
    case TargetKind::head:
      return "head";
    case TargetKind::drawdown:
      return "drawdown";
    case TargetKind::head_difference:
      return "head_difference";
    case TargetKind::flow:
      return "flow";
  }
  return "?";
}

const char* gradient_method_label(GradientMethod method) {
  switch (method) {
    case GradientMethod::forward:
      return "forward";
    case GradientMethod::adjoint:
      return "adjoint";
    default:
      return "auto";
  }
}

int EstimationSetup::n_measurement_times() const {
  std::vector<double> times;
  for (const EstimationTarget& t : targets)
    times.insert(times.end(), t.times.begin(), t.times.end());
  std::sort(times.begin(), times.end());
  return static_cast<int>(std::unique(times.begin(), times.end()) - times.begin());
}

int EstimationSetup::n_measurements() const {
  std::size_t n = 0;
  for (const EstimationTarget& t : targets) n += t.values.size();
  return static_cast<int>(n);
}

Model model_with_parameters(const Model& base, const EstimationSetup& setup,
                            const std::vector<double>& values) {
  if (values.size() != setup.parameters.size())
    throw std::invalid_argument("model_with_parameters: one value per parameter expected");
  Model model = base;
  for (std::size_t k = 0; k < values.size(); ++k)
    apply_parameter(base, setup.parameters[k].parameter, values[k], model);
  return model;
}

}  // namespace aquiledger
