#pragma once
// Stored water per unit plan area as an exact piecewise-linear function of head, W(h), split
// into the elastic part (compression of skeleton and water under pressure) and the drainage
// part (specific yield). The change of storage over a step is W(h_new) - W(h_old) evaluated
// from both ends, so a step that crosses the aquifer top is mass-conservative; it is never
// a capacity times a head change. Interbeds (fine-grained beds that equilibrate within a step)
// add their own part, elastic above the preconsolidation head and inelastic below it
// (docs/subsidence.md).
#include <algorithm>
#include <cmath>
#include <span>

#include "solver/model.hpp"

namespace aquiledger {

/// Storage properties of one cell.
struct CellStorage {
  Condition condition = Condition::confined;
  double storativity = 0.0;     ///< -, S = Ss (top - bottom)
  double specific_yield = 0.0;  ///< -
  double top = 0.0;             ///< L (unused by water_table cells)
  double bottom = 0.0;          ///< L
  /// No-delay interbeds: Ske b and Skv b (-), elastic and inelastic skeletal specific storage
  /// times the beds' total thickness; 0 without interbeds.
  double interbed_elastic = 0.0;    ///< -
  double interbed_inelastic = 0.0;  ///< -
  /// L, the preconsolidation head at the start of the step (the lowest head the beds have
  /// reached); fixed within the step, so the kink of W(h) is where the step started it.
  double preconsolidation = 0.0;
};

/// Volumes per unit area (L), relative to a datum that cancels in every difference.
struct StoredWater {
  double elastic = 0.0;             ///< L
  double drainage = 0.0;            ///< L
  double interbed_elastic = 0.0;    ///< L, recoverable
  double interbed_inelastic = 0.0;  ///< L, permanent once released
  double total() const { return elastic + drainage + interbed_elastic + interbed_inelastic; }
};

/// The interbeds' part of W(h) (L) with preconsolidation head pc (L): elastic
/// Ske b max(h - pc, 0) above pc, inelastic Skv b min(h - pc, 0) below it (the
/// preconsolidation-head form of the one-dimensional consolidation of fine-grained beds;
/// Terzaghi, 1925; Jacob, 1940, for the elastic part). Each part is written relative to pc so
/// that the change over a step loses no digits.
inline void add_interbed_water(const CellStorage& s, double h, StoredWater& w) {
  w.interbed_elastic = s.interbed_elastic * std::max(h - s.preconsolidation, 0.0);
  w.interbed_inelastic = s.interbed_inelastic * std::min(h - s.preconsolidation, 0.0);
}

/// The preconsolidation head after a step that ended at head h (L): lowered to h when h went
/// below it, never raised.
inline double lowered_preconsolidation(double preconsolidation, double h) {
  return std::min(preconsolidation, h);
}

/// Lowers every preconsolidation head to the heads at the end of an accepted step (L, the same
/// cells in both); NaN entries (no interbeds, inactive) stay NaN.
inline void lower_preconsolidation(std::span<double> preconsolidation,
                                   std::span<const double> head) {
  for (std::size_t i = 0; i < preconsolidation.size(); ++i)
    if (!std::isnan(preconsolidation[i]) && !std::isnan(head[i]))
      preconsolidation[i] = lowered_preconsolidation(preconsolidation[i], head[i]);
}

/// W(h). Confined: S (h - top). Water table: Sy (h - bottom), continued below the bottom so a
/// dry cell keeps a storage term. Switching: S max(h - top, 0) + Sy (min(h, top) - bottom).
inline StoredWater stored_water(const CellStorage& s, double h) {
  StoredWater w;
  switch (s.condition) {
    case Condition::confined:
      w = {s.storativity * (h - s.top), 0.0};
      break;
    case Condition::water_table:
      w = {0.0, s.specific_yield * (h - s.bottom)};
      break;
    case Condition::switching:
      w = {s.storativity * std::max(h - s.top, 0.0),
           s.specific_yield * (std::min(h, s.top) - s.bottom)};
      break;
  }
  add_interbed_water(s, h, w);
  return w;
}

/// W(h_new) - W(h_old) (L), computed from heads relative to top or bottom so that small
/// changes of large heads lose no digits to cancellation.
inline StoredWater stored_water_change(const CellStorage& s, double h_old, double h_new) {
  StoredWater d;
  switch (s.condition) {
    case Condition::confined:
      d = {s.storativity * (h_new - h_old), 0.0};
      break;
    case Condition::water_table:
      d = {0.0, s.specific_yield * (h_new - h_old)};
      break;
    case Condition::switching:
      d = {s.storativity * (std::max(h_new - s.top, 0.0) - std::max(h_old - s.top, 0.0)),
           s.specific_yield * (std::min(h_new, s.top) - std::min(h_old, s.top))};
      break;
  }
  if (s.interbed_elastic != 0.0 || s.interbed_inelastic != 0.0) {
    const double pc = s.preconsolidation;
    d.interbed_elastic =
        s.interbed_elastic * (std::max(h_new - pc, 0.0) - std::max(h_old - pc, 0.0));
    d.interbed_inelastic =
        s.interbed_inelastic * (std::min(h_new - pc, 0.0) - std::min(h_old - pc, 0.0));
  }
  return d;
}

/// Rates (L3/T, positive = released into the aquifer's flow) at which a cell of plan area
/// `area` (L2) gives water from storage over a step of length dt (T) from h_old to h_new,
/// by mechanism: -area (W(h_new) - W(h_old)) / dt for the elastic and the drainage part.
/// Used by the budget and the cell fields (the Newton row takes the total directly).
struct StorageRelease {
  double elastic = 0.0;             ///< L3/T
  double drainage = 0.0;            ///< L3/T
  double interbed_elastic = 0.0;    ///< L3/T, recoverable
  double interbed_inelastic = 0.0;  ///< L3/T, permanent (never taken back into the beds)
};
inline StorageRelease storage_release_rate(const CellStorage& s, double area, double h_old,
                                           double h_new, double dt) {
  const StoredWater change = stored_water_change(s, h_old, h_new);
  return {-area * change.elastic / dt, -area * change.drainage / dt,
          -area * change.interbed_elastic / dt, -area * change.interbed_inelastic / dt};
}

/// dW/dh (-). At the kink h = top of a switching cell the confined (upper) slope is taken, and
/// likewise the elastic (upper) interbed slope at h = preconsolidation head.
inline double stored_water_slope(const CellStorage& s, double h) {
  const double interbed = h >= s.preconsolidation ? s.interbed_elastic : s.interbed_inelastic;
  switch (s.condition) {
    case Condition::confined:
      return s.storativity + interbed;
    case Condition::water_table:
      return s.specific_yield + interbed;
    case Condition::switching:
      return (h >= s.top ? s.storativity : s.specific_yield) + interbed;
  }
  return 0.0;
}

/// The storage properties of grid cell c of a model; preconsolidation (L) is the cell's
/// preconsolidation head at the step start (unused without interbeds).
inline CellStorage cell_storage(const Model& model, CellIndex c, double preconsolidation = 0.0) {
  const auto i = static_cast<std::size_t>(c.value);
  const Aquifer& aq = model.aquifer;
  CellStorage s;
  s.condition = aq.condition;
  s.bottom = aq.bottom[i];
  s.top = aq.top.empty() ? 0.0 : aq.top[i];
  if (aq.condition != Condition::water_table)
    s.storativity = aq.specific_storage[i] * (s.top - s.bottom);
  if (aq.condition != Condition::confined) s.specific_yield = aq.specific_yield[i];
  if (aq.interbeds) {
    const Interbeds& ib = *aq.interbeds;
    s.interbed_elastic = ib.elastic_storage[i] * ib.thickness[i];
    s.interbed_inelastic = ib.inelastic_storage[i] * ib.thickness[i];
    s.preconsolidation = preconsolidation;
  }
  return s;
}

}  // namespace aquiledger
