// `aquiledger report`: the HTML report of a results folder.
#include <cstdio>

#include "io/cli/commands.hpp"
#include "io/files/output_error.hpp"
#include "io/files/read_error.hpp"
#include "io/reports/results_report.hpp"

namespace aquiledger {

int run_report_command(const ReportOptions& options) {
  ResultsReportOptions o;
  o.results_folder = options.results_folder;
  o.output_file =
      options.output_file ? *options.output_file : options.results_folder / "report.html";
  o.model_file = options.model_file;
  o.without_model = options.without_model;
  try {
    if (options.maps_at) parse_maps_at(*options.maps_at, o);
  } catch (const ReportOptionError& e) {
    std::fprintf(stderr, "error: %s\nNo report was written.\n", e.what());
    return exit_usage;
  }
  try {
    const ResultsReportSummary s = write_results_report(o);
    if (!s.note.empty() && !options.quiet) std::fprintf(stderr, "note: %s\n", s.note.c_str());
    if (!options.quiet)
      std::fprintf(stdout,
                   "aquiledger report: %d charts (%d observations with measured heads) in %s\n",
                   s.charts, s.observations_with_measurements, o.output_file.string().c_str());
  } catch (const ReportOptionError& e) {
    std::fprintf(stderr, "error: %s\nNo report was written.\n", e.what());
    return exit_usage;
  } catch (const ReportModelError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_invalid_model;
  } catch (const ReadError& e) {
    std::fprintf(stderr, "error: %s\nNo report was written.\n", e.what());
    return exit_output_failure;
  } catch (const OutputError& e) {
    std::fprintf(stderr, "error: %s\nNo report was written.\n", e.what());
    return exit_output_failure;
  }
  return exit_success;
}

}  // namespace aquiledger
