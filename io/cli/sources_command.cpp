// `sources`: where the water of a chosen set of wells comes from (storage by mechanism,
// rivers and drains, boundaries, other stresses), from a run with and one without them, or
// from two results folders.
#include "io/cli/sources_command.hpp"

#include <fmt/format.h>

#include <CLI/CLI.hpp>
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>
#include <optional>
#include <sstream>
#include <stdexcept>

#include "aquiledger_version.hpp"
#include "io/cli/commands.hpp"
#include "io/cli/model_diagnostics.hpp"
#include "io/files/atomic_file.hpp"
#include "io/files/output_lock.hpp"
#include "io/files/read_error.hpp"
#include "io/model_file/model_reader.hpp"
#include "io/reports/run_report.hpp"
#include "io/results/water_sources_files.hpp"
#include "postproc/water_sources.hpp"

namespace aquiledger {

namespace {

std::vector<std::string> split_names(const std::string& list) {
  std::vector<std::string> names;
  std::stringstream s(list);
  for (std::string item; std::getline(s, item, ',');) {
    const auto first = item.find_first_not_of(" \t"), last = item.find_last_not_of(" \t");
    if (first == std::string::npos) continue;
    std::string name = item.substr(first, last - first + 1);
    if (std::find(names.begin(), names.end(), name) == names.end())
      names.push_back(std::move(name));
  }
  return names;
}

/// Terminal summary: per period the shares by group, then every line's cumulative share.
std::string format_sources_table(const WaterSources& s, const std::string& length_unit) {
  const char* groups[] = {"storage", "rivers and drains", "boundaries", "other stresses"};
  std::string out = fmt::format(
      "Sources of the chosen wells' water (volumes in {}3; shares of the "
      "volume pumped)\n  {:>3}  {:<20}  {:>11}  {:>8}  {:>8}  {:>8}  {:>8}\n",
      length_unit, "#", "period", "pumped", "storage", "rivers", "bounds", "other");
  auto share = [](double v) {
    return std::isfinite(v) ? fmt::format("{:.3f}", v) : std::string("-");
  };
  for (std::size_t p = 0; p < s.periods.size(); ++p) {
    const SourcePeriod& r = s.periods[p];
    std::map<std::string, double> by_group;
    for (std::size_t k = 0; k < s.lines.size(); ++k)
      by_group[std::string(source_group(s.lines[k].source))] += r.volume[k];
    std::string row = fmt::format("  {:>3}  {:<20.20}  {:>11.4g}", p + 1, r.name, r.withdrawn);
    for (const char* g : groups)
      row += fmt::format("  {:>8}", share(share_of(by_group[g], r.withdrawn)));
    out += row + "\n";
  }
  if (s.periods.empty()) return out;
  const SourcePeriod& last = s.periods.back();
  out += fmt::format("\nCumulative to t = {:g}: {:.4g} {}3 pumped\n", last.end,
                     last.cumulative_withdrawn, length_unit);
  for (std::size_t k = 0; k < s.lines.size(); ++k)
    out += fmt::format("  {:<20} {:<24.24} {:>12.4g}  {:>8}\n", s.lines[k].source,
                       s.lines[k].feature, last.cumulative[k],
                       share(share_of(last.cumulative[k], last.cumulative_withdrawn)));
  return out;
}

int compare_folders(const SourcesOptions& o, const std::vector<std::string>& chosen) {
  WaterSourcesContext context;
  context.program_version = version_string;
  context.chosen_wells = chosen;
  context.caution = professional_caution;
  context.with_wells_folder = std::filesystem::absolute(*o.with_wells_folder).string();
  context.without_wells_folder = std::filesystem::absolute(*o.without_wells_folder).string();
  WaterSources sources;
  try {
    const bool features = std::filesystem::exists(*o.with_wells_folder / "budget_features.csv") &&
                          std::filesystem::exists(*o.without_wells_folder / "budget_features.csv");
    if (!features && !chosen.empty()) {
      std::fputs("error: --wells needs budget_features.csv in both folders\n", stderr);
      return exit_usage;
    }
    const FolderBudgets with = read_folder_budgets(*o.with_wells_folder, features);
    const FolderBudgets without = read_folder_budgets(*o.without_wells_folder, features);
    if (features && chosen.empty()) {
      std::fputs("error: name the wells whose water to trace with --wells\n", stderr);
      return exit_usage;
    }
    std::vector<SourceFeature> lines;
    std::vector<BudgetComponent> storage;
    const std::vector<PeriodPair> pairs = pair_folders(with, without, chosen, lines, storage);
    sources = water_sources(lines, storage, pairs);
    // Units from the tables ("m3" -> "m"); the time unit is not in the budget tables.
    if (with.volume_unit.size() > 1 && with.volume_unit.back() == '3')
      context.length_unit = with.volume_unit.substr(0, with.volume_unit.size() - 1);
    context.time_unit = o.time_unit;
    const std::filesystem::path folder = o.output_folder ? *o.output_folder : *o.with_wells_folder;
    const OutputFolderLock lock(folder);
    write_water_sources(folder, sources, context);
  } catch (const ReadError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
  } catch (const OutputError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
  } catch (const std::invalid_argument& e) {  // budgets that cannot be lined up
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
  }
  if (!o.quiet) std::fputs(format_sources_table(sources, context.length_unit).c_str(), stdout);
  return exit_success;
}

}  // namespace

CLI::App* add_sources_subcommand(CLI::App& app, SourcesOptions& o) {
  auto* sources = app.add_subcommand(
      "sources",
      "Where the water of chosen wells comes from: runs the model with and without them (or "
      "compares two results folders) and writes water_sources.csv and water_sources.json.");
  sources->add_option("MODEL", o.model_file, "Model definition (TOML)");
  sources->add_option("-w,--wells", o.wells,
                      "Comma-separated names of the wells whose water to trace, e.g. "
                      "\"town well 1,town well 2\"");
  sources->add_option("-o,--output", o.output_folder,
                      "Folder for the two files (default: the model's results folder, or the "
                      "--with-wells folder)");
  sources->add_option("--with-wells", o.with_wells_folder,
                      "Compare two results folders instead of running: the run with the wells");
  sources->add_option("--without-wells", o.without_wells_folder,
                      "... and the run without them (same periods)");
  sources->add_option("--time-unit", o.time_unit, "Time unit of the compared folders (default d)");
  sources->add_option("-t,--threads", o.threads, "Threads (default: [solver].threads)")
      ->check(CLI::NonNegativeNumber);
  sources->add_flag("-q,--quiet", o.quiet, "Print only errors");
  sources->footer(
      "Exit status: 0 success; 1 invalid model file (nothing run); 2 a run did not converge "
      "(nothing written); 3 the files could not be written, or the folders' tables read; 64 "
      "wrong command line (also: a name that is no well of the model).");
  return sources;
}

int run_sources_command(const SourcesOptions& o) {
  const std::vector<std::string> chosen = split_names(o.wells);
  if (o.with_wells_folder || o.without_wells_folder) {
    if (!o.with_wells_folder || !o.without_wells_folder || o.model_file) {
      std::fputs("error: give either MODEL, or both --with-wells and --without-wells folders\n",
                 stderr);
      return exit_usage;
    }
    return compare_folders(o, chosen);
  }
  if (!o.model_file) {
    std::fputs("error: give MODEL (or two results folders with --with-wells and --without-wells)\n",
               stderr);
    return exit_usage;
  }
  ReadResult read = read_model_file(*o.model_file);
  if (!print_model_diagnostics(read)) return exit_invalid_model;
  Model& model = *read.model;
  if (!o.quiet)
    for (const auto& w : model.warnings) std::fprintf(stdout, "warning: %s\n", w.c_str());
  if (o.threads) model.solver.threads = *o.threads;
  if (chosen.empty()) {
    std::fputs("error: name the wells whose water to trace with --wells \"name1,name2\"\n", stderr);
    return exit_usage;
  }
  std::vector<std::size_t> chosen_index;
  for (const std::string& name : chosen) {
    const auto it = std::find_if(model.wells.begin(), model.wells.end(),
                                 [&](const Well& w) { return w.name == name; });
    if (it == model.wells.end()) {
      std::string known;
      for (const Well& w : model.wells) known += (known.empty() ? "" : ", ") + ("'" + w.name + "'");
      std::fprintf(stderr, "error: %s has no well named '%s' (wells: %s)\n",
                   o.model_file->string().c_str(), name.c_str(),
                   known.empty() ? "none" : known.c_str());
      return exit_usage;
    }
    chosen_index.push_back(static_cast<std::size_t>(it - model.wells.begin()));
  }
  const std::filesystem::path folder = o.output_folder ? *o.output_folder : model.output.folder;
  // A results folder takes one writer at a time (a `run` into it, or this command).
  std::optional<OutputFolderLock> lock;
  try {
    lock.emplace(folder);
    check_output_folder_writable(folder);
  } catch (const OutputError& e) {
    std::fprintf(stderr, "error: %s\nNothing was run.\n", e.what());
    return exit_output_failure;
  }

  if (!o.quiet)
    std::fprintf(stdout, "aquiledger sources: running without, then with the chosen wells...\n");
  std::fflush(stdout);
  const WaterSourcesRun run = run_water_sources(model, chosen_index);
  if (!run.converged) {
    std::fprintf(stderr, "error: %s\n", run.failure.c_str());
    return exit_not_converged;
  }
  WaterSourcesContext context;
  context.program_version = version_string;
  context.length_unit = model.length_unit;
  context.time_unit = model.time_unit;
  context.clock = model_clock(model);
  context.chosen_wells = chosen;
  context.model_file = std::filesystem::absolute(*o.model_file).string();
  context.caution = professional_caution;
  context.planned = run.planned;
  const WaterSources& sources = run.sources;
  try {
    write_water_sources(folder, sources, context);
  } catch (const OutputError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return exit_output_failure;
  }
  if (!o.quiet) {
    std::fputs(format_sources_table(sources, model.length_unit).c_str(), stdout);
    // A chosen well in a cell that runs dry delivers less than its rate.
    for (std::size_t p = 0; p < sources.periods.size(); ++p) {
      const double planned = run.planned[p], delivered = sources.periods[p].withdrawn;
      if (std::abs(planned - delivered) > 1e-9 * std::abs(planned))
        std::fprintf(stdout,
                     "note: period %zu: the chosen wells delivered %.4g of the %.4g %s3 planned "
                     "(cells ran dry); shares are of the delivered volume\n",
                     p + 1, delivered, planned, model.length_unit.c_str());
    }
    std::fprintf(stdout, "\nwater_sources.csv and water_sources.json in %s\n\n%s\n",
                 folder.string().c_str(), professional_caution);
  }
  return exit_success;
}

}  // namespace aquiledger
