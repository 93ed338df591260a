#pragma once
// The preconsolidation heads of a run's interbeds: set from the model and the initial heads,
// lowered to the heads at the end of every accepted step, kept by checkpoints. The same for
// both engines; the values are the stepper's own cells (the whole grid or the rows a part
// holds), NaN where a cell is inactive.
#include <cmath>
#include <cstddef>
#include <span>
#include <vector>

#include "mesh/grid_part.hpp"
#include "solver/model.hpp"
#include "solver/storage_function.hpp"

namespace aquiledger {

class PreconsolidationHeads {
 public:
  PreconsolidationHeads(const Model& model, const GridPart& part)
      : model_(model), first_(static_cast<std::size_t>(part.first_held())) {
    if (model.aquifer.interbeds) values_.assign(part.n_held(), std::nan(""));
  }
  /// True when the model has interbeds (otherwise every call does nothing).
  bool active() const { return !values_.empty(); }
  /// L, at the start of the next step, per held cell (empty without interbeds).
  std::span<const double> values() const { return values_; }

  /// A fresh run: from the model's initial preconsolidation heads (or offsets) and the
  /// initial heads (L, per held cell), never above them.
  void start(std::span<const double> head) {
    if (!active()) return;
    const Interbeds& ib = *model_.aquifer.interbeds;
    for (std::size_t k = 0; k < values_.size(); ++k)
      values_[k] =
          std::isnan(head[k]) ? std::nan("") : initial_preconsolidation(ib, first_ + k, head[k]);
  }
  /// A resumed run: the values its checkpoint kept (ignored when they do not fit).
  bool resume(const std::vector<double>& kept) {
    if (!active()) return true;
    if (kept.size() != values_.size()) return false;
    values_ = kept;
    return true;
  }
  /// An accepted step ended at head (L, per held cell).
  void lower(std::span<const double> head) { lower_preconsolidation(values_, head); }

 private:
  const Model& model_;
  std::size_t first_ = 0;
  std::vector<double> values_;
};

}  // namespace aquiledger
