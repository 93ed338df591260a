#pragma once
// `aquiledger report`: one self-contained HTML page from a results folder (budgets,
// storage release by mechanism, discrepancy, hydrographs with measured heads and residual
// statistics, head and drawdown maps).
#include <filesystem>
#include <optional>
#include <string>

namespace aquiledger {

struct ResultsReportOptions {
  std::filesystem::path results_folder;
  std::filesystem::path output_file;                 ///< the HTML page
  std::optional<std::filesystem::path> model_file;   ///< for measured heads (else summary.json)
};

/// What the page holds, for the command's message.
struct ResultsReportSummary {
  int charts = 0;
  int observations_with_measurements = 0;
  std::string note;  ///< why measured heads or maps are missing, if they are
};

/// Builds and writes the page; throws OutputError naming the file that could not be read
/// or written.
ResultsReportSummary write_results_report(const ResultsReportOptions& options);

/// The string value of a top-level key of a JSON object text ("" when absent or null).
std::string json_text_value(const std::string& json, const std::string& key);

}  // namespace aquiledger
