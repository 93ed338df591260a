#pragma once
// Output of `aquiledger verify`: the printed table, one CSV per compared curve and the HTML
// page verify.html.
#include <filesystem>
#include <string>
#include <vector>

#include "postproc/verification_suite.hpp"

namespace aquiledger {

/// The header of the printed table.
std::string verification_table_header();
/// One printed row per benchmark.
std::string verification_table_row(const VerificationResult& result);

/// "x,numerical,analytical,error" rows of a curve (error = numerical - analytical); the
/// first column is named after the abscissa ("x" for distances, "t" for times).
std::string verification_curve_csv(const VerificationCurve& curve);

/// Writes <folder>/<curve>.csv for every curve, summary.csv (one row per benchmark) and
/// verify.html. The folder is created if needed; throws OutputError on failure.
void write_verification_results(const std::filesystem::path& folder,
                                const std::vector<VerificationResult>& results);

}  // namespace aquiledger
