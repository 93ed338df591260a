#pragma once
// The text `aquiledger check` prints: what the model file describes, in plain aligned text.
#include <string>

#include "solver/model.hpp"

namespace aquiledger {

/// Grid extent, property ranges, storage route, periods with their step lengths, features
/// with their cell counts, observations, settings and warnings.
std::string format_check_report(const Model& model);

/// Length of the first and last step of a period (T): dt1 = L (g - 1) / (g^n - 1), or L / n
/// when g = 1, so that the n steps growing by g sum to L (geometric series).
double first_step_length(const Period& period);
double last_step_length(const Period& period);

}  // namespace aquiledger
