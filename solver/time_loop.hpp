#pragma once
// The periods, steps and step cutbacks of a run, written once over any "stepper": the serial
// engine's (simulation.cpp) and the distributed engine's (solver/distributed/). A stepper
// holds the current heads and provides
//   void apply_fixed_heads(std::size_t period);
//   NewtonResult try_step(std::size_t period, bool steady, double dt);  from the current heads
//   void accept(const StepInfo& info);       the tried heads become current; observers told
//   void period_done(std::size_t period);
//   void checkpoint(std::size_t period, int step_in_period, double time, const RunResult& so_far);
//   RunResult finish(RunResult r) const;     adds the linear solver's counters
//   bool resume(const StartState& start);    continues after a checkpoint (heads already set);
//                                            false when its interbed state does not fit
//   void start_interbeds();                  the initial heads are set: preconsolidation heads
//   NewtonResult solve_initial_steady();     the initial steady state from the current heads
#include <algorithm>
#include <cmath>
#include <span>
#include <string>
#include <vector>

#include "mesh/grid_part.hpp"
#include "solver/newton_solver.hpp"
#include "solver/simulation.hpp"
#include "solver/system_layout.hpp"
#include "solver/time_steps.hpp"

namespace aquiledger {

/// One line naming period, step, time, step length, cutbacks and the worst cell.
std::string describe_failure(const Model& model, std::size_t period, int step, double time,
                             double dt, int cutbacks, const NewtonResult& nr);

/// Fixed cells held in head take their period's head (the last feature wins where two overlap).
void apply_fixed_heads(const Model& model, std::size_t period, CellWindow<double> head,
                       const GridPart& part);

/// Start of the Newton iteration for an initial steady state at the cells the part holds:
/// the mean fixed head where there is one, else the aquifer top, else (a water-table aquifer
/// without a top) reference_thickness_without_top above the bottom, raised above every river
/// stage and bed bottom and drain elevation of period 1 so that each of them conducts; never
/// below mid-thickness, so that every face conducts. NaN at inactive cells.
void steady_guess(const Model& model, const SystemLayout& layout, CellWindow<double> head,
                  const GridPart& part);

/// Newton's start for a step of length dt: head extrapolated along the last step (length
/// dt_prev, from head_prev to head), by at most twice; head itself when dt_prev = 0.
void start_newton(double dt_prev, double dt, std::span<const double> head,
                  std::span<const double> head_prev, std::span<double> trial);

/// On in both engines: switching basin 1e4 cells, median Newton per step 4 -> 3
/// (docs/performance.md). Newton's last iterate then lies elsewhere within head_tolerance
/// of the solution than from the unextrapolated start.
inline constexpr bool extrapolate_newton_start = true;

/// Marks a run failed at the given place.
inline RunResult& mark_failed(RunResult& r, std::size_t period, int step, double time,
                              std::string text) {
  r.converged = false;
  r.failed_period = period;
  r.failed_step = step;
  r.failed_time = time;
  r.failure = std::move(text);
  return r;
}

/// The given initial heads at the active cells the part holds (NaN elsewhere).
void given_initial_heads(const Model& model, const GridPart& part, CellWindow<double> head);

/// The counters and names a run starts from: a resumed run's counters so far, or zero.
inline RunResult starting_result(const StartState* start, std::string linear_solver,
                                 std::string linear_reason) {
  RunResult result;
  if (start) result = start->so_far;
  result.converged = true;
  result.failure.clear();
  result.linear_solver = std::move(linear_solver);
  result.linear_reason = std::move(linear_reason);
  return result;
}

inline NewtonSettings newton_settings(const Model& model) {
  return {model.solver.head_tolerance, model.solver.flow_tolerance, model.solver.max_iterations,
          model.solver.limit_at_withdrawal_inflection, model.solver.stop_on_contraction_estimate};
}

/// A stepper's memory of its last accepted step (its start heads, length and period): where
/// Newton starts the next step, what a checkpoint keeps of it, and how a resumed run gets it
/// back. The same for both engines; heads are the stepper's own (whole grid or held rows).
class StepHistory {
 public:
  explicit StepHistory(std::size_t n_heads) : head_prev_(n_heads, std::nan("")) {}

