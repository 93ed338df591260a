// `aquiledger verify`: the analytical benchmark suite, its table, CSVs and page.
#include <fmt/format.h>

#include <cstdio>
#include <exception>

#include "io/cli/commands.hpp"
#include "io/files/output_error.hpp"
#include "io/files/read_error.hpp"
#include "io/reports/verify_report.hpp"
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
  } catch (const ReadError& e) {  // the Vega library the page inlines
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
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

}  // namespace aquiledger
