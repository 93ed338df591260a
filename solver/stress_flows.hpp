#pragma once
// Every stress except fixed heads and storage: wells, recharge, rivers, drains, external
// heads, evapotranspiration and leakage. One place evaluates them, for the Newton system
// (flow and derivative per cell) and for the budget (in, out per feature).
#include <cstddef>
#include <cstdint>
#include <span>
#include <string>
#include <vector>

#include "mesh/grid_part.hpp"
#include "solver/model.hpp"
#include "solver/saturation.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

enum class FeatureKind {
  well,
  fixed_head,
  recharge,
  river,
  drain,
  external_head,
  evapotranspiration,
  leakage
};

/// "well", "fixed_head", ... as written in budget_features.csv.
const char* feature_kind_label(FeatureKind kind);

struct FeatureRef {
  std::string name;
  FeatureKind kind;
  std::size_t index;  ///< position in the model's list of that kind
};

/// Every named feature in a fixed order: wells, fixed heads, recharges, rivers, drains,
/// external heads, evapotranspiration, leakage.
std::vector<FeatureRef> list_features(const Model& model);

/// Rates of one feature over a step (L3/T, both positive): in = into the aquifer.
struct FeatureFlow {
  double in = 0.0;
  double out = 0.0;
  /// L3/T of withdrawal not delivered because the cell ran dry (wells, and recharge with a
  /// negative rate, which is reduced the same way)
  double shortfall = 0.0;
};

/// Adds each stress's flow into the aquifer (L3/T) and its head derivative (L2/T) to q and
/// dq_dh, both indexed by grid cell. Fixed-head and inactive cells are skipped.
void add_stress_flows(const Model& model, const SystemLayout& layout, std::size_t period,
                      std::span<const double> head, std::span<double> q, std::span<double> dq_dh);

/// As above; the cell loop of every recharge flagged in parallel_recharge (one flag per
/// model.recharges entry, from recharges_with_distinct_cells) runs with OpenMP threads.
void add_stress_flows(const Model& model, const SystemLayout& layout, std::size_t period,
                      std::span<const double> head, std::span<double> q, std::span<double> dq_dh,
                      std::span<const std::uint8_t> parallel_recharge);

/// As above over the cells the part owns only; head must hold them, q and dq_dh cover them.
void add_stress_flows(const Model& model, const SystemLayout& layout, std::size_t period,
                      const GridPart& part, CellValues head, CellWindow<double> q,
                      CellWindow<double> dq_dh, std::span<const std::uint8_t> parallel_recharge);

/// 1 for each recharge whose cells are all distinct (so that its cells can be updated
/// concurrently), else 0.
std::vector<std::uint8_t> recharges_with_distinct_cells(const Model& model);

/// The flow of one feature into one cell (L3/T) and its head derivative (L2/T).
struct CellStressFlow {
  CellIndex cell;
  ValueSlope q;
};
/// The cells of entry `feature` of list_features(model) that carry its stress, with their
/// flows at head (per grid cell); empty for a fixed head.
std::vector<CellStressFlow> feature_cell_flows(const Model& model, const SystemLayout& layout,
                                               std::size_t period, std::span<const double> head,
                                               std::size_t feature);

/// Fills flows[k] for every entry k of list_features(model) that is not a fixed head
/// (fixed-head entries are left untouched).
void stress_flows_by_feature(const Model& model, const SystemLayout& layout, std::size_t period,
                             std::span<const double> head, std::span<FeatureFlow> flows);
/// As above, summing the cells the part owns only (head must hold them).
void stress_flows_by_feature(const Model& model, const SystemLayout& layout, std::size_t period,
                             const GridPart& part, CellValues head, std::span<FeatureFlow> flows);

}  // namespace aquiledger
