// Basin-scale benchmark: runs generated basins of several sizes (confined and switching) and
// prints, per size, wall time per step, Newton and linear iterations, peak memory and the
// linear backend, next to a streaming floor measured on this machine in the same run.
//
//   basin_benchmark [--sizes 1e4,1e5,1e6,4e6] [--steps 30] [--variant both|confined|switching]
//                   [--threads N] [--linear auto|direct|pcg|bicgstab|multigrid] [--json FILE]
//                   [--face-thickness mean|upstream] [--newton-limit on|off]
//                   [--newton-estimate on|off]
// Each case runs in its own child process (own peak memory); --steps is per period.
#include <fmt/format.h>
#include <sys/resource.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <numeric>
#include <string>
#include <vector>

#include "benchmarks/basin_generator.hpp"
#include "benchmarks/bench_support.hpp"
#include "io/cli/openmp_waiting.hpp"
#include "io/model_file/memory_guard.hpp"
#include "solver/simulation.hpp"

using namespace aquiledger;
using bench::Clock;

namespace {

struct CaseResult {
  double cells = 0, steps = 0, median_step_seconds = 0, first_step_seconds = 0, median_newton = 0;
  double max_newton = 0, total_newton = 0, linear_iterations = 0, peak_rss_mib = 0;
  double factorizations = 0, reuses = 0, cutbacks = 0;
  double max_unconfined_fraction = 0;  ///< largest share of active cells with head below top
  char solver[96] = {0};
  int converged = 0;
};

class TimingObserver final : public SimulationObserver {
 public:
  explicit TimingObserver(const Model& model) : model_(model) {}
  void initial_state(std::span<const double>) override { last_ = Clock::now(); }
  void step_done(const StepInfo& info, std::span<const double>,
                 std::span<const double> head) override {
    const auto now = Clock::now();
    step_seconds.push_back(std::chrono::duration<double>(now - last_).count());
    newton.push_back(info.newton_iterations);
    if (model_.aquifer.condition == Condition::switching) {
      std::size_t below = 0;
      for (std::size_t i = 0; i < head.size(); ++i) below += head[i] < model_.aquifer.top[i];
      max_unconfined =
          std::max(max_unconfined, static_cast<double>(below) / static_cast<double>(head.size()));
    }
    last_ = Clock::now();  // the counting above is not part of the step
  }
  void period_done(std::size_t) override {}
  std::vector<double> step_seconds;
  std::vector<double> newton;
  double max_unconfined = 0.0;

