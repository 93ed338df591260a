// `aquiledger run`: reads the model, runs it with the chosen engine and writes the results.
// The command is a sequence of steps, each below as its own function: choose the engine,
// read the model, claim the output folder, read the checkpoint to resume from, run (with
// progress and checkpoints), write summary.json, print the summary. In a distributed run
// every rank takes every step and the ranks decide each failure together (RunEngine::any).
#include <fmt/format.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <tuple>

#include "aquiledger_version.hpp"
#include "io/cli/commands.hpp"
#include "io/cli/distributed_run.hpp"
#include "io/cli/model_diagnostics.hpp"
#include "io/files/atomic_file.hpp"
#include "io/files/calendar.hpp"
#include "io/files/output_lock.hpp"
#include "io/model_file/memory_guard.hpp"
#include "io/model_file/model_reader.hpp"
#include "io/model_file/plausibility.hpp"
#include "io/reports/run_report.hpp"
#include "io/restart/checkpoint.hpp"
#include "io/results/result_recorder.hpp"
#include "io/results/summary_json.hpp"
#include "solver/simulation.hpp"

namespace aquiledger {

namespace {

using Clock = std::chrono::steady_clock;

double median(std::vector<int> v) {
  if (v.empty()) return 0.0;
  std::sort(v.begin(), v.end());
  const std::size_t n = v.size();
  return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

/// The serial engine, or one rank of the distributed one; null (after the message) when this
/// build has no distributed engine.
std::unique_ptr<RunEngine> choose_engine(const RunOptions& options) {
  if (options.engine != "petsc") return std::make_unique<RunEngine>();
#ifdef AQUILEDGER_WITH_PETSC
  return make_distributed_engine();
#else
  std::fputs(
      "error: this aquiledger was built without the distributed engine (configure with "
      "-DAQUILEDGER_WITH_PETSC=ON)\n",
      stderr);
  return nullptr;
#endif
}

/// Checks that the folder can be written and takes its lock (rank 0 for a distributed run;
/// held until the run ends, so a second run into the same folder is refused). Returns false
/// after the message when any process cannot write it.
bool claim_output_folder(RunEngine& engine, const std::filesystem::path& folder, bool quiet,
                         std::optional<OutputFolderLock>& lock) {
  std::string folder_error;
  try {
    check_output_folder_writable(folder);
    if (engine.root()) lock.emplace(folder);
  } catch (const OutputError& e) {
    folder_error = e.what();
  }
  if (lock && !lock->stale_owner().empty() && !quiet)
    std::fprintf(stderr,
                 "note: took over the output folder's lock left by a run that ended early (%s)\n",
                 lock->stale_owner().c_str());
  if (!engine.any(!folder_error.empty())) return true;
  if (engine.root() || !folder_error.empty())
    std::fprintf(stderr, "error: %s\nNothing was run.\n",
                 folder_error.empty() ? "another process cannot write the output folder"
                                      : folder_error.c_str());
  return false;
}

/// What a run needs to checkpoint and to resume: the fingerprint of its input files, the
/// checkpoint it resumes from, and (distributed) the generation of the last checkpoint set.
struct CheckpointPlan {
  std::optional<InputFingerprint> fingerprint;
  std::optional<Checkpoint> resume_from;
  std::uint64_t generation = 0;
};

/// Reads the checkpoint to resume from (a distributed run's set must have been written by
/// as many ranks) and checks that it belongs to this model. Throws CheckpointError.
CheckpointPlan read_checkpoint_plan(const RunOptions& options, const Model& model,
                                    const std::filesystem::path& folder, RunEngine& engine,
                                    bool distributed) {
  CheckpointPlan plan;
  if (options.resume || options.checkpoint_every > 0) plan.fingerprint = fingerprint_inputs(model);
  if (!options.resume) return plan;
  if (distributed) {
    const CheckpointSet set = read_checkpoint_set(folder);
    if (set.n_ranks != engine.n_ranks())
      throw CheckpointError(fmt::format(
          "cannot resume: the checkpoint in '{}' was written by a run on {} rank(s), this "
          "run has {}; resume it on {}",
          folder.string(), set.n_ranks, engine.n_ranks(), set.n_ranks));
    plan.resume_from = read_checkpoint_part(folder, set, engine.rank());
    plan.generation = set.generation;
  } else {
    plan.resume_from = read_checkpoint(folder);
  }
  if (auto why =
          checkpoint_mismatch(plan.resume_from->inputs, *plan.fingerprint, options.model_file))
    throw CheckpointError(
        fmt::format("cannot resume: {}; the checkpoint in '{}' belongs to another "
                    "model (run without --resume to start over)",
                    *why, folder.string()));
  if (!distributed &&
      plan.resume_from->state.head.size() != static_cast<std::size_t>(model.grid.n_cells()))
    throw CheckpointError("cannot resume: the checkpoint's heads do not fit the grid");
  return plan;
}

void print_run_header(const RunOptions& options, const Model& model,
                      const std::filesystem::path& folder,
                      const std::optional<Checkpoint>& resume_from) {
  std::fputs(fmt::format("aquiledger {}: {}\n", version_string, model.title).c_str(), stdout);
  std::fputs(fmt::format("  model   {}\n  grid    {} x {} cells, {} active\n  results {}\n",
                         options.model_file.string(), model.grid.n_rows(), model.grid.n_cols(),
                         model.grid.n_active(), folder.string())
                 .c_str(),
             stdout);
  for (const auto& w : model.warnings) std::fprintf(stdout, "  warning: %s\n", w.c_str());
  if (resume_from)
    std::fputs(
        fmt::format("  resumed at period {}, step {}, t = {:g} {}\n", resume_from->state.period + 1,
                    resume_from->state.step_in_period, resume_from->state.time, model.time_unit)
            .c_str(),
        stdout);
  std::fflush(stdout);
}

/// A progress line on the terminal, at most four times a second.
void show_progress(const Model& model, ResultRecorder& recorder) {
  const std::size_t n_periods = model.periods.size();
  recorder.set_progress_callback(
      [&model, n_periods, last = Clock::now()](const StepInfo& info) mutable {
        if (Clock::now() - last < std::chrono::milliseconds(250)) return;
        last = Clock::now();
        std::fprintf(stderr, "\r  period %zu/%zu  step %d/%d  t = %-12.6g %s  Newton %d   ",
                     info.period + 1, n_periods, info.step, model.periods[info.period].steps,
                     info.time, model.time_unit.c_str(), info.newton_iterations);
        std::fflush(stderr);
      });
}

/// Writes a checkpoint: one file (serial), or every rank's part and then, once all parts are
/// on disk, rank 0's index (a killed run leaves the last complete set; the other slot's parts
/// are the ones overwritten). Collective in a distributed run.
void write_run_checkpoint(const std::filesystem::path& folder, bool distributed, RunEngine& engine,
                          std::uint64_t& generation, const Checkpoint& checkpoint) {
  if (!distributed) return write_checkpoint(folder, checkpoint);
  const CheckpointSet set{engine.n_ranks(), ++generation};
  auto agree = [&engine](const std::string& error) {
    if (!engine.any(!error.empty())) return;
    if (error.empty()) throw PeerOutputError();
    throw OutputError(error);
  };
  std::string error;
  try {
    write_checkpoint_part(folder, set, engine.rank(), checkpoint);
  } catch (const OutputError& e) {
    error = e.what();
  }
  agree(error);
  try {
    if (engine.root()) write_checkpoint_set(folder, set);
  } catch (const OutputError& e) {
    error = e.what();
  }
  agree(error);
}

RunSummary make_run_summary(const RunOptions& options, const Model& model,
                            const ResultRecorder& recorder, const RunResult& run, double wall) {
  const RecorderStatistics& stats = recorder.statistics();
  RunSummary summary;
  summary.version = version_string;
  summary.title = model.title;
  // Absolute, so that `report` finds the model from the results folder wherever it runs.
  std::error_code path_error;
  const std::filesystem::path model_path =
      std::filesystem::weakly_canonical(std::filesystem::absolute(options.model_file), path_error);
  summary.model_file =
      path_error ? std::filesystem::absolute(options.model_file).string() : model_path.string();
  summary.length_unit = model.length_unit;
  summary.time_unit = model.time_unit;
  if (auto clock = model_clock(model)) summary.start_date = clock->date_of(0.0);
  summary.unknowns = recorder.layout().n_unknowns();
  summary.linear_iterations = run.linear_iterations;
  summary.cutbacks = run.cutbacks;
  for (const auto& row : recorder.period_rows())
    summary.well_shortfall_volume += row.volumes.well_shortfall;
  summary.cells = model.grid.n_cells();
  summary.active_cells = model.grid.n_active();
  summary.periods = static_cast<int>(model.periods.size());
  summary.steps = stats.steps;
  summary.wall_seconds = wall;
  summary.output_seconds = stats.output_seconds;
  summary.newton_iterations_per_step = stats.newton_iterations;
  summary.linear_solver = run.linear_solver;
  summary.linear_reason = run.linear_reason;
  summary.max_abs_imbalance_percent = stats.max_abs_imbalance_percent;
  summary.converged = run.converged;
  summary.failure = run.failure;
  summary.warnings = model.warnings;
  summary.caution = professional_caution;
  return summary;
}

void print_run_summary(const Model& model, const ResultRecorder& recorder, const RunResult& run,
                       const RunSummary& summary, const std::filesystem::path& folder) {
  const RecorderStatistics& stats = recorder.statistics();
  const double wall = summary.wall_seconds;
  std::fputs("\n", stdout);
  std::fputs(format_period_budget_table(model, recorder.period_rows()).c_str(), stdout);
  std::fputs(
      fmt::format("\n  steps          {} accepted, {} with cut-backs\n", stats.steps, run.cutbacks)
          .c_str(),
      stdout);
  std::fputs(fmt::format("  Newton         median {:g}, largest {} iterations per step\n",
                         median(stats.newton_iterations), stats.max_newton_iterations)
                 .c_str(),
             stdout);
  std::fputs(
      fmt::format("  linear solver  {} ({})\n", run.linear_solver, run.linear_reason).c_str(),
      stdout);
  std::fputs(
      fmt::format("  largest step imbalance {:.3g} %\n", stats.max_abs_imbalance_percent).c_str(),
      stdout);
  for (std::size_t k = model.warnings.size(); k < summary.warnings.size(); ++k)
    std::fprintf(stdout, "  warning: %s\n", summary.warnings[k].c_str());
  if (summary.well_shortfall_volume > 0.0)
    std::fputs(fmt::format("  well shortfall {:.4g} {}3 not delivered where cells ran dry\n",
                           summary.well_shortfall_volume, model.length_unit)
                   .c_str(),
               stdout);
  std::fputs(fmt::format("  wall time      {:.2f} s ({:.0f} % writing results)\n", wall,
                         wall > 0 ? 100.0 * stats.output_seconds / wall : 0.0)
                 .c_str(),
             stdout);
  std::fputs(
      fmt::format("  results in     {}\n\n{}\n", folder.string(), professional_caution).c_str(),
      stdout);
}

}  // namespace

int run_run_command(const RunOptions& options) {
  const auto start = Clock::now();
  std::unique_ptr<RunEngine> engine = choose_engine(options);
  if (!engine) return exit_usage;
  // In a distributed run every rank reads the model's settings and features and its own band
  // of the per-cell inputs; rank 0 alone prints and writes the tables and the summary.
  const bool root = engine->root();
  ReadResult result = read_model_file(options.model_file, engine->band_of());
  // A rank finds the errors of its own rows: the ranks decide together, and the lowest rank
  // with errors prints its diagnostics (those of every rank when the error is not in a band).
  const int printer = engine->lowest_rank_with(!result.ok());
  if (printer >= 0) {
    print_model_diagnostics(result, engine->rank() == printer);
    return exit_invalid_model;
  }
  Model& model = *result.model;
  if (options.threads) model.solver.threads = *options.threads;
  if (const std::string why = engine->unsupported(model); !why.empty()) {
    if (root) std::fprintf(stderr, "error: %s\nNothing was run.\n", why.c_str());
    return exit_usage;
  }
  const std::filesystem::path folder =
      options.output_folder ? *options.output_folder : model.output.folder;
  const bool quiet = options.quiet || !root;
  const bool terminal = isatty(fileno(stderr)) && !quiet;
  std::optional<OutputFolderLock> lock;
  if (!claim_output_folder(*engine, folder, quiet, lock)) return exit_output_failure;

  // Checkpoints fingerprint the input files; a resumed run must read the same ones.
  // A distributed run's checkpoint is a set of one part per rank (io/restart/checkpoint.hpp).
  const bool distributed = engine->n_ranks() > 1 || options.engine == "petsc";
  CheckpointPlan plan;
  std::string checkpoint_error;
  try {
    plan = read_checkpoint_plan(options, model, folder, *engine, distributed);
  } catch (const CheckpointError& e) {
    checkpoint_error = e.what();
  }
  // Every rank decides together; rank 0 says why, or the ranks that failed when it did not.
  const bool failed = !checkpoint_error.empty();
  const bool root_failed = engine->any(root && failed);
  if (engine->any(failed)) {
    if (failed && (root || !root_failed))
      std::fprintf(stderr, "error: %s%s\nNothing was run.\n",
                   root ? "" : engine->process_label().c_str(), checkpoint_error.c_str());
    return exit_bad_checkpoint;
  }
  if (!quiet) print_run_header(options, model, folder, plan.resume_from);

  // summary.json is written last: a folder without one holds a run that did not finish
  // (rather than the summary of an earlier run beside newer tables).
  std::error_code ignored;
  if (root) std::filesystem::remove(folder / "summary.json", ignored);

  RunResult run;
  std::optional<ResultRecorder> recorder;
  try {
    engine->make_recorder(model, folder, recorder);
    if (terminal) show_progress(model, *recorder);
    SimulationOptions sim;
    sim.memory_bytes = usable_memory_bytes().value_or(0.0);
    if (plan.resume_from) {
      if (plan.resume_from->threads != model.solver.threads)
        std::fprintf(stderr,
                     "warning: the checkpointed run used --threads %d, this one %d: results may "
                     "differ in the last digits\n",
                     plan.resume_from->threads, model.solver.threads);
      recorder->restore(std::move(plan.resume_from->recorder));
      sim.start = std::move(plan.resume_from->state);
    }
    if (options.checkpoint_every > 0) {
      sim.checkpoint_every = options.checkpoint_every;
      sim.checkpoint = [&](const StartState& state) {
        write_run_checkpoint(
            folder, distributed, *engine, plan.generation,
            Checkpoint{*plan.fingerprint, model.solver.threads, state, recorder->state()});
      };
    }
    run = engine->run(model, *recorder, sim);
    if (terminal) std::fputs("\r\033[K", stderr);
    recorder->flush();
  } catch (const PeerOutputError&) {
    // Writes are agreed on by every process (ResultRecorder::collectively): all arrive here
    // or below, and the process that failed names the file.
    if (terminal) std::fputs("\n", stderr);
    return exit_output_failure;
  } catch (const OutputError& e) {
    if (terminal) std::fputs("\n", stderr);
    std::fprintf(stderr, "error: %s%s\nResults written before this point are complete.\n",
                 engine->process_label().c_str(), e.what());
    return exit_output_failure;
  } catch (const std::exception& e) {
    // A PETSc or MPI call failed, possibly on this process alone: the others may already
    // wait for it in a collective call, so the whole run ends here, with one message.
    if (terminal) std::fputs("\n", stderr);
    std::fprintf(stderr, "error: %s%s\nResults written before this point are complete.\n",
                 engine->process_label().c_str(), e.what());
    return engine->fail_everywhere(exit_not_converged);
  }
  const double wall = std::chrono::duration<double>(Clock::now() - start).count();
  RunSummary summary = make_run_summary(options, model, *recorder, run, wall);
  const HeadsAboveSurface above = recorder->heads_above_land_surface_at_end();
  if (above.cells > 0)
    summary.warnings.push_back(
        "at the end of the run heads stand above the land surface " +
        describe_heads_above(above, model.grid, model.length_unit) +
        ": flooded ground or flowing artesian conditions the model does not represent; check "
        "the stresses, the boundaries and the land surface (fields: depth_to_water < 0)");
  std::string summary_error;
  try {
    if (root) write_summary_json(folder / "summary.json", summary);
  } catch (const OutputError& e) {
    summary_error = e.what();
  }
  if (engine->any(!summary_error.empty())) {
    if (root) std::fprintf(stderr, "error: %s\n", summary_error.c_str());
    return exit_output_failure;
  }

  if (!quiet) print_run_summary(model, *recorder, run, summary, folder);
  if (!run.converged) {
    if (root)
      std::fprintf(stderr, "error: %s\nResults up to the last converged step are in %s.\n",
                   run.failure.c_str(), folder.string().c_str());
    return exit_not_converged;
  }
  if (options.quiet && root)
    std::fprintf(stdout, "aquiledger: run complete, results in %s\n", folder.string().c_str());
  return exit_success;
}

}  // namespace aquiledger
