#include "postproc/estimation_setup.hpp"

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
