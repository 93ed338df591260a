#include "solver/forward_sensitivities.hpp"

#include <cmath>
#include <exception>
#include <stdexcept>

#include "solver/face_table.hpp"
#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"
#include "solver/storage_function.hpp"
#include "solver/stress_flows.hpp"

namespace aquiledger {
namespace {

/// 1 per grid cell a cell parameter sets.
std::vector<std::uint8_t> cell_mask(const Model& model, const ModelParameter& p) {
  std::vector<std::uint8_t> mask(static_cast<std::size_t>(model.grid.n_cells()), 0);
  for (int c : p.cells) mask[static_cast<std::size_t>(c)] = 1;
  return mask;
}

FeatureKind feature_kind(ParameterProperty property) {
  switch (property) {
    case ParameterProperty::recharge:
      return FeatureKind::recharge;
    case ParameterProperty::river_conductance:
      return FeatureKind::river;
    case ParameterProperty::drain_conductance:
      return FeatureKind::drain;
    default:
      return FeatureKind::external_head;
  }
}

/// Follows the run: after each accepted step, the sensitivity system of that step, solved with
/// the run's own matrix at the converged heads and its own linear solver (converged_system):
/// a direct solver whose factorisation is of that matrix (a confined model, or a step Newton
/// ended on an affine update) solves without factorising; otherwise it factorises the
/// converged Jacobian once for the p right-hand sides. An iterative solver keeps its
/// preconditioner and solves to iterative_tolerance.
class SensitivityTracker : public SimulationObserver {
 public:
  SensitivityTracker(const Model& model, std::span<const ModelParameter> parameters,
                     SensitivityObserver& observer)
      : model_(model),
        parameters_(parameters),
        observer_(observer),
        layout_(make_system_layout(model)) {
    const auto n = static_cast<std::size_t>(model.grid.n_cells());
    s_.assign(parameters.size(), std::vector<double>(n, 0.0));
    for (auto& s : s_)
      for (std::size_t i = 0; i < n; ++i)
        if (!model.grid.is_active(CellIndex{static_cast<std::int32_t>(i)})) s[i] = std::nan("");
  }

  void converged_system(FlowSystem& system, LinearSolver& linear) override {
    system_ = &system;
    linear_ = &linear;
  }
  void initial_state(std::span<const double> head) override {
    if (model_.initial.steady) solve_step(0, true, 1.0, head, head);
    observer_.state(nullptr, head, s_);
  }
  void step_done(const StepInfo& info, std::span<const double> head_old,
                 std::span<const double> head_new) override {
    solve_step(info.period, info.steady, info.dt, head_old, head_new);
    observer_.state(&info, head_new, s_);
  }
  void period_done(std::size_t) override {}

  long solves() const { return solves_; }
  long factorizations() const { return factorizations_; }

 private:
  void solve_step(std::size_t period, bool steady, double dt, std::span<const double> h_old,
                  std::span<const double> h) {
    if (!system_ || !linear_)
      throw std::logic_error("sensitivities: the run did not hand over its converged system");
    const SparseMatrix& a = system_->matrix();
    const long factorized_before = linear_->factorizations();
    linear_->set_relative_tolerance(iterative_tolerance);
    const int n = layout_.n_unknowns();
    const auto p = static_cast<int>(parameters_.size());
    if (!steady) old_head_slope(model_, layout_, dt, h_old, d_old_);
    b_.resize(n, p);
    x_.resize(n, p);
    // The right-hand sides of the parameters are independent: one per thread at a time
    // (residual_log_slope only reads the model and the heads).
    std::exception_ptr error;
#pragma omp parallel if (p > 1)
    {
      Eigen::VectorXd slope;
#pragma omp for schedule(dynamic)
      for (int k = 0; k < p; ++k) {
        try {
          residual_log_slope(model_, layout_, parameters_[static_cast<std::size_t>(k)], period,
                             steady, dt, h_old, h, slope);
        } catch (...) {
#pragma omp critical(aquiledger_sensitivity_error)
          error = std::current_exception();
          continue;
        }
        const std::vector<double>& s = s_[static_cast<std::size_t>(k)];
        for (int u = 0; u < n; ++u) {
          const double s_old = s[at(layout_.cell_of_unknown[static_cast<std::size_t>(u)])];
          // dR/dh_old s_old: the storage release's dependence on the start heads
          b_(u, k) = steady ? slope[u] : slope[u] + d_old_[u] * s_old;
          x_(u, k) = s_old;  // an iterative solver starts from the last sensitivities
        }
      }
    }
    if (error) std::rethrow_exception(error);
    // All columns with one matrix: a direct solver solves them together (linear_solver.hpp).
    if (!linear_->solve_columns(a, b_, x_))
      throw std::runtime_error("sensitivities: the linear solver failed");
    solves_ += p;
    for (int k = 0; k < p; ++k) {
      std::vector<double>& s = s_[static_cast<std::size_t>(k)];
      for (int u = 0; u < n; ++u)
        s[at(layout_.cell_of_unknown[static_cast<std::size_t>(u)])] = x_(u, k);
    }
    factorizations_ += linear_->factorizations() - factorized_before;
    system_ = nullptr;
    linear_ = nullptr;
  }

