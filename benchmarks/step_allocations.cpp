// Heap allocations inside the time loop: every malloc, calloc, realloc and aligned allocation
// of the process (ours and the libraries': Eigen, CHOLMOD, UMFPACK, OpenBLAS, OpenMP) counted
// between the ends of consecutive steps of a generated basin, with the first step (symbolic
// analysis, first factorisation, workspace set-up) shown apart.
//   step_allocations [--cells 1e5] [--steps 10] [--variant both|confined|switching] [--trace 1]
// --trace 1 prints the call stack of every allocation after the first step (to stderr).
// The allocator is wrapped by defining malloc and friends in this executable (the dynamic
// linker binds every library's calls to them) and forwarding to glibc's __libc_ entry points.
// Not built with the sanitizers, which wrap the allocator themselves.
#include <execinfo.h>
#include <fmt/format.h>
#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <string>
#include <vector>

#include "benchmarks/basin_generator.hpp"
#include "benchmarks/bench_support.hpp"
#include "io/model_file/memory_guard.hpp"
#include "solver/simulation.hpp"

namespace {
std::atomic<std::uint64_t> allocations{0};
std::atomic<std::uint64_t> allocated_bytes{0};
std::atomic<bool> tracing{false};
thread_local bool in_trace = false;

void trace(std::size_t n) {
  if (!tracing.load(std::memory_order_relaxed) || in_trace) return;
  in_trace = true;
  void* frames[10];
  const int depth = backtrace(frames, 10);
  char head[64];
  const int len = std::snprintf(head, sizeof head, "allocation of %zu bytes:\n", n);
  if (write(2, head, static_cast<std::size_t>(len)) < 0) {
  }
  backtrace_symbols_fd(frames + 1, depth - 1, 2);
  in_trace = false;
}
}  // namespace

extern "C" {
void* __libc_malloc(std::size_t);
void* __libc_calloc(std::size_t, std::size_t);
void* __libc_realloc(void*, std::size_t);
void* __libc_memalign(std::size_t, std::size_t);

void* malloc(std::size_t n) {
  allocations.fetch_add(1, std::memory_order_relaxed);
  allocated_bytes.fetch_add(n, std::memory_order_relaxed);
  trace(n);
  return __libc_malloc(n);
}
void* calloc(std::size_t k, std::size_t n) {
  allocations.fetch_add(1, std::memory_order_relaxed);
  allocated_bytes.fetch_add(k * n, std::memory_order_relaxed);
  trace(k * n);
  return __libc_calloc(k, n);
}
void* realloc(void* p, std::size_t n) {
  allocations.fetch_add(1, std::memory_order_relaxed);
  allocated_bytes.fetch_add(n, std::memory_order_relaxed);
  trace(n);
  return __libc_realloc(p, n);
}
void* memalign(std::size_t a, std::size_t n) {
  allocations.fetch_add(1, std::memory_order_relaxed);
  allocated_bytes.fetch_add(n, std::memory_order_relaxed);
  trace(n);
  return __libc_memalign(a, n);
}
void* aligned_alloc(std::size_t a, std::size_t n) { return memalign(a, n); }
int posix_memalign(void** out, std::size_t a, std::size_t n) {
  *out = memalign(a, n);
  return *out ? 0 : 12;  // ENOMEM
}
}

using namespace aquiledger;

namespace {

struct Counts {
  double steps = 0, first = 0, median = 0, largest = 0, median_bytes = 0, newton = 0;
  char solver[96] = {0};
  int converged = 0;
};

/// Allocations between the ends of consecutive steps; reserves its own storage up front so
/// that it adds none.
class CountingObserver final : public SimulationObserver {
 public:
  explicit CountingObserver(std::size_t steps) {
    counts.reserve(steps + 1);
    bytes.reserve(steps + 1);
    newton.reserve(steps + 1);
  }
  void initial_state(std::span<const double>) override { mark(); }
  bool trace_after_first = false;
  void step_done(const StepInfo& info, std::span<const double>, std::span<const double>) override {
    counts.push_back(static_cast<double>(allocations.load() - last_count_));
    bytes.push_back(static_cast<double>(allocated_bytes.load() - last_bytes_));
    newton.push_back(info.newton_iterations);
    if (trace_after_first) tracing = true;
    mark();
  }
  void period_done(std::size_t) override { mark(); }  // period set-up is not a step's work
  std::vector<double> counts, bytes, newton;

