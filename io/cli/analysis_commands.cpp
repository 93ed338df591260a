// `verify` and `report`: the benchmark suite and the HTML report of a results folder.
#include <fmt/format.h>

#include <cstdio>
#include <exception>

#include "io/cli/commands.hpp"
#include "io/files/output_error.hpp"
#include "io/reports/results_report.hpp"
#include "io/reports/verify_command.hpp"
#include "postproc/verification_suite.hpp"

namespace aquiledger {

int run_verify_command(const VerifyOptions& options) {
  const bool quiet = options.quiet;
  if (!quiet) {
    std::fputs("aquiledger verify: numerical results against analytical solutions (units m, d)\n\n",
               stdout);
    std::fputs(verification_table_header().c_str(), stdout);
    std::fflush(stdout);
  }
  std::vector<VerificationResult> results;
  try {
    results = run_verification_suite([quiet](const VerificationResult& r) {
      if (quiet && r.passed) return;
      std::fputs(verification_table_row(r).c_str(), stdout);
      std::fflush(stdout);
    });
  } catch (const std::exception& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_verification_failed;
  }
  int failed = 0;
  for (const auto& r : results) failed += r.passed ? 0 : 1;
  try {
    write_verification_results(options.output_folder, results);
  } catch (const OutputError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
  }
  std::fputs(fmt::format("{}{} of {} benchmarks pass; comparisons in {} (CSV, verify.html)\n",
                         quiet ? "" : "\n", results.size() - failed, results.size(),
                         options.output_folder.string())
                 .c_str(),
             stdout);
  return failed == 0 ? exit_success : exit_verification_failed;
}

int run_report_command(const ReportOptions& options) {
  ResultsReportOptions o;
  o.results_folder = options.results_folder;
  o.output_file =
      options.output_file ? *options.output_file : options.results_folder / "report.html";
  o.model_file = options.model_file;
  o.without_model = options.without_model;
  try {
    const ResultsReportSummary s = write_results_report(o);
    if (!s.note.empty() && !options.quiet) std::fprintf(stderr, "note: %s\n", s.note.c_str());
    if (!options.quiet)
      std::fprintf(stdout,
                   "aquiledger report: %d charts (%d observations with measured heads) in %s\n",
                   s.charts, s.observations_with_measurements, o.output_file.string().c_str());
  } catch (const ReportModelError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_invalid_model;
  } catch (const OutputError& e) {
    std::fprintf(stderr, "error: %s\nNo report was written.\n", e.what());
    return exit_output_failure;
  }
  return exit_success;
}

}  // namespace aquiledger
