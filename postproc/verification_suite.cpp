#include "postproc/verification_suite.hpp"

#include <chrono>
#include <cmath>
#include <stdexcept>
#include <utility>

#include "postproc/verification_support.hpp"

namespace aquiledger {

void WorstPoint::add(double error_value, double tolerance_value) {
  ++points;
  const double e = std::abs(error_value);
  if (!(e <= tolerance_value)) passed = false;
  const double r = std::isnan(e) ? INFINITY : e / tolerance_value;
  if (r > ratio) {
    ratio = r;
    error = e;
    tolerance = tolerance_value;
  }
}

namespace verification {

Model uniform_model(std::vector<double> dx, std::vector<double> dy, const UniformAquifer& a) {
  Model m;
  m.title = "verification";
  m.grid = RectilinearGrid(std::move(dx), std::move(dy), 0.0, 0.0);
  const auto n = static_cast<std::size_t>(m.grid.n_cells());
  Aquifer& aq = m.aquifer;
  aq.condition = a.condition;
  aq.top.assign(n, a.top);
  aq.bottom.assign(n, a.bottom);
  aq.kx.assign(n, a.kx);
  aq.ky.assign(n, a.ky);
  aq.specific_storage.assign(n, a.specific_storage);
  if (a.condition != Condition::confined) aq.specific_yield.assign(n, a.specific_yield);
  m.initial.head.assign(n, a.initial_head);
  m.output.fields = FieldCadence::none;
  m.solver.threads = 1;
  return m;
}

std::vector<double> telescoping_widths(double inner, double growth, double half_extent) {
  std::vector<double> half;
  double w = inner, sum = 0.5 * inner;
  while (sum < half_extent) {
    w *= growth;
    half.push_back(w);
    sum += w;
  }
  std::vector<double> widths(half.rbegin(), half.rend());
  widths.push_back(inner);
  widths.insert(widths.end(), half.begin(), half.end());
  return widths;
}

std::vector<CellIndex> all_cells(const Model& model) {
  std::vector<CellIndex> cells;
  for (int i = 0; i < model.grid.n_cells(); ++i) cells.push_back(CellIndex{i});
  return cells;
}

Recorder::Recorder(const Model& model, bool keep_budget)
    : model_(model), layout_(make_system_layout(model)), keep_budget_(keep_budget) {}

void Recorder::initial_state(std::span<const double> head) {
  initial.assign(head.begin(), head.end());
}

void Recorder::step_done(const StepInfo& info, std::span<const double> head_old,
                         std::span<const double> head_new) {
  steps.push_back(info);
  heads.emplace_back(head_new.begin(), head_new.end());
  if (keep_budget_) {
    budgets.push_back(step_budget(model_, layout_, info.period, info.steady, info.dt, head_old,
                                  head_new, info.preconsolidation));
    cumulative.add_scaled(budgets.back(), info.dt);
  }
}

void run_or_throw(const Model& model, Recorder& recorder) {
  const RunResult result = run_simulation(model, recorder);
  if (!result.converged)
    throw std::runtime_error("benchmark run did not converge: " + result.failure);
}

std::size_t step_nearest(const Recorder& r, double t) {
  std::size_t best = 0;
  for (std::size_t s = 0; s < r.steps.size(); ++s)
    if (std::abs(r.steps[s].time - t) < std::abs(r.steps[best].time - t)) best = s;
  return best;
}

void finish(VerificationResult& result, const WorstPoint& worst) {
  result.largest_error = worst.error;
  result.tolerance = worst.tolerance;
  result.points = worst.points;
  result.passed = worst.passed && worst.points > 0;
}

}  // namespace verification

namespace {

using Benchmark = VerificationResult (*)();

struct Entry {
  const char* name;
  Benchmark run;
};

const Entry benchmarks[] = {
    {"theis", verification::benchmark_theis},
    {"papadopulos", verification::benchmark_papadopulos},
    {"hantush_jacob", verification::benchmark_hantush_jacob},
    {"step_response", verification::benchmark_step_response},
    {"dupuit", verification::benchmark_dupuit},
    {"glover_balmer", verification::benchmark_glover_balmer},
    {"drainage", verification::benchmark_drainage},
    {"compressibility", verification::benchmark_compressibility},
};

}  // namespace

std::vector<VerificationResult> run_verification_suite(
    const std::function<void(const VerificationResult&)>& on_done) {
  using Clock = std::chrono::steady_clock;
  std::vector<VerificationResult> results;
  for (const Entry& e : benchmarks) {
    const auto start = Clock::now();
    VerificationResult r = e.run();
    r.name = e.name;
    r.seconds = std::chrono::duration<double>(Clock::now() - start).count();
    if (on_done) on_done(r);
    results.push_back(std::move(r));
  }
  return results;
}

}  // namespace aquiledger
