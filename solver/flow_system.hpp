#pragma once
// The discrete mass balance of every unknown cell and its exact Jacobian. The matrix pattern
// (5-point stencil over the unknowns) is built once; each assembly only rewrites values.
#include <Eigen/SparseCore>
#include <cstddef>
#include <cstdint>
#include <span>
#include <vector>

#include "solver/cell_balance.hpp"
#include "solver/delay_bed_heads.hpp"
#include "solver/model.hpp"
#include "solver/storage_function.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

using SparseMatrix = Eigen::SparseMatrix<double, Eigen::ColMajor, int>;

class FlowSystem {
 public:
  FlowSystem(const Model& model, const SystemLayout& layout);

  /// Fixes the step: stresses of `period`, storage from head_old (per grid cell) over dt (T),
  /// or no storage when steady.
  void set_step(std::size_t period, bool steady, double dt, std::span<const double> head_old);
  /// The interbeds' preconsolidation heads at the step start (L, per grid cell).
  void set_preconsolidation(std::span<const double> preconsolidation);
  /// The delay beds' state at the step start (null: none); in a transient step each assembly
  /// solves them at the assembled heads and adds their flow and its exact slope to the cells'
  /// stresses (solver/delay_bed_heads.hpp).
  void set_delay_beds(const DelayBedHeads* beds) { delay_beds_ = beds; }

  /// Evaluates the residual R (L3/T per unknown: face flows + stresses + storage release
  /// rate) and the matrix -dR/dh at head (per grid cell; fixed cells hold their heads).
  void assemble(std::span<const double> head);

  /// -dR/dh (L2/T); symmetric positive definite for a confined model.
  const SparseMatrix& matrix() const { return matrix_; }
  const Eigen::VectorXd& residual() const { return residual_; }
  /// The matrix's diagonal entry of unknown u.
  double diagonal(int u) const {
    return matrix_.valuePtr()[diagonal_[static_cast<std::size_t>(u)]];
  }
  /// L3/T: half the sum of the absolute values of every budget term (the step's (in+out)/2).
  double throughflow() const { return throughflow_; }
  /// L3/T: the imbalance rounding alone can leave, from the sizes of all terms including the
  /// flows between unknowns; tolerances below it cannot be met and are not asked for.
  double rounding_floor() const { return rounding_floor_; }
  /// L3/T: sum of the residuals (the step's in - out).
  double residual_sum() const { return residual_sum_; }
  /// True when the Jacobian is symmetric (confined model: no upstream weighting).
  bool symmetric() const { return model_.aquifer.condition == Condition::confined; }
  int n_unknowns() const { return layout_.n_unknowns(); }
  const SystemLayout& layout() const { return layout_; }
  const Model& model() const { return model_; }

 private:
  static constexpr int max_neighbours = max_cell_neighbours;
  struct Neighbour {      // 16 bytes: the double first, so no padding
    double factor = 0.0;  ///< see Face::factor
    CellIndex cell;
    int value = -1;  ///< position of the (row, neighbour) entry in the matrix values; -1 if fixed
  };
  static_assert(sizeof(Neighbour) == 16);

  const Model& model_;
  const SystemLayout& layout_;
  SparseMatrix matrix_;
  Eigen::VectorXd residual_;
  std::vector<Neighbour> neighbours_;  ///< max_neighbours per unknown, unused slots have no cell
  std::vector<int> diagonal_;          ///< position of each diagonal entry in the matrix values
  std::vector<CellStorage> storage_;   ///< per unknown
  std::vector<double> stress_q_, stress_dq_;     ///< per grid cell
  std::vector<std::uint8_t> parallel_recharge_;  ///< per recharge: cells distinct
  std::vector<ValueSlope> thickness_;            ///< L and -, per grid cell at the assembled heads
  double abs_sum_ = 0.0, face_sum_ = 0.0, quantum_sum_ = 0.0;  ///< L3/T, sums of the cell loop
  /// The loop over unknowns: residual, matrix values, budget sums.
  template <bool Confined>
  void assemble_cells(std::span<const double> head);
  /// The delay beds' flows and slopes at head, added to stress_q_ and stress_dq_.
  void add_delay_bed_flows(std::span<const double> head);
  /// Fixed cells, for the fixed-head throughflow.
  std::vector<CellIndex> fixed_cells_;
  std::span<const double> head_old_;
  const DelayBedHeads* delay_beds_ = nullptr;
  std::size_t period_ = 0;
  bool steady_ = true;
  double dt_ = 1.0;
  double throughflow_ = 0.0;
  double residual_sum_ = 0.0;
  double rounding_floor_ = 0.0;
};

}  // namespace aquiledger
