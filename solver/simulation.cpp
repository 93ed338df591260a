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

}  // namespace

RunResult run_simulation(const Model& model, SimulationObserver& observer) {
  omp_set_num_threads(model.solver.threads > 0 ? model.solver.threads : omp_get_num_procs());
  const SystemLayout layout = make_system_layout(model);
  FlowSystem system(model, layout);
  LinearSolverChoice choice =
      choose_linear_solver(model.solver.linear, system.symmetric(), system.n_unknowns());
  LinearSolver& linear = *choice.solver;
  RunResult result;
  result.linear_solver = linear.name();
  result.linear_reason = choice.reason;
  const NewtonSettings settings{model.solver.head_tolerance, model.solver.flow_tolerance,
                                model.solver.max_iterations};
  auto finish = [&](RunResult& r) {
    r.linear_iterations = linear.total_iterations();
    r.factorizations = linear.factorizations();
    r.factorization_reuses = linear.reuses();
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
  if (model.initial.steady) {
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
  observer.initial_state(head);

  std::vector<double> head_old(head), trial(head), head_before(head);
  double time = 0.0;
  double last_dt = 0.0;  // T, length of the last accepted step of this period; 0 = none yet
  for (std::size_t p = 0; p < model.periods.size(); ++p) {
    const Period& period = model.periods[p];
    apply_fixed_heads(model, p, head);
    last_dt = 0.0;
    const std::vector<double> ends = step_end_times(period, time);
    for (std::size_t k = 0; k < ends.size(); ++k) {
      const int step = static_cast<int>(k) + 1;
      const double target = ends[k];
      double dt_try = target - time;
      int cutbacks = 0;
      while (time < target) {
        // Land exactly on the planned step end rather than leave a sliver.
        const bool last_piece = time + dt_try >= target - 1e-12 * std::max(1.0, std::abs(target));
        const double dt = last_piece ? target - time : dt_try;
        std::copy(head.begin(), head.end(), head_old.begin());
        // Newton starts from the heads extrapolated along the last step of the same period
        // (stresses unchanged): about one iteration fewer per transient step (measured in
        // docs/performance.md). Fixed cells do not move within a period, so they keep
        // their heads; the factor is capped at 1 so that a longer step never overshoots more.
        if (!period.steady && last_dt > 0.0) {
          const double f = std::min(1.0, dt / last_dt);
          for (std::size_t i = 0; i < n; ++i) trial[i] = head[i] + f * (head[i] - head_before[i]);
        } else {
          std::copy(head.begin(), head.end(), trial.begin());
        }
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
        last_dt = dt;
        time = last_piece ? target : time + dt;
        ++result.steps;
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
        std::swap(head_before, head_old);  // head_before: heads at the start of this step
      }
    }
    observer.period_done(p);
  }
  return finish(result);
}

}  // namespace aquiledger
