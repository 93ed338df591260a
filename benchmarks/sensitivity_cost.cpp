// The cost of forward sensitivities: a run with the sensitivities of p parameters against the
// plain run, on the benchmark basin (confined and switching). Prints figures, asserts none:
// the factorisations of Newton and those the sensitivity solves added, and a checksum of the
// sensitivities to compare builds.
//   sensitivity_cost [--cells N] [--parameters P]
#include <fmt/core.h>

#include <chrono>
#include <cmath>
#include <cstdlib>
#include <cstring>
#include <string>

#include "basin_generator.hpp"
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

}  // namespace

int main(int argc, char** argv) {
  double cells = 1e4;
  int p = 8;
  for (int i = 1; i + 1 < argc; i += 2) {
    if (!std::strcmp(argv[i], "--cells")) cells = std::atof(argv[i + 1]);
    if (!std::strcmp(argv[i], "--parameters")) p = std::atoi(argv[i + 1]);
  }
  fmt::print("{:>10} {:>10} {:>3} {:>10} {:>12} {:>8} {:>10} {:>14} {:>24}\n", "aquifer", "cells",
             "p", "run s", "with sens s", "in runs", "(1 + p/4)", "factorisations",
             "sum |dh/dlnp| at end");
  for (bool switching : {false, true}) {
    bench::BasinSpec spec;
    spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(cells)));
    spec.switching = switching;
    spec.steps_per_period = 10;
    Model m = bench::make_basin(spec);
    m.solver.linear = LinearChoice::direct;
    NoObserver none;
    auto t0 = std::chrono::steady_clock::now();
    const RunResult plain = run_simulation(m, none);
    const double t_run = seconds_since(t0);
    const std::vector<ModelParameter> params = strip_parameters(m, p);
    t0 = std::chrono::steady_clock::now();
    const SensitivityRun sens = run_with_sensitivities(m, params, none);
    const double t_sens = seconds_since(t0);
    if (!plain.converged || !sens.run.converged) return 1;
    fmt::print(
        "{:>10} {:>10} {:>3} {:>10.3f} {:>12.3f} {:>8.2f} {:>10.2f} {:>6} + {:<6} {:>24.17g}\n",
        switching ? "switching" : "confined", m.grid.n_cells(), int(params.size()), t_run, t_sens,
        t_sens / t_run, 1.0 + params.size() / 4.0,
        sens.run.factorizations - sens.sensitivity_factorizations, sens.sensitivity_factorizations,
        none.checksum);
  }
  return 0;
}
