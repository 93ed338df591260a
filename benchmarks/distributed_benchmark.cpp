// The distributed engine on a generated basin (benchmarks/basin_generator.hpp, the same basin
// as basin_benchmark), under mpirun: wall time per step, Newton and Krylov iterations,
// multigrid set-ups and reuses, and the peak memory of every rank.
//
//   mpirun -np N distributed_benchmark [--cells 1e6] [--steps 30] [--variant confined|switching]
//                                      [--linear auto|multigrid|gamg]
// --linear: the model's linear choice (auto: the engine's own; multigrid: hypre PFMG; gamg:
// PETSc's GAMG, which the engine takes for every choice other than auto and multigrid).
// --steps is per period (two periods). One size per run, so that each rank's peak memory is
// that case's. benchmarks/distributed_benchmark.sh runs the serial engine beside it.
#include <fmt/format.h>
#include <sys/resource.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "benchmarks/basin_generator.hpp"
#include "benchmarks/bench_support.hpp"
#include "solver/distributed/petsc_engine.hpp"

using namespace aquiledger;
using bench::Clock;

namespace {

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
  std::vector<double> step_seconds, newton;

 private:
  Clock::time_point last_;
};

}  // namespace

int main(int argc, char** argv) {
  PetscRuntime petsc(&argc, &argv);
  double cells = 1e6;
  int steps = 30;
  std::string variant = "confined";
  LinearChoice linear = LinearChoice::automatic;
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string key = argv[i], value = argv[i + 1];
    if (key == "--cells")
      cells = std::stod(value);
    else if (key == "--steps")
      steps = std::stoi(value);
    else if (key == "--variant")
      variant = value;
    else if (key == "--linear" && (value == "auto" || value == "multigrid" || value == "gamg"))
      linear = value == "auto"        ? LinearChoice::automatic
               : value == "multigrid" ? LinearChoice::multigrid
                                      : LinearChoice::direct;
    else {
      std::fprintf(stderr, "unknown option %s\n", key.c_str());
      return 64;
    }
  }
  bench::BasinSpec spec;
  spec.n_rows = spec.n_cols = static_cast<int>(std::lround(std::sqrt(cells)));
  spec.switching = variant == "switching";
  spec.steps_per_period = steps;
  Model model = bench::make_basin(spec);
  model.solver.linear = linear;
  const auto setup_start = Clock::now();
  DistributedEngine engine(model);
  const double setup = bench::seconds_since(setup_start);
  TimingObserver obs;
  const RunResult r = engine.run(obs);

  rusage ru{};
  getrusage(RUSAGE_SELF, &ru);
  std::vector<double> rss(static_cast<std::size_t>(petsc.n_ranks()), 0.0);
  rss[static_cast<std::size_t>(petsc.rank())] = static_cast<double>(ru.ru_maxrss) / 1024.0;
  petsc.reduction().sum(rss);
  if (petsc.rank() == 0) {
    std::string per_rank;
    for (double m : rss) per_rank += fmt::format("{}{:.0f}", per_rank.empty() ? "" : "/", m);
    fmt::print(
        "{:<10} {:>8} {:>5} {:>5} {:>9.4g} {:>9.4g} {:>7.3g} {:>6.1f} {:>7} {:>4}/{:<5} {:>11}  "
        "{}{}\n",
        variant, model.grid.n_cells(), petsc.n_ranks(), obs.step_seconds.size(),
        bench::median(obs.step_seconds), obs.step_seconds.empty() ? 0.0 : obs.step_seconds.front(),
        setup, bench::median(obs.newton), r.linear_iterations, r.factorizations,
        r.factorization_reuses, per_rank, r.linear_solver, r.converged ? "" : "  (NOT CONVERGED)");
  }
  return r.converged ? 0 : 1;
}
