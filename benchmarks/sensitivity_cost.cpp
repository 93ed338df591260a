// The cost of exact derivatives on the benchmark basin (confined and switching): a run with
// the forward sensitivities of p parameters, and a run with the adjoint gradient of an
// objective of the heads at ten bores at every step, each against the plain run, as medians
// of repeats. Prints figures, asserts none: also the factorisations of Newton and those the
// sensitivity solves added, a checksum of the sensitivities to compare builds, and the load
// average at the end. With --setup, the model and parameters of an estimation set-up (the
// parameters at their start values) instead of the basin; the adjoint is not run then.
// --aquifer confined (or switching) runs that basin alone.
//   sensitivity_cost [--cells N] [--parameters P] [--repeats R] [--setup FILE]
//                    [--aquifer confined|switching]
#include <fmt/core.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <string>

#include "basin_generator.hpp"
#include "io/cli/openmp_waiting.hpp"
#include "io/model_file/estimation_reader.hpp"
#include "solver/adjoint_gradient.hpp"
#include "solver/forward_sensitivities.hpp"

using namespace aquiledger;

namespace {

class NoObserver : public SimulationObserver, public SensitivityObserver {
 public:
  void initial_state(std::span<const double>) override {}
  void step_done(const StepInfo&, std::span<const double>, std::span<const double>) override {}
  void period_done(std::size_t) override {}
  /// Sum of |dh/d ln p| over the last state: compares the results of two builds.
  void state(const StepInfo*, std::span<const double>, const HeadSensitivities& s) override {
    checksum = 0.0;
    for (const auto& sk : s)
      for (double v : sk)
        if (!std::isnan(v)) checksum += std::abs(v);
  }
  double checksum = 0.0;
};

/// Phi = sum over states and ten cells on the diagonal of h^2 (L^2): its gradient is the
/// adjoint's cost for few observation points, whatever p.
class BoreObjective : public AdjointObjective {
 public:
  explicit BoreObjective(const Model& m) {
    for (int b = 0; b < 10; ++b) {
      const int row = (2 * b + 1) * m.grid.n_rows() / 20, col = (2 * b + 1) * m.grid.n_cols() / 20;
      cells_.push_back(static_cast<std::size_t>(m.grid.cell(row, col).value));
    }
  }
  void state(const StepInfo*, std::span<const double>) override {}
  void add_head_gradient(std::size_t, std::span<const double> head, std::span<double> g) override {
    for (std::size_t c : cells_) g[c] += 2.0 * head[c];
  }

 private:
  std::vector<std::size_t> cells_;
};

double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return v[v.size() / 2];
}

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

/// p parameters: K of p - 2 vertical strips, the recharge, and Ss (or Sy when switching).
std::vector<ModelParameter> strip_parameters(const Model& m, int p) {
  std::vector<ModelParameter> params;
  const int strips = std::max(p - 2, 1);
  for (int s = 0; s < strips && int(params.size()) < p; ++s) {
    ModelParameter k{"k strip " + std::to_string(s + 1),
                     ParameterProperty::conductivity,
                     ParameterForm::multiplier,
                     {},
                     {}};
    for (int c = 0; c < m.grid.n_cells(); ++c)
      if (m.grid.row_col(CellIndex{c}).col * strips / m.grid.n_cols() == s) k.cells.push_back(c);
    params.push_back(k);
  }
  if (int(params.size()) < p)
    params.push_back({"recharge", ParameterProperty::recharge, ParameterForm::multiplier, {}, {0}});
  if (int(params.size()) < p) {
    ModelParameter s{"storage",
                     m.aquifer.condition == Condition::confined
                         ? ParameterProperty::specific_storage
                         : ParameterProperty::specific_yield,
                     ParameterForm::multiplier,
                     {},
                     {}};
    for (int c = 0; c < m.grid.n_cells(); ++c) s.cells.push_back(c);
    params.push_back(s);
  }
  return params;
}

