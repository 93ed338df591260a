#pragma once
#include <cstddef>
#include <functional>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "solver/model.hpp"

namespace aquiledger {

class FlowSystem;
class LinearSolver;

/// What the time controller reports about one accepted step.
struct StepInfo {
  std::size_t period = 0;  ///< 0-based
  int step = 1;            ///< 1-based step of the period as planned
  double time = 0.0;       ///< T, end of the step
  double dt = 0.0;         ///< T, length of the (possibly cut) step
  bool steady = false;
  int newton_iterations = 0;
  int linear_iterations = 0;
  int cutbacks = 0;              ///< halvings needed for this step
  double max_head_change = 0.0;  ///< L, last Newton update
  double max_imbalance = 0.0;    ///< -, largest cell imbalance over throughflow
  /// L, the interbeds' preconsolidation heads at the start of the step, the same cells as the
  /// heads given with it (NaN where inactive); empty without interbeds. Valid only during
  /// step_done: a copy of a StepInfo kept afterwards must not read it.
  std::span<const double> preconsolidation;
  /// L per unit plan area, the same cells: water the delay beds released into the aquifer
  /// over the step from their elastic and inelastic branches (solver/delay_bed_heads.hpp);
  /// empty without delay beds. Valid only during step_done.
  std::span<const double> delay_bed_elastic, delay_bed_inelastic;
};

/// Receives the run's results as they are produced. Heads are per grid cell, NaN where
/// inactive.
class SimulationObserver {
 public:
  virtual ~SimulationObserver() = default;
  virtual void initial_state(std::span<const double> head) = 0;
  virtual void step_done(const StepInfo& info, std::span<const double> head_old,
                         std::span<const double> head_new) = 0;
  virtual void period_done(std::size_t period) = 0;
  /// Serial engine only, just before initial_state (after an initial steady solve) and before
  /// step_done: the run's system with its matrix -dR/dh and residual assembled at the
  /// converged heads of the state reported next, and the linear solver of its Newton
  /// iterations, whose factorisation or preconditioner an observer may reuse for solves of its
  /// own with that matrix (forward sensitivities). Valid during the call and the report that
  /// follows; Newton resets the solver's tolerance before each of its solves. Default: nothing.
  virtual void converged_system(FlowSystem&, LinearSolver&) {}
};

struct RunResult {
  bool converged = true;
  std::string failure;  ///< names period, step, time and worst cell when not converged
  std::size_t failed_period = 0;
  int failed_step = 0;
  double failed_time = 0.0;
  std::string linear_solver;  ///< backend used
  std::string linear_reason;  ///< why it was chosen
  int steps = 0;
  long newton_iterations = 0;
  long linear_iterations = 0;
  int cutbacks = 0;
  long factorizations = 0;        ///< numeric factorisations (or preconditioner set-ups)
  long factorization_reuses = 0;  ///< solves that reused the previous factorisation
};

/// Runs every period of the model, reporting each accepted step to the observer.
RunResult run_simulation(const Model& model, SimulationObserver& observer);

/// Where a run continues: after `step_in_period` planned steps of `period` (0 = at the start
/// of the period; a finished period is written as the next period with step 0). Taken at the
/// end of a planned step, never inside one, so the resumed run repeats the uninterrupted one
/// exactly: the same step end times (recomputed from time 0 as the uninterrupted run does),
/// the same heads, the same start of the iterative linear solver.
struct StartState {
  std::size_t period = 0;            ///< 0-based
  int step_in_period = 0;            ///< planned steps of that period already done
  double time = 0.0;                 ///< T, end of the last step done
  std::vector<double> head;          ///< L, per grid cell (NaN where inactive)
  std::vector<double> linear_start;  ///< L per unknown: start of the next iterative solve
  /// L per grid cell: heads at the start of the last accepted step of this period, and its
  /// length (T); the next step's Newton start is extrapolated along it. Empty (and 0) at the
  /// start of a period.
  std::vector<double> previous_head;
  double previous_dt = 0.0;
  /// L per grid cell: the interbeds' preconsolidation heads (empty without interbeds).
  std::vector<double> preconsolidation;
  /// L, the delay beds' node heads and preconsolidation heads (DelayBedHeads; empty without
  /// delay beds).
  std::vector<double> delay_bed_heads, delay_bed_preconsolidation;
  RunResult so_far;  ///< counters of the run up to this point
};

struct SimulationOptions {
  /// Continue from here instead of the initial state (observer.initial_state is not called:
  /// the observer must have been restored to the same point).
  std::optional<StartState> start;
  /// Called with the state once at least `checkpoint_every` steps were accepted since the
  /// last call, at the end of a planned step (after period_done at a period's end).
  int checkpoint_every = 0;
  std::function<void(const StartState&)> checkpoint;
  /// Bytes the run may use, for linear = "auto" (whether a factorisation fits); 0: not known.
  double memory_bytes = 0.0;
};

/// As above, optionally starting from a saved state and taking checkpoints. Counters in the
/// result include those of options.start->so_far.
RunResult run_simulation(const Model& model, SimulationObserver& observer,
                         const SimulationOptions& options);

}  // namespace aquiledger