 private:
  void mark() {
    last_count_ = allocations.load();
    last_bytes_ = allocated_bytes.load();
  }
  std::uint64_t last_count_ = 0, last_bytes_ = 0;
};

Counts run_case(const bench::BasinSpec& spec, bool trace_allocations) {
  Model model = bench::make_basin(spec);
  CountingObserver obs(static_cast<std::size_t>(2 * spec.steps_per_period));
  obs.trace_after_first = trace_allocations;
  if (trace_allocations) {  // backtrace() allocates once, on its first call
    void* frame[1];
    backtrace(frame, 1);
  }
  SimulationOptions sim;
  sim.memory_bytes = usable_memory_bytes().value_or(0.0);
  const RunResult r = run_simulation(model, obs, sim);
  tracing = false;
  Counts c;
  c.steps = static_cast<double>(obs.counts.size());
  c.converged = r.converged ? 1 : 0;
  std::snprintf(c.solver, sizeof c.solver, "%s", r.linear_solver.c_str());
  if (obs.counts.empty()) return c;
  c.first = obs.counts.front();
  const std::vector<double> later(obs.counts.begin() + 1, obs.counts.end());
  const std::vector<double> later_bytes(obs.bytes.begin() + 1, obs.bytes.end());
  c.median = bench::median(later);
  c.largest = later.empty() ? 0.0 : *std::max_element(later.begin(), later.end());
  c.median_bytes = bench::median(later_bytes);
  c.newton = bench::median(obs.newton);
  return c;
}

}  // namespace

int main(int argc, char** argv) {
  double cells = 1e5;
  int steps = 10;
  std::string variant = "both";
  bool trace_allocations = false;
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string key = argv[i], value = argv[i + 1];
    if (key == "--cells")
      cells = std::stod(value);
    else if (key == "--steps")
      steps = std::stoi(value);
    else if (key == "--variant")
      variant = value;
    else if (key == "--trace")
      trace_allocations = value == "1";
    else {
      std::fprintf(stderr, "unknown option %s\n", key.c_str());
      return 64;
    }
  }
  if (argc % 2 == 0) {
    std::fprintf(stderr, "options come in pairs: --key value\n");
    return 64;
  }
  fmt::print(
      "heap allocations per step (every library included), {} steps per period, 2 periods\n\n",
      steps);
  fmt::print("{:<10} {:>8} {:>5} {:>9} {:>9} {:>9} {:>12} {:>6}  {}\n", "variant", "cells", "steps",
             "1st step", "median", "largest", "median bytes", "Newton", "linear solver");
  int failures = 0;
  for (const std::string v : {"confined", "switching"}) {
    if (variant != "both" && variant != v) continue;
    bench::BasinSpec spec;
    spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(cells)));
    spec.switching = v == "switching";
    spec.steps_per_period = steps;
    const Counts c = bench::run_in_child([&] { return run_case(spec, trace_allocations); });
    fmt::print("{:<10} {:>8} {:>5.0f} {:>9.0f} {:>9.0f} {:>9.0f} {:>12.0f} {:>6.1f}  {}{}\n", v,
               spec.n_rows * spec.n_cols, c.steps, c.first, c.median, c.largest, c.median_bytes,
               c.newton, c.solver, c.converged ? "" : "  (NOT CONVERGED)");
    failures += c.converged ? 0 : 1;
  }
  return failures == 0 ? 0 : 1;
}
