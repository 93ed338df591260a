#pragma once
#include <cstddef>
#include <span>
#include <string>

#include "solver/model.hpp"

namespace aquiledger {

/// What the time controller reports about one accepted step.
struct StepInfo {
  std::size_t period = 0;   ///< 0-based
  int step = 1;             ///< 1-based step of the period as planned
  double time = 0.0;        ///< T, end of the step
  double dt = 0.0;          ///< T, length of the (possibly cut) step
  bool steady = false;
  int newton_iterations = 0;
  int linear_iterations = 0;
  int cutbacks = 0;         ///< halvings needed for this step
  double max_head_change = 0.0;  ///< L, last Newton update
  double max_imbalance = 0.0;    ///< -, largest cell imbalance over throughflow
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
};

struct RunResult {
  bool converged = true;
  std::string failure;        ///< names period, step, time and worst cell when not converged
  std::size_t failed_period = 0;
  int failed_step = 0;
  double failed_time = 0.0;
  std::string linear_solver;  ///< backend used
  std::string linear_reason;  ///< why it was chosen
  int steps = 0;
  long newton_iterations = 0;
  long linear_iterations = 0;
  int cutbacks = 0;
  long factorizations = 0;         ///< numeric factorisations (or preconditioner set-ups)
  long factorization_reuses = 0;   ///< solves that reused the previous factorisation
};

/// Runs every period of the model, reporting each accepted step to the observer.
RunResult run_simulation(const Model& model, SimulationObserver& observer);

}  // namespace aquiledger
