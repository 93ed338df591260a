#include "solver/simulation.hpp"

#include <omp.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <sstream>
#include <vector>

#include "solver/delay_bed_heads.hpp"
#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"
#include "solver/newton_solver.hpp"
#include "solver/preconsolidation_heads.hpp"
#include "solver/system_layout.hpp"
#include "solver/time_loop.hpp"
#include "solver/time_steps.hpp"

namespace aquiledger {

namespace {

/// The serial stepper: heads per grid cell, one FlowSystem and one linear solver.
class SerialStepper {
 public:
  SerialStepper(FlowSystem& system, LinearSolver& linear, const NewtonSettings& settings,
                SimulationObserver& observer, const SimulationOptions& options,
                std::vector<double>& head, NewtonWorkspace& work, const RunResult& base)
      : model_(system.model()),
        system_(system),
        linear_(linear),
        settings_(settings),
        observer_(observer),
        options_(options),
        head_(head),
        work_(work),
        base_(base),
        head_old_(head),
        trial_(head) {}

  void apply_fixed_heads(std::size_t period) {
    aquiledger::apply_fixed_heads(model_, period, head_, GridPart::whole(model_.grid));
  }
  NewtonResult try_step(std::size_t period, bool steady, double dt) {
    std::copy(head_.begin(), head_.end(), head_old_.begin());
    history_.start(period, steady, dt, head_, trial_);
    system_.set_step(period, steady, dt, head_old_);
    if (preconsolidation_.active()) system_.set_preconsolidation(preconsolidation_.values());
    system_.set_delay_beds(delay_beds_.active() ? &delay_beds_ : nullptr);
    return solve_newton(system_, linear_, settings_, trial_, work_);
  }
  void accept(const StepInfo& info) {
    std::swap(head_, trial_);
    StepInfo told = info;
    told.preconsolidation = preconsolidation_.values();
    // The converged step's system goes to the observer before the beds advance past it.
    observer_.converged_system(system_, linear_);
    if (delay_beds_.active()) {
      delay_beds_.advance(head_, info.steady, info.dt);
      told.delay_bed_elastic = delay_beds_.elastic();
      told.delay_bed_inelastic = delay_beds_.inelastic();
    }
    observer_.step_done(told, head_old_, head_);
    preconsolidation_.lower(head_);
    history_.accepted(info.period, info.dt, head_old_);
  }
  void start_interbeds() {
    preconsolidation_.start(head_);
    delay_beds_.start(head_);
  }
  bool resume(const StartState& start) {
    if (start.linear_start.size() == static_cast<std::size_t>(system_.n_unknowns()))
      work_.update = Eigen::Map<const Eigen::VectorXd>(
          start.linear_start.data(), static_cast<Eigen::Index>(start.linear_start.size()));
    if (start.step_in_period > 0)
      history_.resume_after(start.period, start.previous_head, start.previous_dt);
    return preconsolidation_.resume(start.preconsolidation) &&
           delay_beds_.resume(start.delay_bed_heads, start.delay_bed_preconsolidation);
  }
  NewtonResult solve_initial_steady() {
    system_.set_delay_beds(nullptr);
    system_.set_step(0, true, 1.0, head_);
    const NewtonResult r = solve_newton(system_, linear_, settings_, head_, work_);
    if (r.converged) observer_.converged_system(system_, linear_);
    return r;
  }
  void period_done(std::size_t period) { observer_.period_done(period); }
  void checkpoint(std::size_t period, int step_in_period, double time, const RunResult& so_far) {
    StartState state = history_.checkpoint_state(period, step_in_period, time, head_, so_far);
    state.linear_start.assign(work_.update.data(), work_.update.data() + work_.update.size());
    state.preconsolidation.assign(preconsolidation_.values().begin(),
                                  preconsolidation_.values().end());
    state.delay_bed_heads = delay_beds_.node_heads();
    state.delay_bed_preconsolidation = delay_beds_.node_preconsolidation();
    options_.checkpoint(state);
  }
  RunResult finish(RunResult r) const {
    r.linear_iterations = base_.linear_iterations + linear_.total_iterations();
    r.factorizations = base_.factorizations + linear_.factorizations();
    r.factorization_reuses = base_.factorization_reuses + linear_.reuses();
    return r;
  }

 private:
  const Model& model_;
  FlowSystem& system_;
  LinearSolver& linear_;
  const NewtonSettings& settings_;
  SimulationObserver& observer_;
  const SimulationOptions& options_;
  std::vector<double>& head_;
  NewtonWorkspace& work_;
  const RunResult& base_;
  std::vector<double> head_old_, trial_;
  StepHistory history_{head_old_.size()};
  PreconsolidationHeads preconsolidation_{model_, GridPart::whole(model_.grid)};
  DelayBedHeads delay_beds_{model_, GridPart::whole(model_.grid)};
};

}  // namespace

/// Newton's start for a step of length dt: the heads extrapolated linearly along the last
/// step (length dt_prev, from head_prev to head), by at most max_extrapolation of it; the
/// heads themselves when there is no last step (dt_prev = 0). Fixed heads do not move (they
/// are equal at both ends). Only the start changes, never the answer; it saves Newton
/// iterations in smooth transients (docs/performance.md).
void start_newton(double dt_prev, double dt, std::span<const double> head,
                  std::span<const double> head_prev, std::span<double> trial) {
  constexpr double max_extrapolation = 2.0;  // our choice: beyond, the trend is a guess
  if (!(dt_prev > 0.0)) {
    std::copy(head.begin(), head.end(), trial.begin());
    return;
  }
  const double ratio = std::min(dt / dt_prev, max_extrapolation);
  const auto n = static_cast<std::ptrdiff_t>(head.size());
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t i = 0; i < n; ++i) trial[i] = head[i] + ratio * (head[i] - head_prev[i]);
}

