#include "solver/simulation.hpp"

#include <omp.h>

#include <algorithm>
#include <cmath>
#include <sstream>
#include <vector>

#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"
#include "solver/newton_solver.hpp"
#include "solver/system_layout.hpp"
#include "solver/time_steps.hpp"

namespace aquiledger {

namespace {

std::size_t at(CellIndex c) { return static_cast<std::size_t>(c.value); }

/// Fixed cells take their period's head (the last feature wins where two overlap).
void apply_fixed_heads(const Model& model, std::size_t period, std::span<double> head) {
  for (const FixedHead& f : model.fixed_heads)
    for (std::size_t j = 0; j < f.cells.size(); ++j)
      if (model.grid.is_active(f.cells[j])) head[at(f.cells[j])] = f.head.at(period, j);
}

/// Start of the Newton iteration for an initial steady state: the mean fixed head where there
/// is one, else the aquifer top; never below mid-thickness, so that every face conducts.
std::vector<double> steady_guess(const Model& model, const SystemLayout& layout) {
  double sum = 0.0;
  int count = 0;
  for (const FixedHead& f : model.fixed_heads)
    for (std::size_t j = 0; j < f.cells.size(); ++j) sum += f.head.at(0, j), ++count;
  const auto n = static_cast<std::size_t>(model.grid.n_cells());
  std::vector<double> head(n, std::nan(""));
  for (std::size_t i = 0; i < n; ++i) {
    if (!model.grid.is_active(CellIndex{static_cast<std::int32_t>(i)})) continue;
    const double full = std::isfinite(layout.full_thickness[i]) ? layout.full_thickness[i]
                                                                : reference_thickness_without_top;
    const double mid = model.aquifer.bottom[i] + 0.5 * full;
    head[i] = count > 0 ? std::max(sum / count, mid) : model.aquifer.bottom[i] + full;
  }
  return head;
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

/// Newton's start for a step of length dt: the heads extrapolated linearly along the last
/// step (length dt_prev, from head_prev to head), by at most max_extrapolation of it; the
/// heads themselves when there is no last step (dt_prev = 0). Fixed heads do not move.
/// Halves the Newton iterations of smooth transients at no risk to the answer (only the
/// start changes; docs/performance.md).
void start_newton(double dt_prev, double dt, std::span<const double> head,
                  std::span<const double> head_prev, std::span<double> trial) {
  constexpr double max_extrapolation = 2.0;  // our choice: beyond, the trend is a guess
  const auto n = static_cast<std::ptrdiff_t>(head.size());
  if (!(dt_prev > 0.0)) {
    std::copy(head.begin(), head.end(), trial.begin());
    return;
  }
  const double ratio = std::min(dt / dt_prev, max_extrapolation);
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t i = 0; i < n; ++i) trial[i] = head[i] + ratio * (head[i] - head_prev[i]);
}

}  // namespace

RunResult run_simulation(const Model& model, SimulationObserver& observer) {
  return run_simulation(model, observer, SimulationOptions{});
}

RunResult run_simulation(const Model& model, SimulationObserver& observer,
                         const SimulationOptions& options) {
  omp_set_num_threads(model.solver.threads > 0 ? model.solver.threads : omp_get_num_procs());
  const SystemLayout layout = make_system_layout(model);
  FlowSystem system(model, layout);
  LinearSolverChoice choice =
      choose_linear_solver(model.solver.linear, system.symmetric(), system.n_unknowns());
  LinearSolver& linear = *choice.solver;
  const StartState* start = options.start ? &*options.start : nullptr;
  RunResult result;
  if (start) result = start->so_far;
  result.converged = true;
  result.failure.clear();
  result.linear_solver = linear.name();
  result.linear_reason = choice.reason;
  const RunResult base = result;  // counters before this call
  const NewtonSettings settings{model.solver.head_tolerance, model.solver.flow_tolerance,
                                model.solver.max_iterations};
  auto finish = [&](RunResult& r) {
    r.linear_iterations = base.linear_iterations + linear.total_iterations();
    r.factorizations = base.factorizations + linear.factorizations();
    r.factorization_reuses = base.factorization_reuses + linear.reuses();
    return r;
  };
  auto fail = [&](std::size_t period, int step, double time, std::string text) {
    result.converged = false;
    result.failed_period = period;
    result.failed_step = step;
    result.failed_time = time;
    result.failure = std::move(text);
    return finish(result);
  };

  NewtonWorkspace work;
  const auto n = static_cast<std::size_t>(model.grid.n_cells());
  std::vector<double> head(n, std::nan(""));
  std::size_t first_period = 0;
  int first_step = 0;
  if (start) {
    if (start->head.size() != n) return fail(start->period, 0, start->time, "start state does not fit the grid");
    head = start->head;
    if (start->linear_start.size() == static_cast<std::size_t>(system.n_unknowns()))
      work.update = Eigen::Map<const Eigen::VectorXd>(start->linear_start.data(),
                                                      static_cast<Eigen::Index>(start->linear_start.size()));
    first_period = start->period;
    first_step = start->step_in_period;
  } else if (model.initial.steady) {
    head = steady_guess(model, layout);
    apply_fixed_heads(model, 0, head);
    system.set_step(0, true, 1.0, head);
    const NewtonResult nr = solve_newton(system, linear, settings, head, work);
    result.newton_iterations += nr.iterations;
    if (!nr.converged)
      return fail(0, 0, 0.0,
                  "initial steady state: " + describe_failure(model, 0, 0, 0.0, 0.0, 0, nr));
  } else {
    for (std::size_t i = 0; i < n; ++i)
      if (model.grid.is_active(CellIndex{static_cast<std::int32_t>(i)}))
        head[i] = model.initial.head[i];
  }
  if (!start) observer.initial_state(head);

  // The last accepted step of the current period (its start heads and length): the next
  // step's Newton iteration starts from the heads extrapolated along it.
  std::vector<double> head_prev(n, std::nan(""));
  double dt_prev = 0.0;
  if (start && start->previous_dt > 0.0 && start->previous_head.size() == n) {
    head_prev = start->previous_head;
    dt_prev = start->previous_dt;
  }
  int since_checkpoint = 0;
  auto take_checkpoint = [&](std::size_t period, int step_in_period, double time) {
    if (!options.checkpoint || options.checkpoint_every <= 0 ||
        since_checkpoint < options.checkpoint_every)
      return;
    since_checkpoint = 0;
    StartState state;
    state.period = period;
    state.step_in_period = step_in_period;
    state.time = time;
    state.head = head;
    state.linear_start.assign(work.update.data(), work.update.data() + work.update.size());
    if (dt_prev > 0.0) state.previous_head = head_prev;
    state.previous_dt = dt_prev;
    RunResult so_far = result;
    state.so_far = finish(so_far);
    options.checkpoint(state);
  };

  std::vector<double> head_old(head), trial(head);
  // Period start times are summed from time 0 on every run, resumed or not, so that the
  // step end times are bit for bit those of the uninterrupted run.
  double time = 0.0;
  for (std::size_t p = 0; p < first_period && p < model.periods.size(); ++p)
    time = step_end_times(model.periods[p], time).back();
  for (std::size_t p = first_period; p < model.periods.size(); ++p) {
    const Period& period = model.periods[p];
    apply_fixed_heads(model, p, head);
    const std::vector<double> ends = step_end_times(period, time);
    std::size_t k = 0;
    if (p == first_period && first_step > 0) {
      k = std::min(static_cast<std::size_t>(first_step), ends.size());
      time = ends[k - 1];
    } else {
      dt_prev = 0.0;  // new stresses: the last step says nothing about this one
    }
    for (; k < ends.size(); ++k) {
      const int step = static_cast<int>(k) + 1;
      const double target = ends[k];
      double dt_try = target - time;
      int cutbacks = 0;
      while (time < target) {
        // Land exactly on the planned step end rather than leave a sliver.
        const bool last_piece = time + dt_try >= target - 1e-12 * std::max(1.0, std::abs(target));
        const double dt = last_piece ? target - time : dt_try;
        std::copy(head.begin(), head.end(), head_old.begin());
        start_newton(period.steady ? 0.0 : dt_prev, dt, head, head_prev, trial);
        system.set_step(p, period.steady, dt, head_old);
        const NewtonResult nr = solve_newton(system, linear, settings, trial, work);
        result.newton_iterations += nr.iterations;
        if (!nr.converged) {
          // A steady step has no length to cut.
          if (period.steady || cutbacks >= model.solver.max_cutbacks)
            return fail(p, step, time + dt,
                        describe_failure(model, p, step, time + dt, dt, cutbacks, nr));
          dt_try = 0.5 * dt;
          ++cutbacks;
          ++result.cutbacks;
          continue;
        }
        std::swap(head, trial);
        time = last_piece ? target : time + dt;
        ++result.steps;
        ++since_checkpoint;
        StepInfo info;
        info.period = p;
        info.step = step;
        info.time = time;
        info.dt = dt;
        info.steady = period.steady;
        info.newton_iterations = nr.iterations;
        info.linear_iterations = nr.linear_iterations;
        info.cutbacks = cutbacks;
        info.max_head_change = nr.max_head_change;
        info.max_imbalance = nr.max_imbalance;
        observer.step_done(info, head_old, head);
        std::swap(head_prev, head_old);
        dt_prev = dt;
      }
      if (k + 1 < ends.size()) take_checkpoint(p, step, time);
    }
    observer.period_done(p);
    take_checkpoint(p + 1, 0, time);
  }
  return finish(result);
}

}  // namespace aquiledger