  const Model& model_;
  std::span<const ModelParameter> parameters_;
  SensitivityObserver& observer_;
  SystemLayout layout_;
  FlowSystem* system_ = nullptr;
  LinearSolver* linear_ = nullptr;
  HeadSensitivities s_;
  Eigen::MatrixXd b_, x_;  ///< right-hand sides and solutions, one column per parameter
  Eigen::VectorXd d_old_;
  long solves_ = 0;
  long factorizations_ = 0;
};

}  // namespace

std::size_t feature_position(const Model& model, ParameterProperty property, std::size_t f) {
  const FeatureKind kind = feature_kind(property);
  const std::vector<FeatureRef> features = list_features(model);
  for (std::size_t k = 0; k < features.size(); ++k)
    if (features[k].kind == kind && features[k].index == f) return k;
  throw std::invalid_argument("feature_position: no such feature");
}

void old_head_slope(const Model& model, const SystemLayout& layout, double dt,
                    std::span<const double> h_old, Eigen::VectorXd& out) {
  const int n = layout.n_unknowns();
  out.resize(n);
  for (int u = 0; u < n; ++u) {
    const CellIndex c = layout.cell_of_unknown[static_cast<std::size_t>(u)];
    out[u] = layout.area[at(c)] * stored_water_slope(cell_storage(model, c), h_old[at(c)]) / dt;
  }
}

void residual_log_slope(const Model& model, const SystemLayout& layout, const ModelParameter& p,
                        std::size_t period, bool steady, double dt, std::span<const double> h_old,
                        std::span<const double> h, Eigen::VectorXd& out) {
  const int n = layout.n_unknowns();
  out.setZero(n);
  const RectilinearGrid& g = model.grid;
  if (!is_cell_property(p.property)) {
    for (std::size_t f : p.features)
      for (const CellStressFlow& q :
           feature_cell_flows(model, layout, period, h, feature_position(model, p.property, f))) {
        const int u = layout.unknown_of_cell[at(q.cell)];
        if (u >= 0) out[u] += q.q.value;  // every feature law is linear in its rate or conductance
      }
    return;
  }
  const std::vector<std::uint8_t> in = cell_mask(model, p);
  if (p.property == ParameterProperty::conductivity) {
    // Only the rows of the parameter's cells and of their neighbours carry a term: the others
    // are skipped before their face factors are computed (a zone's parameter then costs in
    // proportion to its cells, not to the grid).
    std::vector<std::uint8_t> touched(static_cast<std::size_t>(n), 0);
    auto touch = [&](int row, int col) {
      if (row < 0 || row >= g.n_rows() || col < 0 || col >= g.n_cols()) return;
      const int u = layout.unknown_of_cell[at(g.cell(row, col))];
      if (u >= 0) touched[static_cast<std::size_t>(u)] = 1;
    };
    for (int cell : p.cells) {
      const RowCol rc = g.row_col(CellIndex{cell});
      touch(rc.row, rc.col);
      touch(rc.row, rc.col - 1);
      touch(rc.row, rc.col + 1);
      touch(rc.row - 1, rc.col);
      touch(rc.row + 1, rc.col);
    }
    for (int u = 0; u < n; ++u) {
      if (!touched[static_cast<std::size_t>(u)]) continue;
      const CellIndex c = layout.cell_of_unknown[static_cast<std::size_t>(u)];
      const int row = g.row_col(c).row;
      for_each_active_neighbour(model, c, [&](CellIndex nb, double factor) {
        if (!in[at(c)] && !in[at(nb)]) return;
        const bool east_west = g.row_col(nb).row == row;
        const FaceElasticity e = face_factor_elasticities(model, c, nb, east_west);
        const double q = face_flow(model, layout, c, nb, factor, h[at(c)], h[at(nb)]).q;
        out[u] += q * (in[at(c)] * e.i + in[at(nb)] * e.j);
      });
    }
    return;
  }
  if (steady) return;  // storage parameters act only through the storage term
  const bool yield = p.property == ParameterProperty::specific_yield;
  for (int u = 0; u < n; ++u) {
    const CellIndex c = layout.cell_of_unknown[static_cast<std::size_t>(u)];
    if (!in[at(c)]) continue;
    // The release -A dW/dt is linear in S (elastic part) and in Sy (drainage part).
    const StoredWater d = stored_water_change(cell_storage(model, c), h_old[at(c)], h[at(c)]);
    out[u] -= layout.area[at(c)] * (yield ? d.drainage : d.elastic) / dt;
  }
}

SensitivityRun run_with_sensitivities(const Model& model,
                                      std::span<const ModelParameter> parameters,
                                      SensitivityObserver& observer) {
  if (model.aquifer.interbeds)
    throw std::invalid_argument("sensitivities: models with interbeds are not supported");
  SensitivityTracker tracker(model, parameters, observer);
  SensitivityRun result;
  result.run = run_simulation(model, tracker);
  result.sensitivity_solves = tracker.solves();
  result.sensitivity_factorizations = tracker.factorizations();
  return result;
}

}  // namespace aquiledger
