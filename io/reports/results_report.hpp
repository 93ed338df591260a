#pragma once
// `aquiledger report`: one self-contained HTML page from a results folder (budgets,
// storage release by mechanism, imbalance, hydrographs with measured heads and residual
// statistics, head and drawdown maps).
#include <filesystem>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

namespace aquiledger {

struct ResultsReportOptions {
  std::filesystem::path results_folder;
  std::filesystem::path output_file;                ///< the HTML page
  std::optional<std::filesystem::path> model_file;  ///< for measured heads (else summary.json)
  bool without_model = false;                       ///< no measured heads: the model is not read
  std::optional<std::vector<double>> maps_at;       ///< T, output times to map (default: last)
  bool maps_at_all = false;                         ///< map every output time
};

/// An option names something the results do not hold (e.g. --maps-at a time without a field
/// file): nothing was written.
struct ReportOptionError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// Parses --maps-at: "all", or times separated by commas ("10,365.25"). Throws
/// ReportOptionError naming the bad value.
void parse_maps_at(const std::string& text, ResultsReportOptions& options);

/// The model whose measured heads the report should show cannot be read (or is not known):
/// nothing was written.
struct ReportModelError : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// The model file the report reads: --model, else summary.json's model_file (absolute since
/// results version 2, so found from any working folder); empty with without_model. Throws
/// ReportModelError when summary.json names none.
std::filesystem::path report_model_path(const ResultsReportOptions& options,
                                        const std::string& summary_json);

/// What the page holds, for the command's message.
struct ResultsReportSummary {
  int charts = 0;
  int observations_with_measurements = 0;
  std::string note;  ///< why measured heads or maps are missing, if they are
};

/// Builds and writes the page; throws ReadError naming a results file that could not be read,
/// OutputError naming the page when it could not be written, ReportModelError when the model for
/// the measured heads cannot be read (an existing page is then left as it was).
ResultsReportSummary write_results_report(const ResultsReportOptions& options);

/// The string value of a top-level key of a JSON object text ("" when absent or null).
std::string json_text_value(const std::string& json, const std::string& key);

}  // namespace aquiledger
