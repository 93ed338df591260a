#pragma once
// The text `aquiledger check` prints: what the model file describes, in plain aligned text.
#include <string>

#include "solver/model.hpp"

namespace aquiledger {

/// Grid extent, property ranges, storage route, periods with their step lengths, features
/// with their cell counts, observations, settings and warnings.
std::string format_check_report(const Model& model);

}  // namespace aquiledger