 private:
  const Model& model_;
  Clock::time_point last_;
};

/// Bytes one step must at least stream: a 5-point matrix in compressed form (values and
/// indices), its row pointers, and the right-hand side and solution vectors. Any solver
/// touches the matrix at least once per step, so this over the triad bandwidth is a floor.
double floor_bytes(double unknowns) { return unknowns * (5 * (8 + 4) + 4 + 2 * 8); }

struct CaseOptions {
  int threads = 0;
  LinearChoice linear = LinearChoice::automatic;
  FaceThickness face_thickness = FaceThickness::mean;
  bool newton_limit = true;     ///< NewtonSettings::limit_at_withdrawal_inflection
  bool newton_estimate = true;  ///< NewtonSettings::stop_on_contraction_estimate
};

CaseResult run_case(const bench::BasinSpec& spec, const CaseOptions& opt) {
  CaseResult out;
  Model model = bench::make_basin(spec);
  model.solver.threads = opt.threads;
  model.solver.linear = opt.linear;
  model.solver.face_thickness = opt.face_thickness;
  model.solver.limit_at_withdrawal_inflection = opt.newton_limit;
  model.solver.stop_on_contraction_estimate = opt.newton_estimate;
  TimingObserver obs(model);
  SimulationOptions sim;
  sim.memory_bytes = usable_memory_bytes().value_or(0.0);  // as the run command does
  const RunResult r = run_simulation(model, obs, sim);
  out.cells = model.grid.n_cells();
  out.steps = static_cast<double>(obs.step_seconds.size());
  if (!obs.step_seconds.empty()) out.first_step_seconds = obs.step_seconds.front();
  out.median_step_seconds = bench::median(obs.step_seconds);
  out.median_newton = bench::median(obs.newton);
  out.max_newton =
      obs.newton.empty() ? 0.0 : *std::max_element(obs.newton.begin(), obs.newton.end());
  out.total_newton = std::accumulate(obs.newton.begin(), obs.newton.end(), 0.0);
  out.linear_iterations = static_cast<double>(r.linear_iterations);
  out.factorizations = static_cast<double>(r.factorizations);
  out.reuses = static_cast<double>(r.factorization_reuses);
  out.cutbacks = r.cutbacks;
  out.max_unconfined_fraction = obs.max_unconfined;
  std::snprintf(out.solver, sizeof out.solver, "%s", r.linear_solver.c_str());
  out.converged = r.converged ? 1 : 0;
  rusage ru{};
  getrusage(RUSAGE_SELF, &ru);
  out.peak_rss_mib = static_cast<double>(ru.ru_maxrss) / 1024.0;
  return out;
}

/// Least-squares slope of log y against log x.
double log_log_slope(const std::vector<double>& x, const std::vector<double>& y) {
  std::vector<double> lx, ly;
  for (std::size_t k = 0; k < x.size(); ++k)
    if (x[k] > 0 && y[k] > 0) lx.push_back(std::log(x[k])), ly.push_back(std::log(y[k]));
  if (lx.size() < 2) return std::nan("");
  const double mx = std::accumulate(lx.begin(), lx.end(), 0.0) / lx.size();
  const double my = std::accumulate(ly.begin(), ly.end(), 0.0) / ly.size();
  double sxy = 0, sxx = 0;
  for (std::size_t k = 0; k < lx.size(); ++k)
    sxy += (lx[k] - mx) * (ly[k] - my), sxx += (lx[k] - mx) * (lx[k] - mx);
  return sxy / sxx;
}

LinearChoice parse_linear(const std::string& v) {
  if (v == "direct") return LinearChoice::direct;
  if (v == "pcg") return LinearChoice::pcg;
  if (v == "bicgstab") return LinearChoice::bicgstab;
  if (v == "multigrid") return LinearChoice::multigrid;
  return LinearChoice::automatic;
}

}  // namespace

// As the program runs (io/cli/main.cpp): OpenMP threads wait passively unless the environment
// says otherwise.
AQUILEDGER_WAIT_PASSIVELY_BY_DEFAULT;

