// `estimate`: fits model parameters to measurements (docs/estimation.md): reads the set-up
// file and its model, fits with exact sensitivities, writes estimate.json and the CSV files.
#include "io/cli/estimate_command.hpp"

#include <fmt/format.h>

#include <CLI/CLI.hpp>
#include <cstdio>
#include <filesystem>
#include <stdexcept>
#include <system_error>

#include "aquiledger_version.hpp"
#include "io/cli/command_output.hpp"
#include "io/cli/commands.hpp"
#include "io/files/atomic_file.hpp"
#include "io/files/output_lock.hpp"
#include "io/files/read_error.hpp"
#include "io/model_file/estimation_reader.hpp"
#include "io/model_file/fitted_model_writer.hpp"
#include "io/reports/estimation_report.hpp"
#include "io/results/estimation_files.hpp"

namespace aquiledger {

CLI::App* add_estimate_subcommand(CLI::App& app, EstimateOptions& o) {
  auto* cmd = app.add_subcommand(
      "estimate",
      "Estimate model parameters from measured heads, drawdowns and flows (a set-up file naming "
      "the model, the parameters and the targets) and write the estimates with their 95 % "
      "intervals, correlations, sensitivities and residuals (CSV, JSON and estimate.html), and "
      "the fitted model (fitted_model.toml).");
  cmd->add_option("SETUP", o.setup_file, "Estimation set-up file (TOML)")->required();
  cmd->add_option("-o,--output", o.output_folder,
                  "Folder for the results (default: estimate beside the set-up file)");
  cmd->add_flag("-q,--quiet", o.quiet, "Print only errors");
  cmd->footer(
      "Exit status: 0 the estimates were written; 1 invalid set-up or model file (every error "
      "printed with file, line and key); 2 a model run did not converge; 3 the results could "
      "not be written; 64 the command line was wrong.");
  return cmd;
}

int run_estimate_command(const EstimateOptions& o) {
  const EstimationReadResult read = read_estimation_file(o.setup_file);
  const int n_errors = print_diagnostics(read.diagnostics);
  if (!read.setup || !read.model) {
    std::fprintf(stderr, "%d error(s); nothing estimated\n", n_errors);
    return exit_invalid_model;
  }
  const EstimationSetup& setup = *read.setup;
  EstimationResult result;
  try {
    result = estimate_parameters(*read.model, setup);
  } catch (const std::runtime_error& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_not_converged;
  }
  const std::filesystem::path folder =
      o.output_folder ? *o.output_folder
                      : std::filesystem::absolute(o.setup_file).parent_path() / "estimate";
  const std::string setup_path =
      std::filesystem::absolute(o.setup_file).lexically_normal().string();
  std::string fitted_model_note;
  // The page needs Debian's libjs-vega; without it the tables and the fitted model are still
  // written (a calibration is too costly to throw away for a page).
  std::string html, page_note;
  try {
    html = estimation_page(*read.model, setup, result, setup_path, read.model_file.string())
               .render(load_vega_library());
  } catch (const ReadError& e) {
    page_note = std::string("warning: no estimate.html written: ") + e.what() + "\n";
  }
  try {
    const OutputFolderLock lock(folder);
    write_estimation_files(folder, setup, result, setup_path, version_string);
    if (!html.empty()) write_file_atomically(folder / "estimate.html", html);
    std::vector<std::string> header = {
        fmt::format("Fitted model written by aquiledger {} estimate", version_string),
        "from the set-up " + setup_path, "calibrating the model " + read.model_file.string(),
        fmt::format("({} after {} iteration(s)). Fitted values (estimated_parameters.csv):",
                    result.fit.converged ? "converged" : "NOT converged", result.fit.n_iterations)};
    for (std::size_t j = 0; j < setup.parameters.size(); ++j) {
      const EstimatedParameter& e = setup.parameters[j];
      header.push_back(fmt::format(
          "  {}: {} {} = {:.6g}", e.parameter.name, parameter_property_label(e.parameter.property),
          e.parameter.form == ParameterForm::multiplier ? "multiplier" : "value",
          result.fit.parameters[static_cast<Eigen::Index>(j)]));
    }
    header.push_back("The values below are the fitted ones (not multipliers); paths are relative");
    header.push_back("to this file; its own runs write into results/ beside it.");
    std::vector<FittedModelFile> files;
    try {
      const std::vector<double> values(result.fit.parameters.data(),
                                       result.fit.parameters.data() + result.fit.parameters.size());
      files = fitted_model_files(read.model_file, *read.model, setup, values, folder, header);
    } catch (const std::exception& e) {  // a value form it cannot scale, or the model file gone
      fitted_model_note = std::string("warning: no fitted model written: ") + e.what() + "\n";
    }
    std::error_code ignored;  // an older run's page or fitted model must not pass for this one's
    if (html.empty()) std::filesystem::remove(folder / "estimate.html", ignored);
    if (files.empty()) std::filesystem::remove(folder / "fitted_model.toml", ignored);
    if (!files.empty()) {
      write_fitted_model(folder, files);
      fitted_model_note = "fitted model: " + (folder / "fitted_model.toml").string() + "\n";
    }
  } catch (const OutputError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
  }
  if (fitted_model_note.starts_with("warning")) std::fputs(fitted_model_note.c_str(), stderr);
  if (!page_note.empty()) std::fputs(page_note.c_str(), stderr);
  if (o.quiet) return exit_success;
  std::string out = fmt::format(
      "{} measurement(s), {} parameter(s): {} after {} iteration(s), {} run(s); objective {:.4g} "
      "-> {:.4g}\n",
      setup.n_measurements(), setup.parameters.size(),
      result.fit.converged ? "converged" : "NOT converged", result.fit.n_iterations,
      result.n_model_runs, result.fit.cost_history.front(), result.fit.weighted_sum_of_squares);
  for (std::size_t j = 0; j < setup.parameters.size(); ++j) {
    const auto i = static_cast<Eigen::Index>(j);
    out += fmt::format("  {:<20} {:.4g} (95 %: {:.4g} .. {:.4g})  css {:.3g}{}\n",
                       setup.parameters[j].parameter.name, result.fit.parameters[i],
                       result.fit.lower_95[i], result.fit.upper_95[i], result.css[i],
                       result.fit.at_bound[j] ? "  at a bound" : "");
  }
  for (const std::string& w : result.warnings) out += "  warning: " + w + "\n";
  if (!fitted_model_note.starts_with("warning")) out += fitted_model_note;
  out += summary_end(folder);
  std::fputs(out.c_str(), stdout);
  return exit_success;
}

}  // namespace aquiledger
