#pragma once
// What the commands print the same way: the diagnostics of an input file, and the end of the
// terminal summary (model_diagnostics.hpp adds the model file's sorting and count line).
#include <filesystem>
#include <string>
#include <vector>

#include "io/model_file/diagnostics.hpp"

namespace aquiledger {

/// Prints every diagnostic (errors and warnings, in the order given) to standard error, one
/// a line; returns the number of errors.
int print_diagnostics(const std::vector<Diagnostic>& diagnostics);

/// The last lines of a command's terminal summary: "Results in <folder>", a blank line, and
/// the caution every run prints (io/reports/run_report.hpp).
std::string summary_end(const std::filesystem::path& folder);

}  // namespace aquiledger
