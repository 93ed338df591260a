#pragma once
// summary.json: what a run did, for scripts and reports.
#include <cstddef>
#include <filesystem>
#include <string>
#include <vector>

#include "io/files/output_error.hpp"

namespace aquiledger {

/// Member names follow the program's driver (io/cli); JSON keys are listed in
/// summary_json.cpp. Counts left at their defaults are written as they are.
struct RunSummary {
  std::string version;     ///< program version
  std::string title;       ///< model title
  std::string model_file;  ///< absolute path of the model file
  std::string length_unit;
  std::string time_unit;
  std::string start_date;  ///< ISO date of model time 0; empty when the model gives none
  int cells = 0;
  int active_cells = 0;
  int unknowns = 0;  ///< equations per Newton iteration (active, not fixed-head)
  int periods = 0;
  int steps = 0;                                ///< accepted steps
  double wall_seconds = 0.0;                    ///< s, whole run
  double output_seconds = 0.0;                  ///< s, of which computing and writing results
  std::vector<int> newton_iterations_per_step;  ///< per accepted step
  long linear_iterations = 0;                   ///< total (0 for a direct solver)
  int cutbacks = 0;                             ///< step halvings over the run
  std::string linear_solver;
  std::string linear_reason;
  double max_abs_imbalance_percent = 0.0;  ///< %, largest |imbalance| of a step
  double well_shortfall_volume = 0.0;      ///< L3, withdrawal not delivered (dry cells)
  bool converged = true;
  std::string failure;  ///< empty when converged
  std::vector<std::string> warnings;
  /// The professional-judgement caution line (the driver sets the program's wording).
  std::string caution =
      "Model results depend on the conceptual model and its inputs; review them with "
      "professional judgement before relying on them.";
};

/// The JSON text (exposed for tests).
std::string summary_json(const RunSummary& summary);

/// Writes summary_json(summary) to path atomically; throws OutputError on failure.
void write_summary_json(const std::filesystem::path& path, const RunSummary& summary);

}  // namespace aquiledger
