#pragma once
// What the models of the estimation tests (test_estimation_reader.cpp,
// test_fitted_model_writer.cpp) share.
#include <string>

namespace aquiledger::testing {

/// The [grid] and [aquifer] of their models: 2 x 3 cells of 10 m, a switching aquifer 10 m
/// thick, K by zones from `kzones_file` (zone 1: 2, zone 2: 8) and Sy 0.2; the caller's text
/// goes on with the aquifer's specific_storage.
inline std::string zoned_aquifer_model_head(const std::string& kzones_file) {
  return R"([grid]
nrow = 2
ncol = 3
dx = 10.0
dy = 10.0
[aquifer]
top = 10.0
bottom = 0.0
k = { zones = ")" +
         kzones_file + R"(", values = { 1 = 2.0, 2 = 8.0 } }
condition = "switching"
specific_yield = 0.2
)";
}

}  // namespace aquiledger::testing
