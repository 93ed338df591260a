#include "solver/adjoint_gradient.hpp"

#include <cmath>
#include <stdexcept>

#include "solver/flow_system.hpp"
#include "solver/forward_sensitivities.hpp"
#include "solver/linear_solver.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {
namespace {

/// One converged state of the forward run.
struct AdjointState {
  std::size_t period = 0;
  bool steady = true;
  double dt = 1.0;  ///< T; 1 for a steady state (no storage term)
  std::vector<double> head;
};

/// Keeps every converged state and hands it to the objective.
class StateKeeper : public SimulationObserver {
 public:
  explicit StateKeeper(AdjointObjective& objective) : objective_(objective) {}
  void initial_state(std::span<const double> head) override {
    states.push_back({0, true, 1.0, {head.begin(), head.end()}});
    objective_.state(nullptr, head);
  }
  void step_done(const StepInfo& info, std::span<const double>,
                 std::span<const double> head_new) override {
    states.push_back({info.period, info.steady, info.dt, {head_new.begin(), head_new.end()}});
    objective_.state(&info, head_new);
  }
  void period_done(std::size_t) override {}
  std::vector<AdjointState> states;

 private:
  AdjointObjective& objective_;
};

}  // namespace

AdjointRun run_with_adjoint_gradient(const Model& model, std::span<const ModelParameter> parameters,
                                     AdjointObjective& objective) {
  if (model.aquifer.interbeds)
    throw std::invalid_argument("adjoint gradient: models with interbeds are not supported");
  StateKeeper keeper(objective);
  AdjointRun out;
  out.run = run_simulation(model, keeper);
  out.stored_states = keeper.states.size();
  if (!out.run.converged) return out;
  objective.run_done();

  const SystemLayout layout = make_system_layout(model);
  FlowSystem system(model, layout);
  const int n = system.n_unknowns();
  const StructuredUnknowns grid{model.grid.n_rows(), model.grid.n_cols(), layout.unknown_of_cell};
  // The backend the run chose, for the transposed matrices (a confined one is symmetric).
  std::unique_ptr<LinearSolver> linear =
      choose_linear_solver(model.solver.linear, system.symmetric(), n, 0.0, &grid).solver;
  linear->set_relative_tolerance(iterative_tolerance);
  const std::vector<AdjointState>& states = keeper.states;
  const auto cells = static_cast<std::size_t>(model.grid.n_cells());

  out.gradient = Eigen::VectorXd::Zero(static_cast<Eigen::Index>(parameters.size()));
  Eigen::VectorXd lambda = Eigen::VectorXd::Zero(n);  // lambda_{n+1}, then lambda_n
  Eigen::VectorXd rhs(n), d_next, slope;
  SparseMatrix transposed;
  std::vector<double> g(cells);
  bool next_transient = false;  // whether step n+1 exists and has a storage term
  const std::size_t first = model.initial.steady ? 0 : 1;  // given initial heads are fixed
  for (std::size_t k = states.size(); k-- > first;) {
    const AdjointState& st = states[k];
    std::fill(g.begin(), g.end(), 0.0);
    objective.add_head_gradient(k, st.head, g);
    for (int u = 0; u < n; ++u) rhs[u] = g[at(layout.cell_of_unknown[static_cast<std::size_t>(u)])];
    if (next_transient) {  // D_{n+1} lambda_{n+1}: step n+1 started from these heads
      old_head_slope(model, layout, states[k + 1].dt, st.head, d_next);
      rhs += d_next.cwiseProduct(lambda);
    }
    const std::span<const double> h_old =
        k > 0 ? std::span<const double>(states[k - 1].head) : std::span<const double>(st.head);
    system.set_step(st.period, st.steady, st.dt, h_old);
    system.assemble(st.head);
    const long factorized_before = linear->factorizations();
    bool solved = false;
    if (system.symmetric()) {
      solved = linear->solve(system.matrix(), rhs, lambda);
    } else {
      transposed = system.matrix().transpose();  // the 5-point pattern is symmetric
      solved = linear->solve(transposed, rhs, lambda);
    }
    if (!solved) throw std::runtime_error("adjoint gradient: the linear solver failed");
    ++out.adjoint_solves;
    out.adjoint_factorizations += linear->factorizations() - factorized_before;
    for (std::size_t j = 0; j < parameters.size(); ++j) {
      residual_log_slope(model, layout, parameters[j], st.period, st.steady, st.dt, h_old, st.head,
                         slope);
      out.gradient[static_cast<Eigen::Index>(j)] += lambda.dot(slope);
    }
    next_transient = !st.steady;
  }
  return out;
}

}  // namespace aquiledger