int main(int argc, char** argv) {
  std::vector<double> sizes = {1e4, 1e5, 1e6, 4e6};
  int steps = 30;
  CaseOptions options;
  std::string variant = "both", json_path;
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string key = argv[i], value = argv[i + 1];
    if (key == "--sizes") {
      sizes.clear();
      std::size_t pos = 0;
      while (pos < value.size()) {
        std::size_t end = value.find(',', pos);
        sizes.push_back(std::stod(value.substr(pos, end - pos)));
        pos = end == std::string::npos ? value.size() : end + 1;
      }
    } else if (key == "--steps")
      steps = std::stoi(value);
    else if (key == "--variant")
      variant = value;
    else if (key == "--json")
      json_path = value;
    else if (key == "--threads")
      options.threads = std::stoi(value);
    else if (key == "--linear")
      options.linear = parse_linear(value);
    else if (key == "--newton-limit")
      options.newton_limit = value != "off";
    else if (key == "--newton-estimate")
      options.newton_estimate = value != "off";
    else if (key == "--face-thickness")
      options.face_thickness = value == "upstream" ? FaceThickness::upstream : FaceThickness::mean;
    else {
      std::fprintf(stderr, "unknown option %s\n", key.c_str());
      return 64;
    }
  }
  if (argc % 2 == 0) {
    std::fprintf(stderr, "options come in pairs: --key value\n");
    return 64;
  }

  struct Bandwidth {
    double bytes_per_s;
  };
  const double bandwidth =
      bench::run_in_child([] { return Bandwidth{bench::triad_bandwidth()}; }).bytes_per_s;
  const char* policy = std::getenv("OMP_WAIT_POLICY");
  fmt::print(
      "streaming triad bandwidth: {:.2f} GB/s; {} steps per period, 2 periods; OpenMP threads "
      "wait {}\n\n",
      bandwidth / 1e9, steps,
      policy != nullptr ? policy : "as the runtime's default (spinning first)");
  fmt::print("{:<10} {:>8} {:>5} {:>9} {:>9} {:>9} {:>6} {:>6} {:>7} {:>9} {:>6} {:>6} {:>5}  {}\n",
             "variant", "cells", "steps", "s/step", "1st step", "floor", "ratio", "Newton",
             "lin.it", "fact/reuse", "MiB", "B/cell", "dewat", "linear solver");
  std::string json = fmt::format(
      "{{\n  \"triad_bandwidth_bytes_per_s\": {:.6g},\n  \"steps_per_period\": {},\n  \"cases\": "
      "[\n",
      bandwidth, steps);
  bool first = true;
  int failures = 0;
  for (const std::string v : {"confined", "switching"}) {
    if (variant != "both" && variant != v) continue;
    std::vector<double> cells, seconds, rss;
    for (double size : sizes) {
      bench::BasinSpec spec;
      spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(size)));
      spec.switching = v == std::string("switching");
      spec.steps_per_period = steps;
      const CaseResult r = bench::run_in_child([&] { return run_case(spec, options); });
      const double floor = floor_bytes(r.cells) / bandwidth;
      const double bytes_per_cell = r.peak_rss_mib * 1048576.0 / std::max(1.0, r.cells);
      fmt::print(
          "{:<10} {:>8.0f} {:>5.0f} {:>9.4g} {:>9.4g} {:>9.3g} {:>6.1f} {:>6.1f} {:>7.0f} "
          "{:>4.0f}/{:<5.0f} {:>6.0f} "
          "{:>6.0f} {:>5.2f}  {}{}\n",
          v, r.cells, r.steps, r.median_step_seconds, r.first_step_seconds, floor,
          r.median_step_seconds / floor, r.median_newton, r.linear_iterations, r.factorizations,
          r.reuses, r.peak_rss_mib, bytes_per_cell, r.max_unconfined_fraction, r.solver,
          r.converged ? "" : "  (NOT CONVERGED)");
      fmt::print(
          "{:<10} Newton iterations: {:.0f} in {:.0f} steps, at most {:.0f} in one; cut-backs "
          "{:.0f}\n",
          "", r.total_newton, r.steps, r.max_newton, r.cutbacks);
      std::fflush(stdout);
      if (!r.converged) ++failures;
      json += fmt::format(
          "{}    {{\"variant\": \"{}\", \"cells\": {:.0f}, \"steps\": {:.0f}, "
          "\"median_step_seconds\": {:.6g}, "
          "\"first_step_seconds\": {:.6g}, \"floor_seconds\": {:.6g}, \"median_newton\": {:.3g}, "
          "\"max_newton\": {:.0f}, \"total_newton\": {:.0f}, "
          "\"linear_iterations\": {:.0f}, \"factorizations\": {:.0f}, \"factorization_reuses\": "
          "{:.0f}, "
          "\"cutbacks\": {:.0f}, \"peak_rss_mib\": {:.1f}, \"bytes_per_cell\": {:.0f}, "
          "\"max_unconfined_fraction\": {:.4f}, \"linear_solver\": \"{}\", \"converged\": {}}}",
          first ? "" : ",\n", v, r.cells, r.steps, r.median_step_seconds, r.first_step_seconds,
          floor, r.median_newton, r.max_newton, r.total_newton, r.linear_iterations,
          r.factorizations, r.reuses, r.cutbacks, r.peak_rss_mib, bytes_per_cell,
          r.max_unconfined_fraction, r.solver, r.converged ? "true" : "false");
      first = false;
      cells.push_back(r.cells);
      seconds.push_back(r.median_step_seconds);
      rss.push_back(r.peak_rss_mib);
    }
    if (cells.size() >= 2)
      fmt::print(
          "{:<10} growth exponent (least squares, log-log) of time per step: {:.3f}; of peak "
          "memory: {:.3f}\n",
          v, log_log_slope(cells, seconds), log_log_slope(cells, rss));
  }
  json += "\n  ]\n}\n";
  if (!json_path.empty()) std::ofstream(json_path) << json;
  return failures == 0 ? 0 : 1;
}
