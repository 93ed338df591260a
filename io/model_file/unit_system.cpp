#include "io/model_file/unit_system.hpp"

namespace aquiledger {

double metres_per_length_unit(std::string_view unit) { return unit == "ft" ? 0.3048 : 1.0; }

double days_per_time_unit(std::string_view unit) {
  if (unit == "s") return 1.0 / 86400.0;
  if (unit == "min") return 1.0 / 1440.0;
  if (unit == "h") return 1.0 / 24.0;
  if (unit == "yr") return 365.25;
  return 1.0;
}

}  // namespace aquiledger