void given_initial_heads(const Model& model, const GridPart& part, CellWindow<double> head) {
  const auto first = static_cast<std::size_t>(part.first_held());
  for (std::size_t i = first; i < first + part.n_held(); ++i)
    if (model.grid.is_active(CellIndex{static_cast<std::int32_t>(i)}))
      head[i] = model.initial.head[i];
}

void apply_fixed_heads(const Model& model, std::size_t period, CellWindow<double> head,
                       const GridPart& part) {
  for (const FixedHead& f : model.fixed_heads)
    for (std::size_t j = 0; j < f.cells.size(); ++j) {
      const CellIndex c = f.cells[j];
      if (c.value < part.first_held() ||
          c.value >= part.first_held() + static_cast<std::int32_t>(part.n_held()))
        continue;
      if (model.grid.is_active(c)) head[at(c)] = f.head.at(period, j);
    }
}

void steady_guess(const Model& model, const SystemLayout& layout, CellWindow<double> head,
                  const GridPart& part) {
  double sum = 0.0;
  int count = 0;
  for (const FixedHead& f : model.fixed_heads)
    for (std::size_t j = 0; j < f.cells.size(); ++j) sum += f.head.at(0, j), ++count;
  // The level above which every river and drain of period 1 conducts (L): a start below all
  // of them, with no fixed head, leaves a steady system (no storage term) whose only
  // head-dependent terms are flat, so its Jacobian is that of a closed aquifer, singular.
  double connecting_level = -std::numeric_limits<double>::infinity();
  for (const River& r : model.rivers)
    for (std::size_t j = 0; j < r.cells.size(); ++j)
      connecting_level = std::max({connecting_level, r.stage.at(0, j), r.bed_bottom.at(0, j)});
  for (const Drain& d : model.drains)
    for (std::size_t j = 0; j < d.cells.size(); ++j)
      connecting_level = std::max(connecting_level, d.elevation.at(0, j));
  const auto first = static_cast<std::size_t>(part.first_held());
  for (std::size_t i = first; i < first + part.n_held(); ++i) {
    head[i] = std::nan("");
    if (!model.grid.is_active(CellIndex{static_cast<std::int32_t>(i)})) continue;
    const bool has_top = std::isfinite(layout.full_thickness[i]);
    const double full = has_top ? layout.full_thickness[i] : reference_thickness_without_top;
    const double mid = model.aquifer.bottom[i] + 0.5 * full;
    if (count > 0)
      head[i] = std::max(sum / count, mid);
    else if (has_top)
      head[i] = model.aquifer.bottom[i] + full;
    else  // no top to start from: above every river bed and drain (past their smoothing)
      head[i] =
          std::max(model.aquifer.bottom[i] + full, connecting_level + layout.smoothing_length[i]);
  }
}

std::string describe_failure(const Model& model, std::size_t period, int step, double time,
                             double dt, int cutbacks, const NewtonResult& nr) {
  std::ostringstream s;
  s << "period " << period + 1 << " (\"" << model.periods[period].name << "\"), step " << step
    << ", time " << time << " (dt " << dt << " after " << cutbacks << " cutbacks): ";
  if (nr.linear_failure)
    s << "the linear solver failed";
  else
    s << "Newton did not converge in " << nr.iterations << " iterations (last head change "
      << nr.max_head_change << ", largest imbalance " << nr.max_imbalance << " of throughflow)";
  if (nr.worst_cell.valid()) {
    const RowCol rc = model.grid.row_col(nr.worst_cell);
    s << "; worst cell row " << rc.row + 1 << ", col " << rc.col + 1;
  }
  return s.str();
}

RunResult run_simulation(const Model& model, SimulationObserver& observer) {
  return run_simulation(model, observer, SimulationOptions{});
}

RunResult run_simulation(const Model& model, SimulationObserver& observer,
                         const SimulationOptions& options) {
  omp_set_num_threads(model.solver.threads > 0 ? model.solver.threads : omp_get_num_procs());
  const SystemLayout layout = make_system_layout(model);
  FlowSystem system(model, layout);
  const StructuredUnknowns grid{model.grid.n_rows(), model.grid.n_cols(), layout.unknown_of_cell};
  LinearSolverChoice choice = choose_linear_solver(
      model.solver.linear, system.symmetric(), system.n_unknowns(), options.memory_bytes, &grid);
  LinearSolver& linear = *choice.solver;
  const StartState* start = options.start ? &*options.start : nullptr;
  RunResult result = starting_result(start, linear.name(), choice.reason);
  const RunResult base = result;  // counters before this call
  const NewtonSettings settings = newton_settings(model);
  NewtonWorkspace work;
  const auto n = static_cast<std::size_t>(model.grid.n_cells());
  std::vector<double> head(n, std::nan(""));
  SerialStepper stepper(system, linear, settings, observer, options, head, work, base);
  return run_from_start(model, layout, GridPart::whole(model.grid), stepper, head, start, result,
                        observer, options.checkpoint ? options.checkpoint_every : 0);
}

}  // namespace aquiledger
