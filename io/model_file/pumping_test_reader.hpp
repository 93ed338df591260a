#pragma once
// Reads a pumping-test file (TOML; docs/pumping-tests.md, "The test file") into a PumpingTest:
// the rate schedule, the observation wells and their drawdown series (inline or from CSV
// files, as drawdowns or water levels below a static level). All errors are reported together,
// each naming file, line and key.
#include <filesystem>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "io/model_file/diagnostics.hpp"
#include "postproc/pumping_test_fit.hpp"

namespace aquiledger {

struct PumpingTestReadResult {
  std::optional<PumpingTest> test;      ///< set when there were no errors
  std::optional<std::string> model;     ///< [test].model as written ("theis", "auto" ...)
  std::vector<Diagnostic> diagnostics;  ///< errors and warnings, in the order found
};

/// Model names the file and the command accept: the fitting models and "auto".
std::vector<std::string> pumping_test_model_names();
/// The model of a name ("auto" and unknown names: nullopt).
std::optional<WellTestModel> well_test_model_from_name(std::string_view name);

PumpingTestReadResult read_pumping_test_file(const std::filesystem::path& path);
/// Reads TOML text as though it were the file at as_if_path (series files relative to it).
PumpingTestReadResult read_pumping_test_text(std::string_view toml_text,
                                             const std::filesystem::path& as_if_path);

}  // namespace aquiledger
