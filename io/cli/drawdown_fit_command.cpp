// `drawdown-fit`: interprets a pumping test (docs/pumping-tests.md): reads the test file,
// fits the chosen model (or compares them, `auto`), writes fit.json, parameters.csv,
// fit_series.csv and the self-contained page interpretation.html.
#include "io/cli/drawdown_fit_command.hpp"

#include <fmt/format.h>

#include <CLI/CLI.hpp>
#include <algorithm>
#include <cstdio>
#include <stdexcept>

#include "aquiledger_version.hpp"
#include "io/cli/command_output.hpp"
#include "io/cli/commands.hpp"
#include "io/files/atomic_file.hpp"
#include "io/files/output_lock.hpp"
#include "io/files/read_error.hpp"
#include "io/model_file/pumping_test_reader.hpp"
#include "io/reports/html_report.hpp"
#include "io/reports/pumping_test_report.hpp"
#include "io/results/pumping_test_files.hpp"

namespace aquiledger {

CLI::App* add_drawdown_fit_subcommand(CLI::App& app, DrawdownFitOptions& o) {
  std::string models;
  for (const std::string& n : pumping_test_model_names())
    models += (models.empty() ? "" : ", ") + n;
  auto* cmd = app.add_subcommand(
      "drawdown-fit",
      "Interpret a pumping test: fit drawdown models to the observation wells and write the "
      "fitted values (fit.json, parameters.csv, fit_series.csv) and the interpretation page "
      "(interpretation.html).");
  cmd->add_option("TEST", o.test_file, "Pumping-test file (TOML)")->required();
  cmd->add_option("-m,--model", o.model,
                  "Model to fit: " + models + " (default: [test].model, else auto)");
  cmd->add_option("-o,--output", o.output_folder,
                  "Folder for the results (default: drawdown-fit beside the test file)");
  cmd->add_flag("-q,--quiet", o.quiet, "Print only errors");
  cmd->footer(
      "Exit status: 0 the interpretation was written; 1 invalid test file, or no model could be "
      "fitted (every error printed with file, line and key); 3 the results could not be "
      "written; 64 the command line was wrong.");
  return cmd;
}

int run_drawdown_fit_command(const DrawdownFitOptions& o) {
  const PumpingTestReadResult read = read_pumping_test_file(o.test_file);
  const int n_errors = print_diagnostics(read.diagnostics);
  if (!read.test) {
    std::fprintf(stderr, "%d error(s) in %s; nothing fitted\n", n_errors,
                 o.test_file.string().c_str());
    return exit_invalid_model;
  }
  const std::string name = o.model.value_or(read.model.value_or("auto"));
  std::optional<WellTestModel> model = well_test_model_from_name(name);
  if (!model && name != "auto") {
    std::string models;
    for (const std::string& n : pumping_test_model_names())
      models += (models.empty() ? "" : ", ") + n;
    std::fprintf(stderr, "error: --model %s: expected one of %s\n", name.c_str(), models.c_str());
    return exit_usage;
  }
  const PumpingTest& test = *read.test;
  PumpingTestInterpretation result;
  try {
    result = interpret_pumping_test(test, model);
  } catch (const std::invalid_argument& e) {
    std::fprintf(stderr, "%s: error: %s\n", o.test_file.string().c_str(), e.what());
    return exit_invalid_model;
  }
  const std::filesystem::path folder =
      o.output_folder ? *o.output_folder
                      : std::filesystem::absolute(o.test_file).parent_path() / "drawdown-fit";
  const std::string test_path = std::filesystem::absolute(o.test_file).string();
  std::string html;
  try {
    // The page is rendered before anything is written, so a missing Vega leaves nothing.
    html = pumping_test_page(test, result, test_path).render(load_vega_library());
  } catch (const ReadError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
  }
  try {
    const OutputFolderLock lock(folder);
    write_drawdown_fit_files(folder, test, result, test_path, version_string);
    write_file_atomically(folder / "interpretation.html", html);
  } catch (const OutputError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
  }
  if (o.quiet) return exit_success;
  const ModelFit& m = result.chosen_fit();
  std::string out = fmt::format("{}: {} observation(s) in {} well(s)\n",
                                test.title.empty() ? o.test_file.string() : test.title,
                                test.n_observations(), test.wells.size());
  std::size_t name_width = 14;  // the model names' column as wide as the longest name
  for (const ModelFit& c : result.candidates)
    name_width = std::max(name_width, model_name(c.model).size());
  for (const ModelFit& c : result.candidates)
    out += fmt::format("  {:<{}} AICc {:>10.2f}  rms residual {:.3g} {}{}\n", model_name(c.model),
                       name_width, c.aicc, c.rms_residual, test.length_unit,
                       &c == &m ? (result.automatic ? "  <- chosen" : "") : "");
  const std::vector<std::string>& names = m.parameter_names;
  for (std::size_t j = 0; j < names.size(); ++j) {
    const auto i = static_cast<Eigen::Index>(j);
    out +=
        fmt::format("  {:<16} {:.4g} {} (95 %: {:.4g} .. {:.4g})\n", names[j], m.fit.parameters[i],
                    parameter_unit(names[j], test), m.fit.lower_95[i], m.fit.upper_95[i]);
  }
  if (!m.description.empty()) out += "  model: " + m.description + "\n";
  for (const std::string& s : result.classification) out += "  - " + s + "\n";
  out += summary_end(folder);
  std::fputs(out.c_str(), stdout);
  return exit_success;
}

}  // namespace aquiledger