/// Prints the medians of the plain run, the run with sensitivities of params and (with an
/// objective) the run with the adjoint gradient of model m, and their ratios to the plain run.
/// False when a run did not converge.
bool time_derivatives(const Model& m, const std::vector<ModelParameter>& params, int repeats,
                      const std::string& label, AdjointObjective* objective) {
  NoObserver none;
  std::vector<double> t_run, t_sens, t_adj;
  SensitivityRun sens;
  for (int r = 0; r < repeats; ++r) {
    auto t0 = std::chrono::steady_clock::now();
    const RunResult plain = run_simulation(m, none);
    t_run.push_back(seconds_since(t0));
    t0 = std::chrono::steady_clock::now();
    sens = run_with_sensitivities(m, params, none);
    t_sens.push_back(seconds_since(t0));
    if (!plain.converged || !sens.run.converged) return false;
    if (!objective) continue;
    t0 = std::chrono::steady_clock::now();
    const AdjointRun adj = run_with_adjoint_gradient(m, params, *objective);
    t_adj.push_back(seconds_since(t0));
    if (!adj.run.converged) return false;
  }
  const double run = median(t_run), forward = median(t_sens);
  const std::string adjoint = objective ? fmt::format("{:.3f}", median(t_adj)) : "-";
  const std::string ratio = objective ? fmt::format("{:.2f}", median(t_adj) / run) : "-";
  fmt::print(
      "{:>10} {:>7} {:>3} {:>8.3f} {:>10.3f} {:>8.2f} {:>9.2f} {:>10} {:>8} {:>6} + {:<6} "
      "{:>22.17g}\n",
      label, m.grid.n_cells(), int(params.size()), run, forward, forward / run,
      1.0 + params.size() / 4.0, adjoint, ratio,
      sens.run.factorizations - sens.sensitivity_factorizations, sens.sensitivity_factorizations,
      none.checksum);
  return true;
}

}  // namespace

// As the program runs (io/cli/main.cpp): OpenMP threads wait passively unless the environment
// says otherwise.
AQUILEDGER_WAIT_PASSIVELY_BY_DEFAULT;

int main(int argc, char** argv) {
  double cells = 1e4;
  int p = 8, repeats = 3;
  std::string setup_file, aquifer = "both";
  for (int i = 1; i + 1 < argc; i += 2) {
    if (!std::strcmp(argv[i], "--aquifer")) aquifer = argv[i + 1];
    if (!std::strcmp(argv[i], "--setup")) setup_file = argv[i + 1];
    if (!std::strcmp(argv[i], "--cells")) cells = std::atof(argv[i + 1]);
    if (!std::strcmp(argv[i], "--parameters")) p = std::atoi(argv[i + 1]);
    if (!std::strcmp(argv[i], "--repeats")) repeats = std::max(1, std::atoi(argv[i + 1]));
  }
  fmt::print("medians of {} repeats; in runs: the time over the plain run's\n", repeats);
  fmt::print("{:>10} {:>7} {:>3} {:>8} {:>10} {:>8} {:>9} {:>10} {:>8} {:>14} {:>22}\n", "aquifer",
             "cells", "p", "run s", "forward s", "in runs", "1 + p/4", "adjoint s", "in runs",
             "factorisations", "sum |dh/dlnp| at end");
  if (!setup_file.empty()) {
    const EstimationReadResult read = read_estimation_file(setup_file);
    if (!read.model || !read.setup) {
      for (const Diagnostic& d : read.diagnostics) fmt::print("{}\n", d.to_string());
      return 2;
    }
    std::vector<double> start;
    std::vector<ModelParameter> params;
    for (const EstimatedParameter& e : read.setup->parameters) {
      start.push_back(e.start);
      params.push_back(e.parameter);
    }
    const Model m = model_with_parameters(*read.model, *read.setup, start);
    if (!time_derivatives(m, params, repeats, "set-up", nullptr)) return 1;
  }
  for (bool switching : {false, true}) {
    if (!setup_file.empty()) break;
    if (aquifer != "both" && aquifer != (switching ? "switching" : "confined")) continue;
    bench::BasinSpec spec;
    spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(cells)));
    spec.switching = switching;
    spec.steps_per_period = 10;
    Model m = bench::make_basin(spec);
    m.solver.linear = LinearChoice::direct;
    const std::vector<ModelParameter> params = strip_parameters(m, p);
    BoreObjective objective(m);
    if (!time_derivatives(m, params, repeats, switching ? "switching" : "confined", &objective))
      return 1;
  }
  std::ifstream load("/proc/loadavg");
  std::string one, five, fifteen;
  if (load >> one >> five >> fifteen)
    fmt::print("load average at the end: {} {} {}\n", one, five, fifteen);
  return 0;
}
