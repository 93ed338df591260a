// The cost of the numerical pumping-test model (postproc/numerical_well_test.hpp) on a test
// file: one run of the model at the start values (steps, Newton iterations per step, step
// cut-backs, the cells that changed condition, seconds), and then the whole fit (model runs,
// seconds, the fitted values). Prints figures, asserts none (docs/pumping-tests.md, "The
// numerical model", cost).
//   numerical_well_test_cost TEST.toml [--no-fit | --coarse]
#include <fmt/core.h>

#include <algorithm>
#include <chrono>
#include <cstdlib>
#include <cstring>
#include <vector>

#include "io/model_file/pumping_test_reader.hpp"
#include "postproc/numerical_well_test.hpp"
#include "postproc/parameter_estimation.hpp"
#include "solver/simulation.hpp"

using namespace aquiledger;

namespace {

/// Counts Newton iterations per accepted step.
class NumericalCostObserver : public SimulationObserver {
 public:
  void initial_state(std::span<const double>) override {}
  void step_done(const StepInfo& info, std::span<const double>,
                 std::span<const double> head) override {
    iterations.push_back(info.newton_iterations);
    lowest_head = *std::min_element(head.begin(), head.end());
  }
  void period_done(std::size_t) override {}
  std::vector<int> iterations;
  double lowest_head = 0.0;
};

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    fmt::print(stderr, "usage: numerical_well_test_cost TEST.toml [--no-fit | --coarse]\n");
    return 2;
  }
  const bool fit = !(argc > 2 && std::strcmp(argv[2], "--no-fit") == 0);
  // --coarse: the coarse model of the fit's first pass alone (coarse_numerical_settings).
  const bool coarse = argc > 2 && std::strcmp(argv[2], "--coarse") == 0;
  const NumericalTestSettings settings =
      coarse ? coarse_numerical_settings({}) : NumericalTestSettings{};
  const PumpingTestReadResult read = read_pumping_test_file(argv[1]);
  if (!read.test) {
    for (const Diagnostic& d : read.diagnostics) fmt::print(stderr, "{}\n", d.to_string());
    return 1;
  }
  const PumpingTest& test = *read.test;
  ParameterGuess guess = guess_parameters(test, WellTestModel::numerical);
  // --at v1 v2 ...: the model at these values, its drawdowns beside the measured ones.
  const bool at = argc > 2 && std::strcmp(argv[2], "--at") == 0;
  if (at)
    for (std::size_t j = 0; j < guess.start.size() && 3 + j < static_cast<std::size_t>(argc); ++j)
      guess.start[j] = std::atof(argv[3 + j]);
  fmt::print("parameters:");
  const std::vector<std::string> names = numerical_parameter_names(test);
  for (std::size_t j = 0; j < guess.start.size(); ++j)
    fmt::print(" {} {:.4g}", names[j], guess.start[j]);
  fmt::print("{}\n", at ? " (given with --at)" : " (start values)");
  const Model m = numerical_test_model(test, guess.start, guess.start[0], guess.start[1], settings);
  NumericalCostObserver obs;
  const auto t0 = std::chrono::steady_clock::now();
  const RunResult r = run_simulation(m, obs);
  const double run_s = seconds_since(t0);
  std::vector<int> it = obs.iterations;
  std::sort(it.begin(), it.end());
  fmt::print(
      "one run: {} x {} cells, {} steps, {} Newton iterations (median {} per step, largest "
      "{}), {} cut-backs, lowest head {:.3f}, converged {}, {:.2f} s\n",
      m.grid.n_cols(), m.grid.n_rows(), r.steps, r.newton_iterations,
      it.empty() ? 0 : it[it.size() / 2], it.empty() ? 0 : it.back(), r.cutbacks, obs.lowest_head,
      r.converged, run_s);
  fmt::print("  linear solver {} ({}), {} factorisations, {} reuses\n", r.linear_solver,
             r.linear_reason, r.factorizations, r.factorization_reuses);
  std::fflush(stdout);
  {  // one run with the sensitivities of every parameter, as the fit makes them
    const EstimationSetup setup =
        numerical_test_setup(test, m, std::vector<double>(guess.start.size(), 0.1),
                             std::vector<double>(guess.start.size(), 10.0));
    const auto t2 = std::chrono::steady_clock::now();
    simulate_targets(m, setup,
                     Eigen::VectorXd::Ones(static_cast<Eigen::Index>(setup.parameters.size())));
    fmt::print("one run with {} sensitivities: {:.2f} s\n", setup.parameters.size(),
               seconds_since(t2));
    std::fflush(stdout);
    if (at) {
      const SimulatedTargets sim = simulate_targets(
          m, setup, Eigen::VectorXd::Ones(static_cast<Eigen::Index>(setup.parameters.size())));
      const MeasuredTargets meas = measured_targets(setup);
      for (Eigen::Index i = 0; i < sim.values.size(); ++i)
        fmt::print("{} {:.5f} {:.5f} {:+.5f}\n", i, meas.observed[i], sim.values[i],
                   sim.values[i] - meas.observed[i]);
      return 0;
    }
    if (!fit) return 0;
    std::vector<double> lo(guess.start.size()), hi(guess.start.size());
    for (std::size_t j = 0; j < lo.size(); ++j)
      lo[j] = guess.lower[j] / guess.start[j], hi[j] = guess.upper[j] / guess.start[j];
    const auto t3 = std::chrono::steady_clock::now();
    const EstimationResult est = estimate_parameters(m, numerical_test_setup(test, m, lo, hi));
    std::fflush(stdout);
    fmt::print("one round of the fit: {:.2f} s, {} model runs, {} iterations, converged {};",
               seconds_since(t3), est.n_model_runs, est.fit.n_iterations, est.fit.converged);
    for (Eigen::Index j = 0; j < est.fit.parameters.size(); ++j)
      fmt::print(" {:.5g}", guess.start[static_cast<std::size_t>(j)] * est.fit.parameters[j]);
    fmt::print("\n  cost history:");
    for (double c : est.fit.cost_history) fmt::print(" {:.3g}", c);
    fmt::print("\n");
    std::fflush(stdout);
  }
  const auto t1 = std::chrono::steady_clock::now();
  const ModelFit f =
      fit_numerical_pumping_test(test, guess.start, guess.lower, guess.upper, settings);
  fmt::print("fit: {:.2f} s, converged {}, iterations {};", seconds_since(t1), f.fit.converged,
             f.fit.n_iterations);
  for (std::size_t j = 0; j < f.parameter_names.size(); ++j)
    fmt::print(" {} {:.5g}", f.parameter_names[j], f.fit.parameters[static_cast<Eigen::Index>(j)]);
  fmt::print("\n  {}\n", f.description);
  return 0;
}
