#pragma once
// The model's length and time units and their factors to metres and days.
#include <string_view>

namespace aquiledger {

/// Metres in one model length unit: m = 1, ft = 0.3048 (international foot, exact by the
/// 1959 international yard and pound agreement).
double metres_per_length_unit(std::string_view unit);

/// Days in one model time unit: s = 1/86400, min = 1/1440, h = 1/24, d = 1,
/// yr = 365.25 (the Julian year; from memory).
double days_per_time_unit(std::string_view unit);

}  // namespace aquiledger
