// aquiledger: the command line. Subcommands read a model, check it, or run it.
#include <fmt/format.h>

#include <CLI/CLI.hpp>
#include <csignal>
#include <cstdlib>

#include "aquiledger_version.hpp"
#include "io/cli/commands.hpp"
#include "io/cli/drawdown_fit_command.hpp"
#include "io/cli/estimate_command.hpp"
#include "io/cli/openmp_waiting.hpp"
#include "io/cli/sources_command.hpp"

// OpenMP threads wait passively unless the user chose otherwise: the program starts itself
// again, once, before any library initialises (io/cli/openmp_waiting.hpp).
AQUILEDGER_WAIT_PASSIVELY_BY_DEFAULT;

int main(int argc, char** argv) {
  using namespace aquiledger;
  // Past a file-size limit (ulimit -f) a write then fails with EFBIG, reported like a full
  // disk, instead of the signal killing the program mid-file.
  std::signal(SIGXFSZ, SIG_IGN);
  CLI::App app{
      "aquiledger: transient 2D groundwater flow with exact confined / water-table storage "
      "switching and closed water budgets."};
  app.set_version_flag("--version", fmt::format("aquiledger {}", version_string));
  app.require_subcommand(1);
  app.footer(
      "Exit status: 0 success; 1 invalid model file (nothing run); 2 the run did not converge "
      "(results up to the last converged step are kept); 3 results could not be written (or, for "
      "report, read); 4 --resume found no checkpoint it could use; 5 verify: a benchmark fell "
      "outside its tolerance; 64 the command line was wrong. `aquiledger COMMAND --help` lists the "
      "codes each command returns.");

  CheckOptions check_options;
  auto* check = app.add_subcommand("check", "Validate a model file and print what it describes.");
  check->add_option("MODEL", check_options.model_file, "Model definition (TOML)")->required();
  check->add_flag("-q,--quiet", check_options.quiet,
                  "Print only errors and the final status line, not the description");
  check->footer(
      "Exit status: 0 the model is valid (warnings may be printed); 1 it is not (every "
      "error is printed with file, line and key); 64 the command line was wrong.");

  RunOptions run_options;
  auto* run = app.add_subcommand("run", "Validate and run a model, writing results.");
  run->add_option("MODEL", run_options.model_file, "Model definition (TOML)")->required();
  run->add_option("-o,--output", run_options.output_folder,
                  "Folder for results (default: [output].folder of the model)");
  run->add_option("-t,--threads", run_options.threads, "Threads (default: [solver].threads)")
      ->check(CLI::NonNegativeNumber);
  run->add_flag("-q,--quiet", run_options.quiet, "Print only errors and the final status line");
  run->add_option(
         "--checkpoint-every", run_options.checkpoint_every,
         "Write a checkpoint (checkpoint.aqck in the results folder) every N accepted steps")
      ->check(CLI::NonNegativeNumber);
  run->add_flag("--resume", run_options.resume,
                "Continue from the checkpoint in the results folder; the results equal those of an "
                "uninterrupted run");

  run->add_option("--engine", run_options.engine,
                  "serial (default), or petsc: the distributed engine, one process per MPI rank "
                  "(mpirun -np N aquiledger run MODEL --engine petsc; needs a build with "
                  "-DAQUILEDGER_WITH_PETSC=ON)")
      ->check(CLI::IsMember({"serial", "petsc"}));
  run->footer(
      "Exit status: 0 the run finished; 1 invalid model file (nothing run); 2 the run did not "
      "converge (results up to the last converged step are kept, complete and readable); 3 "
      "results could not be written; 4 --resume found no checkpoint it could use; 64 the command "
      "line was wrong, or this build lacks the engine asked for.");

  VerifyOptions verify_options;
  auto* verify = app.add_subcommand(
      "verify",
      "Run the analytical benchmark suite on built-in grids and compare with the "
      "published solutions.");
  verify->add_option(
      "-o,--out", verify_options.output_folder,
      "Folder for the comparison CSV files and verify.html (default: verify-results)");
  verify->add_flag("-q,--quiet", verify_options.quiet, "Print only failures and the final line");
  verify->footer(
      "Exit status: 0 every benchmark passes; 3 the comparisons could not be written; "
      "5 a benchmark fell outside its tolerance; 64 the command line was wrong.");

  ReportOptions report_options;
  auto* report =
      app.add_subcommand("report", "Write a self-contained HTML report of a results folder.");
  report->add_option("RESULTS", report_options.results_folder, "Results folder of a run")
      ->required();
  report->add_option("-o,--out", report_options.output_file,
                     "HTML file (default: RESULTS/report.html)");
  report->add_option(
      "-m,--model", report_options.model_file,
      "Model file, for measured heads (default: model_file in RESULTS/summary.json)");
  report
      ->add_flag("--without-model", report_options.without_model,
                 "Do not read the model: a report without measured heads")
      ->excludes("--model");
  report->add_option(
      "--maps-at", report_options.maps_at,
      "Output times at which to map head, drawdown, cell state and compaction: T1,T2 "
      "(model time units, each an output time) or all (default: the last)");
  report->add_flag("-q,--quiet", report_options.quiet, "Print only errors");
  report->footer(
      "Exit status: 0 the report was written; 1 the model for the measured heads could not be "
      "read, or is not known (nothing was written, an earlier report is kept); 3 the results "
      "folder could not be read or the report not written; 64 the command line was wrong (a "
      "bad --maps-at value, or a time no field file holds; nothing was written). The page's "
      "sections and the calibration statistics: docs/report.md.");

  SourcesOptions sources_options;
  auto* sources = add_sources_subcommand(app, sources_options);

  DrawdownFitOptions drawdown_fit_options;
  auto* drawdown_fit = add_drawdown_fit_subcommand(app, drawdown_fit_options);

  EstimateOptions estimate_options;
  auto* estimate = add_estimate_subcommand(app, estimate_options);

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    return app.exit(e) == 0 ? 0 : exit_usage;
  }
  if (*check) return run_check_command(check_options);
  if (*verify) return run_verify_command(verify_options);
  if (*report) return run_report_command(report_options);
  if (*sources) return run_sources_command(sources_options);
  if (*drawdown_fit) return run_drawdown_fit_command(drawdown_fit_options);
  if (*estimate) return run_estimate_command(estimate_options);
  return run_run_command(run_options);
}
