#include "solver/flow_system.hpp"

#include <cmath>

#include "solver/cell_balance.hpp"
#include "solver/face_table.hpp"
#include "solver/stress_flows.hpp"

namespace aquiledger {

namespace {

/// Position of entry (row, col) in the values of a compressed column-major matrix.
int value_position(const SparseMatrix& m, int row, int col) {
  for (int p = m.outerIndexPtr()[col]; p < m.outerIndexPtr()[col + 1]; ++p)
    if (m.innerIndexPtr()[p] == row) return p;
  return -1;
}

}  // namespace

FlowSystem::FlowSystem(const Model& model, const SystemLayout& layout)
    : model_(model), layout_(layout) {
  const int n = layout.n_unknowns();
  std::vector<Eigen::Triplet<double>> pattern;
  pattern.reserve(static_cast<std::size_t>(n) * (max_neighbours + 1));
  neighbours_.assign(static_cast<std::size_t>(n) * max_neighbours, Neighbour{});
  storage_.resize(static_cast<std::size_t>(n));
  for (int u = 0; u < n; ++u) {
    const CellIndex c = layout.cell_of_unknown[static_cast<std::size_t>(u)];
    storage_[static_cast<std::size_t>(u)] = cell_storage(model, c);
    pattern.emplace_back(u, u, 0.0);
    int k = 0;
    for_each_active_neighbour(model, c, [&](CellIndex nb, double factor) {
      neighbours_[static_cast<std::size_t>(u * max_neighbours + k++)] = {factor, nb, -1};
      const int v = layout.unknown_of_cell[at(nb)];
      if (v >= 0) pattern.emplace_back(u, v, 0.0);
    });
  }
  matrix_.resize(n, n);
  matrix_.setFromTriplets(pattern.begin(), pattern.end());
  matrix_.makeCompressed();
  diagonal_.resize(static_cast<std::size_t>(n));
  for (int u = 0; u < n; ++u) {
    diagonal_[static_cast<std::size_t>(u)] = value_position(matrix_, u, u);
    for (int k = 0; k < max_neighbours; ++k) {
      Neighbour& nb = neighbours_[static_cast<std::size_t>(u * max_neighbours + k)];
      if (!nb.cell.valid()) continue;
      const int v = layout.unknown_of_cell[at(nb.cell)];
      if (v >= 0) nb.value = value_position(matrix_, u, v);
    }
  }
  residual_.setZero(n);
  stress_q_.assign(static_cast<std::size_t>(model.grid.n_cells()), 0.0);
  stress_dq_.assign(stress_q_.size(), 0.0);
  parallel_recharge_ = recharges_with_distinct_cells(model);
  if (model.aquifer.condition != Condition::confined) thickness_.resize(stress_q_.size());
  for (int i = 0; i < model.grid.n_cells(); ++i) {
    const CellIndex c{i};
    if (layout.fixed[at(c)]) fixed_cells_.push_back(c);
  }
}

void FlowSystem::set_step(std::size_t period, bool steady, double dt,
                          std::span<const double> head_old) {
  period_ = period;
  steady_ = steady;
  dt_ = dt;
  head_old_ = head_old;
}

void FlowSystem::set_preconsolidation(std::span<const double> preconsolidation) {
  for (std::size_t u = 0; u < storage_.size(); ++u)
    storage_[u].preconsolidation = preconsolidation[at(layout_.cell_of_unknown[u])];
}

template <bool Confined>
void FlowSystem::assemble_cells(std::span<const double> head) {
  const int n = n_unknowns();
  double* values = matrix_.valuePtr();
  double abs_sum = 0.0;
  double face_sum = 0.0;
  double quantum_sum = 0.0;
  double sum = 0.0;
  const RowStep step = row_step(steady_, dt_, model_.solver.face_thickness);
  auto head_at = [&](CellIndex c) { return head[at(c)]; };
  // The thickness is cached once per cell for both sides of each face.
  auto thickness_at = [&](CellIndex c) { return thickness_[at(c)]; };
#pragma omp parallel for schedule(static) reduction(+ : abs_sum, sum, face_sum, quantum_sum)
  for (int u = 0; u < n; ++u) {
    const CellIndex c = layout_.cell_of_unknown[static_cast<std::size_t>(u)];
    const std::size_t i = at(c);
    const Neighbour* nbs = &neighbours_[static_cast<std::size_t>(u * max_neighbours)];
    const CellRowInput in =
        row_input<Confined>(step, c, head_at, thickness_at, stress_q_[i], stress_dq_[i],
                            storage_[static_cast<std::size_t>(u)], head_old_[i], layout_.area[i]);
    auto faces = neighbour_faces<Confined>(nbs, head_at, thickness_at);
    auto off = [&](int k, double value) {
      if (nbs[k].value >= 0) values[nbs[k].value] = value;
    };
    const CellRow row = cell_row<Confined>(in, faces, off, face_sum);
    values[diagonal_[static_cast<std::size_t>(u)]] = -row.diagonal;
    residual_[u] = row.residual;
    abs_sum += row.budget_terms;
    quantum_sum += row.head_quantum;
    sum += row.residual;
  }
  abs_sum_ = abs_sum;
  face_sum_ = face_sum;
  quantum_sum_ = quantum_sum;
  residual_sum_ = sum;
}

void FlowSystem::add_delay_bed_flows(std::span<const double> head) {
  const std::vector<std::size_t>& cells = delay_beds_->cells();
  const auto n = static_cast<std::ptrdiff_t>(cells.size());
#pragma omp parallel
  {
    std::vector<double> nodes(delay_beds_->nodes());
#pragma omp for schedule(static)
    for (std::ptrdiff_t b = 0; b < n; ++b) {
      const std::size_t i = cells[static_cast<std::size_t>(b)];  // the whole grid: held = grid
      const DelayBedStepResult r =
          delay_beds_->solve(static_cast<std::size_t>(b), head[i], dt_, nodes);
      const double scale = layout_.area[i] * delay_beds_->count(static_cast<std::size_t>(b));
      stress_q_[i] += scale * r.flow;
      stress_dq_[i] += scale * r.flow_slope;
    }
  }
}

void FlowSystem::assemble(std::span<const double> head) {
  const auto n_cells = static_cast<std::ptrdiff_t>(stress_q_.size());
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t i = 0; i < n_cells; ++i) stress_q_[i] = stress_dq_[i] = 0.0;
  add_stress_flows(model_, layout_, period_, head, stress_q_, stress_dq_, parallel_recharge_);
  if (delay_beds_ != nullptr && delay_beds_->active() && !steady_) add_delay_bed_flows(head);

  // Saturated thickness once per cell (not once per face side); a confined model needs none.
  const bool confined = model_.aquifer.condition == Condition::confined;
  if (!confined) {
#pragma omp parallel for schedule(static)
    for (std::ptrdiff_t i = 0; i < n_cells; ++i)
      if (model_.grid.is_active(CellIndex{static_cast<std::int32_t>(i)}))
        thickness_[static_cast<std::size_t>(i)] =
            saturated_thickness(model_, layout_, CellIndex{static_cast<std::int32_t>(i)},
                                head[static_cast<std::size_t>(i)]);
  }
  if (confined)
    assemble_cells<true>(head);
  else
    assemble_cells<false>(head);
  // Fixed heads enter the budget as the net flow of each fixed cell to its neighbours (the
  // same function as the budget's and the distributed engine's).
  double abs_sum = abs_sum_;
  for (CellIndex c : fixed_cells_)
    abs_sum += std::abs(fixed_cell_net_flow(model_, layout_, c, head));
  throughflow_ = 0.5 * abs_sum;
  rounding_floor_ = aquiledger::rounding_floor(abs_sum, face_sum_, quantum_sum_);
}

}  // namespace aquiledger
