#pragma once
// summary.json: what a run did, for scripts and reports.
#include <cstddef>
#include <filesystem>
#include <string>
#include <vector>

#include "io/output_error.hpp"

namespace aquiledger {

struct RunSummary {
  std::string program_version;
  std::string model_title;
  std::string model_file;
  std::string length_unit;
  std::string time_unit;
  int cells = 0;
  int active_cells = 0;
  int unknowns = 0;
  std::size_t periods = 0;
  int steps = 0;
  double wall_time_seconds = 0.0;         ///< s
  std::vector<int> iterations_per_step;   ///< Newton iterations of each accepted step
  long newton_iterations = 0;
  long linear_iterations = 0;
  int cutbacks = 0;
  std::string linear_solver;
  std::string linear_reason;
  double largest_discrepancy_percent = 0.0;  ///< %, largest |discrepancy| over the steps
  double well_shortfall_volume = 0.0;        ///< L3, withdrawal not delivered (dry cells)
  bool converged = true;
  std::string failure;  ///< empty when converged
  std::vector<std::string> warnings;
  /// Reminder that a model's results are only as good as the judgement behind its inputs.
  std::string caution =
      "Model results depend on the conceptual model and its inputs; review them with "
      "professional judgement before relying on them.";
};

/// The JSON text (exposed for tests).
std::string summary_json(const RunSummary& summary);

/// Writes summary_json(summary) to path atomically; throws OutputError on failure.
void write_summary_json(const std::filesystem::path& path, const RunSummary& summary);

}  // namespace aquiledger
