// Basin-scale benchmark: runs generated basins of several sizes (confined and switching) and
// prints, per size, wall time per step, Newton and linear iterations, peak memory and the
// linear backend, next to a streaming floor measured on this machine in the same run.
//
//   basin_benchmark [--sizes 1e4,1e5,1e6,4e6] [--steps 30] [--variant both|confined|switching]
//                   [--json FILE]
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <numeric>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "benchmarks/basin_generator.hpp"
#include "solver/simulation.hpp"

using namespace aquiledger;
using Clock = std::chrono::steady_clock;

namespace {

struct CaseResult {
  double cells = 0, steps = 0, median_step_seconds = 0, median_newton = 0;
  double linear_iterations = 0, peak_rss_mib = 0;
  char solver[96] = {0};
  int converged = 0;
};

class TimingObserver final : public SimulationObserver {
 public:
  void initial_state(std::span<const double>) override { last_ = Clock::now(); }
  void step_done(const StepInfo& info, std::span<const double>, std::span<const double>) override {
    const auto now = Clock::now();
    step_seconds.push_back(std::chrono::duration<double>(now - last_).count());
    newton.push_back(info.newton_iterations);
    last_ = now;
  }
  void period_done(std::size_t) override {}
  std::vector<double> step_seconds;
  std::vector<double> newton;

