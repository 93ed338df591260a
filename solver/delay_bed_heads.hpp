#pragma once
// The state of a run's delay beds: per cell with beds, the head and the preconsolidation head
// of every node of its half-bed (docs/subsidence.md, "Delay beds"). Set from the initial heads
// (the beds start in equilibrium with the aquifer) and the model's preconsolidation heads;
// within a step the node heads are a function of the cell's head (each residual evaluation
// solves the beds from the step's start state); an accepted step moves the nodes to the heads
// of its end and lowers each node's preconsolidation head to the lowest head it reached.
// Kept by checkpoints.
#include <cmath>
#include <cstddef>
#include <span>
#include <vector>

#include "mesh/grid_part.hpp"
#include "solver/delay_bed.hpp"
#include "solver/model.hpp"
#include "solver/storage_function.hpp"

namespace aquiledger {

class DelayBedHeads {
 public:
  DelayBedHeads(const Model& model, const GridPart& part)
      : model_(model), first_(static_cast<std::size_t>(part.first_held())) {
    if (!model.aquifer.interbeds || !model.aquifer.interbeds->delay) return;
    const DelayBeds& d = *model.aquifer.interbeds->delay;
    nodes_ = static_cast<std::size_t>(d.nodes);
    for (std::size_t k = 0; k < part.n_held(); ++k) {
      const std::size_t i = first_ + k;
      if (model.grid.is_active(CellIndex{static_cast<std::int32_t>(i)}) && d.in_cell(i))
        cells_.push_back(k);
    }
    head_.assign(cells_.size() * nodes_, std::nan(""));
    pc_.assign(head_.size(), std::nan(""));
    elastic_.assign(part.n_held(), 0.0);
    inelastic_.assign(part.n_held(), 0.0);
  }
  /// True when the model has delay beds (otherwise every call does nothing).
  bool active() const { return nodes_ > 0; }
  /// The held cells (0-based within the part) that have beds, ascending.
  const std::vector<std::size_t>& cells() const { return cells_; }
  /// The law of the beds of the b-th cell with beds.
  DelayBedLaw law(std::size_t b) const {
    const DelayBeds& d = *model_.aquifer.interbeds->delay;
    const std::size_t i = first_ + cells_[b];
    return {d.thickness[i], d.vertical_k[i], d.elastic_storage[i], d.inelastic_storage[i], d.nodes};
  }
  /// -, number of beds of the b-th cell with beds.
  double count(std::size_t b) const {
    return model_.aquifer.interbeds->delay->count[first_ + cells_[b]];
  }

  /// One step of the b-th cell's beds at aquifer head h (L) over dt (T), from the state at the
  /// start of the step, per unit plan area of ONE bed; the node heads reached go to head_new.
  DelayBedStepResult solve(std::size_t b, double h, double dt, std::span<double> head_new) const {
    return solve_delay_bed_step(law(b), node_span(head_, b), node_span(pc_, b), h, dt, head_new);
  }

  /// A fresh run: nodes at the initial heads (L, per held cell), their preconsolidation heads
  /// from the model as the cell's no-delay beds (never above the initial head).
  void start(std::span<const double> head) {
    const Interbeds* ib = active() ? &*model_.aquifer.interbeds : nullptr;
    for (std::size_t b = 0; b < cells_.size(); ++b) {
      const std::size_t k = cells_[b];
      const double pc = initial_preconsolidation(*ib, first_ + k, head[k]);
      for (std::size_t j = 0; j < nodes_; ++j) {
        head_[b * nodes_ + j] = head[k];
        pc_[b * nodes_ + j] = pc;
      }
    }
  }
  /// An accepted step of length dt (T) ended at head (L, per held cell): the released water
  /// per cell is kept for the step's observers (elastic(), inelastic()), the nodes move to the
  /// step's end and their preconsolidation heads are lowered. A steady step leaves the beds
  /// in equilibrium with the aquifer and releases nothing into the budget (it has no storage).
  void advance(std::span<const double> head, bool steady, double dt) {
    if (!active()) return;
    std::vector<double> next(nodes_);
    for (std::size_t b = 0; b < cells_.size(); ++b) {
      const std::size_t k = cells_[b];
      if (steady) {
        std::fill(next.begin(), next.end(), head[k]);
        elastic_[k] = inelastic_[k] = 0.0;
      } else {
        const DelayBedStepResult r = solve(b, head[k], dt, next);
        elastic_[k] = count(b) * r.elastic;
        inelastic_[k] = count(b) * r.inelastic;
      }
      for (std::size_t j = 0; j < nodes_; ++j) {
        head_[b * nodes_ + j] = next[j];
        pc_[b * nodes_ + j] = lowered_preconsolidation(pc_[b * nodes_ + j], next[j]);
      }
    }
  }
  /// L per unit plan area of the cell (all its beds), per held cell: water released by the
  /// beds over the last accepted step from their elastic and inelastic branches (0 where a
  /// cell has no beds); empty without delay beds.
  std::span<const double> elastic() const { return elastic_; }
  std::span<const double> inelastic() const { return inelastic_; }

  /// The node heads and preconsolidation heads (L, nodes() per cell with beds, cells() order)
  /// a checkpoint keeps.
  const std::vector<double>& node_heads() const { return head_; }
  const std::vector<double>& node_preconsolidation() const { return pc_; }
  std::size_t nodes() const { return nodes_; }
  /// A resumed run: the node state its checkpoint kept (false when it does not fit).
  bool resume(const std::vector<double>& heads, const std::vector<double>& pcs) {
    if (!active()) return true;
    if (heads.size() != head_.size() || pcs.size() != pc_.size()) return false;
    head_ = heads;
    pc_ = pcs;
    return true;
  }

 private:
  std::span<const double> node_span(const std::vector<double>& v, std::size_t b) const {
    return std::span<const double>(v).subspan(b * nodes_, nodes_);
  }
  const Model& model_;
  std::size_t first_ = 0;
  std::size_t nodes_ = 0;
  std::vector<std::size_t> cells_;
  std::vector<double> head_, pc_;            ///< L, per node of each cell with beds
  std::vector<double> elastic_, inelastic_;  ///< L, per held cell, the last accepted step
};

}  // namespace aquiledger
