#pragma once
// Plausibility checks of aquifer properties against ranges of common practice. They warn,
// never stop a run.
#include <string>
#include <vector>

#include "postproc/land_surface.hpp"
#include "solver/model.hpp"

namespace aquiledger {

struct PlausibilityWarning {
  std::string key;  ///< e.g. "[aquifer].k"
  std::string message;
};

/// Confined storativity outside 1e-5..1e-3, specific yield outside 0.01..0.35 and
/// K outside 1e-4..1e4 m/d (in the model's units) over the active cells; a bore whose
/// measured heads all lie outside the run; with a land surface, initial heads above it and an
/// aquifer top above it; interbeds with Ske outside 1e-6..1e-4 1/m, Skv outside 1e-5..1e-2
/// 1/m, or Skv below Ske.
std::vector<PlausibilityWarning> plausibility_warnings(const Model& model);

/// "in 12 active cells (largest 3.2 m at row 4, column 7; 2.9 m at ...)", for warnings.
std::string describe_heads_above(const HeadsAboveSurface& above, const RectilinearGrid& grid,
                                 const std::string& length_unit);

/// Minimum and maximum over the active cells the array holds (NaN, NaN when there are none).
std::pair<double, double> active_range(const RectilinearGrid& grid,
                                       const CellArray<double>& values);

}  // namespace aquiledger