 private:
  Clock::time_point last_;
};

double median(std::vector<double> v) {
  if (v.empty()) return 0.0;
  std::sort(v.begin(), v.end());
  const std::size_t n = v.size();
  return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

/// STREAM-style triad a = b + s c, best of several passes (McCalpin, 1995): bytes per second.
double triad_bandwidth() {
  const std::size_t n = std::size_t{1} << 24;  // 128 MiB per array, well beyond the caches
  std::vector<double> a(n, 0.0), b(n, 1.0), c(n, 2.0);
  double best = 1e30;
  for (int pass = 0; pass < 6; ++pass) {
    const auto t0 = Clock::now();
#pragma omp parallel for schedule(static)
    for (std::size_t i = 0; i < n; ++i) a[i] = b[i] + 3.0 * c[i];
    best = std::min(best, std::chrono::duration<double>(Clock::now() - t0).count());
  }
  if (a[n / 2] != 7.0) std::fprintf(stderr, "triad check failed\n");
  return 3.0 * 8.0 * static_cast<double>(n) / best;
}

/// Bytes one linear solve must at least read: a 5-point matrix in compressed form (values and
/// indices), its row pointers, and the right-hand side and solution vectors.
double floor_bytes(double unknowns) { return unknowns * (5 * (8 + 4) + 4 + 2 * 8); }

CaseResult run_case(const bench::BasinSpec& spec) {
  CaseResult out;
  Model model = bench::make_basin(spec);
  TimingObserver obs;
  const RunResult r = run_simulation(model, obs);
  out.cells = model.grid.n_cells();
  out.steps = static_cast<double>(obs.step_seconds.size());
  out.median_step_seconds = median(obs.step_seconds);
  out.median_newton = median(obs.newton);
  out.linear_iterations = static_cast<double>(r.linear_iterations);
  std::snprintf(out.solver, sizeof out.solver, "%s", r.linear_solver.c_str());
  out.converged = r.converged ? 1 : 0;
  rusage ru{};
  getrusage(RUSAGE_SELF, &ru);
  out.peak_rss_mib = static_cast<double>(ru.ru_maxrss) / 1024.0;
  return out;
}

/// Runs one case in a child process so that each size reports its own peak memory.
CaseResult run_isolated(const bench::BasinSpec& spec) {
  int fd[2];
  if (pipe(fd) != 0) return {};
  const pid_t pid = fork();
  if (pid == 0) {
    close(fd[0]);
    const CaseResult r = run_case(spec);
    [[maybe_unused]] auto w = write(fd[1], &r, sizeof r);
    _exit(0);
  }
  close(fd[1]);
  CaseResult r;
  if (read(fd[0], &r, sizeof r) != static_cast<ssize_t>(sizeof r)) r = {};
  close(fd[0]);
  int status = 0;
  waitpid(pid, &status, 0);
  return r;
}

}  // namespace

int main(int argc, char** argv) {
  std::vector<double> sizes = {1e4, 1e5, 1e6, 4e6};
  int steps = 30;
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
    } else if (key == "--steps") steps = std::stoi(value);
    else if (key == "--variant") variant = value;
    else if (key == "--json") json_path = value;
    else { std::fprintf(stderr, "unknown option %s\n", key.c_str()); return 64; }
  }

  const double bandwidth = triad_bandwidth();
  fmt::print("streaming triad bandwidth: {:.2f} GB/s\n\n", bandwidth / 1e9);
  fmt::print("{:<10} {:>10} {:>6} {:>12} {:>10} {:>8} {:>10} {:>10} {:>9}  {}\n", "variant", "cells",
             "steps", "s/step", "floor", "ratio", "Newton", "lin.it", "MiB", "linear solver");
  std::string json = fmt::format("{{\n  \"triad_bandwidth_bytes_per_s\": {:.6g},\n  \"cases\": [\n", bandwidth);
  bool first = true;
  for (const std::string v : {"confined", "switching"}) {
    if (variant != "both" && variant != v) continue;
    std::vector<double> log_n, log_t;
    for (double size : sizes) {
      bench::BasinSpec spec;
      spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(size)));
      spec.switching = v == std::string("switching");
      spec.steps_per_period = steps;
      const CaseResult r = run_isolated(spec);
      const double floor = floor_bytes(r.cells) / bandwidth;
      fmt::print("{:<10} {:>10.0f} {:>6.0f} {:>12.4g} {:>10.3g} {:>8.1f} {:>10.1f} {:>10.0f} {:>9.0f}  {}{}\n", v,
                 r.cells, r.steps, r.median_step_seconds, floor, r.median_step_seconds / floor,
                 r.median_newton, r.linear_iterations, r.peak_rss_mib, r.solver,
                 r.converged ? "" : "  (NOT CONVERGED)");
      std::fflush(stdout);
      json += fmt::format(
          "{}    {{\"variant\": \"{}\", \"cells\": {:.0f}, \"steps\": {:.0f}, \"median_step_seconds\": {:.6g}, "
          "\"floor_seconds\": {:.6g}, \"median_newton\": {:.3g}, \"linear_iterations\": {:.0f}, "
          "\"peak_rss_mib\": {:.1f}, \"bytes_per_cell\": {:.0f}, \"linear_solver\": \"{}\", \"converged\": {}}}",
          first ? "" : ",\n", v, r.cells, r.steps, r.median_step_seconds, floor, r.median_newton,
          r.linear_iterations, r.peak_rss_mib, r.peak_rss_mib * 1048576.0 / std::max(1.0, r.cells), r.solver,
          r.converged ? "true" : "false");
      first = false;
      if (r.median_step_seconds > 0) {
        log_n.push_back(std::log(r.cells));
        log_t.push_back(std::log(r.median_step_seconds));
      }
    }
    if (log_n.size() >= 2) {
      // Least-squares slope of log(time per step) against log(cells).
      const double mn = std::accumulate(log_n.begin(), log_n.end(), 0.0) / log_n.size();
      const double mt = std::accumulate(log_t.begin(), log_t.end(), 0.0) / log_t.size();
      double sxy = 0, sxx = 0;
      for (std::size_t k = 0; k < log_n.size(); ++k) {
        sxy += (log_n[k] - mn) * (log_t[k] - mt);
        sxx += (log_n[k] - mn) * (log_n[k] - mn);
      }
      fmt::print("{:<10} growth exponent of time per step with cells: {:.3f}\n", v, sxy / sxx);
    }
  }
  json += "\n  ]\n}\n";
  if (!json_path.empty()) std::ofstream(json_path) << json;
  return 0;
}
