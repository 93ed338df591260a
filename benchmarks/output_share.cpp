// Share of a basin run spent computing and writing results (budgets, observations, field
// files), for field output every step and at period ends.
//
//   output_share [--cells 1e6] [--steps 10] [--folder /tmp/aquiledger-output-share]
#include <fmt/format.h>

#include <chrono>
#include <cmath>
#include <filesystem>
#include <string>

#include "benchmarks/basin_generator.hpp"
#include "io/files/atomic_file.hpp"
#include "io/results/result_recorder.hpp"
#include "solver/simulation.hpp"

using namespace aquiledger;

int main(int argc, char** argv) {
  double cells = 1e6;
  int steps = 10;
  std::filesystem::path folder = "/tmp/aquiledger-output-share";
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string key = argv[i], value = argv[i + 1];
    if (key == "--cells")
      cells = std::stod(value);
    else if (key == "--steps")
      steps = std::stoi(value);
    else if (key == "--folder")
      folder = value;
    else {
      fmt::print(stderr, "unknown option {}\n", key);
      return 64;
    }
  }
  bench::BasinSpec spec;
  spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(cells)));
  spec.steps_per_period = steps;
  fmt::print("{:<12} {:>10} {:>6} {:>10} {:>10} {:>8} {:>6}\n", "fields", "cells", "steps",
             "wall s", "output s", "share", "files");
  for (FieldCadence cadence :
       {FieldCadence::every_step, FieldCadence::period_end, FieldCadence::none}) {
    Model model = bench::make_basin(spec);
    model.output.fields = cadence;
    model.observations.push_back({"centre",
                                  model.grid.x_center(spec.n_cols / 2),
                                  model.grid.y_center(spec.n_rows / 2),
                                  {},
                                  {},
                                  {}});
    std::filesystem::remove_all(folder);
    check_output_folder_writable(folder);
    const auto t0 = std::chrono::steady_clock::now();
    ResultRecorder recorder(model, folder);
    const RunResult r = run_simulation(model, recorder);
    recorder.flush();
    const double wall =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    const auto& s = recorder.statistics();
    const char* name = cadence == FieldCadence::every_step   ? "every_step"
                       : cadence == FieldCadence::period_end ? "period_end"
                                                             : "none";
    fmt::print("{:<12} {:>10} {:>6} {:>10.3f} {:>10.3f} {:>7.1f}% {:>6}{}\n", name,
               model.grid.n_cells(), s.steps, wall, s.output_seconds,
               100.0 * s.output_seconds / wall, s.field_files,
               r.converged ? "" : "  (NOT CONVERGED)");
  }
  std::filesystem::remove_all(folder);
  return 0;
}
