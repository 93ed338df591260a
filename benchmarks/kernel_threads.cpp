// Thread scaling of the loops the time step spends its non-solver time in: assembly of the
// residual and Jacobian (FlowSystem::assemble), the Newton residual test (largest |R_i| and
// the norm), and the step budget (postproc step_budget), timed with 1 and 2 OpenMP threads
// on a generated basin. Medians of repeats; each thread count runs in its own child.
//
//   kernel_threads [--cells 1e6] [--repeats 15] [--variant confined|switching]
#include <fmt/format.h>
#include <omp.h>

#include <cmath>
#include <string>
#include <vector>

#include "benchmarks/basin_generator.hpp"
#include "benchmarks/bench_support.hpp"
#include "postproc/water_budget.hpp"
#include "solver/flow_system.hpp"
#include "solver/newton_solver.hpp"
#include "solver/system_layout.hpp"

using namespace aquiledger;

namespace {

struct KernelTimes {
  double assemble = 0, residual_test = 0, budget = 0;
  double checksum = 0;  ///< keeps the compiler from dropping the work
};

KernelTimes time_kernels(const bench::BasinSpec& spec, int threads, int repeats) {
  omp_set_num_threads(threads);
  const Model model = bench::make_basin(spec);
  const SystemLayout layout = make_system_layout(model);
  FlowSystem system(model, layout);
  // A head field that is not uniform, part below the top in the switching variant.
  std::vector<double> head_old(model.initial.head.values()), head(model.initial.head.values());
  for (std::size_t i = 0; i < head.size(); ++i)
    head[i] -= 1.0 * std::sin(0.001 * static_cast<double>(i));
  system.set_step(0, false, 12.0, head_old);
  std::vector<double> ta, tr, tb;
  KernelTimes out;
  for (int k = 0; k < repeats; ++k) {
    auto t0 = bench::Clock::now();
    system.assemble(head);
    ta.push_back(bench::seconds_since(t0));
    t0 = bench::Clock::now();
    const ResidualNorms norms = residual_norms(system.residual());
    tr.push_back(bench::seconds_since(t0));
    t0 = bench::Clock::now();
    const WaterBudget b = step_budget(model, layout, 0, false, 12.0, head_old, head);
    tb.push_back(bench::seconds_since(t0));
    out.checksum += norms.max_abs + norms.norm + b.total_in();
  }
  out.assemble = bench::median(ta);
  out.residual_test = bench::median(tr);
  out.budget = bench::median(tb);
  return out;
}

}  // namespace

int main(int argc, char** argv) {
  double cells = 1e6;
  int repeats = 15;
  std::string variant = "confined";
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string key = argv[i], value = argv[i + 1];
    if (key == "--cells")
      cells = std::stod(value);
    else if (key == "--repeats")
      repeats = std::stoi(value);
    else if (key == "--variant")
      variant = value;
    else {
      fmt::print(stderr, "unknown option {}\n", key);
      return 64;
    }
  }
  bench::BasinSpec spec;
  spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(cells)));
  spec.switching = variant == "switching";
  const KernelTimes one = bench::run_in_child([&] { return time_kernels(spec, 1, repeats); });
  const KernelTimes two = bench::run_in_child([&] { return time_kernels(spec, 2, repeats); });
  fmt::print("{} basin, {} cells, median of {} repeats\n", variant, spec.n_rows * spec.n_cols,
             repeats);
  fmt::print("{:<28} {:>12} {:>12} {:>8}\n", "loop", "1 thread s", "2 threads s", "ratio");
  auto row = [](const char* name, double a, double b) {
    fmt::print("{:<28} {:>12.4g} {:>12.4g} {:>8.2f}\n", name, a, b, b > 0 ? a / b : 0.0);
  };
  row("assembly (R and Jacobian)", one.assemble, two.assemble);
  row("residual test (max, norm)", one.residual_test, two.residual_test);
  row("step budget", one.budget, two.budget);
  // Reductions add in another order with two threads: agreement to rounding, not bits.
  const bool agree = std::abs(one.checksum - two.checksum) <= 1e-9 * std::abs(one.checksum);
  fmt::print("1- and 2-thread results agree: {}\n", agree ? "yes" : "NO");
  return agree ? 0 : 1;
}