  /// Newton's start for a step of length dt from head: extrapolated along the last step when
  /// it was a transient step of the same period (extrapolate_newton_start), head otherwise.
  void start(std::size_t period, bool steady, double dt, std::span<const double> head,
             std::span<double> trial) const {
    const bool extrapolate = extrapolate_newton_start && !steady && period == period_ && dt_ > 0.0;
    start_newton(extrapolate ? dt_ : 0.0, dt, head, head_prev_, trial);
  }
  /// A step of `period` and length dt that started from head_old was accepted; head_old
  /// receives the history's previous heads (swapped, not copied).
  void accepted(std::size_t period, double dt, std::vector<double>& head_old) {
    std::swap(head_prev_, head_old);
    dt_ = dt;
    period_ = period;
  }
  /// Continues a run whose last accepted step (of `period`) started from previous_head.
  void resume_after(std::size_t period, const std::vector<double>& previous_head,
                    double previous_dt) {
    if (!(previous_dt > 0.0) || previous_head.size() != head_prev_.size()) return;
    head_prev_ = previous_head;
    dt_ = previous_dt;
    period_ = period;
  }
  /// The state a checkpoint keeps at this point (the linear solver's start aside).
  StartState checkpoint_state(std::size_t period, int step_in_period, double time,
                              const std::vector<double>& head, const RunResult& so_far) const {
    StartState state;
    state.period = period;
    state.step_in_period = step_in_period;
    state.time = time;
    state.head = head;
    if (step_in_period > 0 && period == period_ && dt_ > 0.0) {
      state.previous_head = head_prev_;
      state.previous_dt = dt_;
    }
    state.so_far = so_far;
    return state;
  }

 private:
  std::vector<double> head_prev_;
  double dt_ = 0.0;
  std::size_t period_ = static_cast<std::size_t>(-1);
};

/// Runs the periods from first_period (after first_step planned steps of it) to the end.
template <class Stepper>
RunResult run_periods(const Model& model, Stepper& stepper, RunResult result,
                      std::size_t first_period, int first_step, int checkpoint_every) {
  int since_checkpoint = 0;
  auto take_checkpoint = [&](std::size_t period, int step_in_period, double time) {
    if (checkpoint_every <= 0 || since_checkpoint < checkpoint_every) return;
    since_checkpoint = 0;
    stepper.checkpoint(period, step_in_period, time, stepper.finish(result));
  };
  // Period start times are summed from time 0 on every run, resumed or not, so that the
  // step end times are bit for bit those of the uninterrupted run.
  double time = 0.0;
  for (std::size_t p = 0; p < first_period && p < model.periods.size(); ++p)
    time = step_end_times(model.periods[p], time).back();
  for (std::size_t p = first_period; p < model.periods.size(); ++p) {
    const Period& period = model.periods[p];
    stepper.apply_fixed_heads(p);
    const std::vector<double> ends = step_end_times(period, time);
    std::size_t k = 0;
    if (p == first_period && first_step > 0) {
      k = std::min(static_cast<std::size_t>(first_step), ends.size());
      time = ends[k - 1];
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
        const NewtonResult nr = stepper.try_step(p, period.steady, dt);
        result.newton_iterations += nr.iterations;
        if (!nr.converged) {
          // A steady step has no length to cut.
          if (period.steady || cutbacks >= model.solver.max_cutbacks)
            return stepper.finish(
                mark_failed(result, p, step, time + dt,
                            describe_failure(model, p, step, time + dt, dt, cutbacks, nr)));
          dt_try = 0.5 * dt;
          ++cutbacks;
          ++result.cutbacks;
          continue;
        }
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
        stepper.accept(info);
      }
      if (k + 1 < ends.size()) take_checkpoint(p, step, time);
    }
    stepper.period_done(p);
    take_checkpoint(p + 1, 0, time);
  }
  return stepper.finish(result);
}

/// A run from its start to its end, the same for both engines (head is the stepper's own:
/// the whole grid or the rows the part holds). A resumed run continues from its start state;
/// a fresh one starts from an initial steady state, which the stepper solves from
/// steady_guess with the first period's fixed heads, or from the given heads.
template <class Stepper>
RunResult run_from_start(const Model& model, const SystemLayout& layout, const GridPart& part,
                         Stepper& stepper, std::vector<double>& head, const StartState* start,
                         RunResult result, SimulationObserver& observer, int checkpoint_every) {
  std::size_t first_period = 0;
  int first_step = 0;
  const CellWindow<double> window(head, part.first_held());
  if (start) {
    if (start->head.size() != head.size())
      return stepper.finish(mark_failed(result, start->period, 0, start->time,
                                        "start state does not fit the cells this run holds"));
    head = start->head;
    first_period = start->period;
    first_step = start->step_in_period;
    if (!stepper.resume(*start))
      return stepper.finish(
          mark_failed(result, start->period, 0, start->time,
                      "the start state has no preconsolidation heads (or delay-bed node state) for "
                      "this model's interbeds"));
  } else if (model.initial.steady) {
    steady_guess(model, layout, window, part);
    apply_fixed_heads(model, 0, window, part);
    const NewtonResult nr = stepper.solve_initial_steady();
    result.newton_iterations += nr.iterations;
    if (!nr.converged)
      return stepper.finish(
          mark_failed(result, 0, 0, 0.0,
                      "initial steady state: " + describe_failure(model, 0, 0, 0.0, 0.0, 0, nr)));
  } else {
    given_initial_heads(model, part, window);
  }
  if (!start) {
    stepper.start_interbeds();
    observer.initial_state(head);
  }
  return run_periods(model, stepper, result, first_period, first_step, checkpoint_every);
}

}  // namespace aquiledger
