#pragma once
// Stored water per unit plan area as an exact piecewise-linear function of head, W(h), split
// into the elastic part (compression of skeleton and water under pressure) and the drainage
// part (specific yield). The change of storage over a step is W(h_new) - W(h_old) evaluated
// from both ends, so a step that crosses the aquifer top is mass-conservative; it is never
// a capacity times a head change.
#include <algorithm>

#include "solver/model.hpp"

namespace aquiledger {

/// Storage properties of one cell.
struct CellStorage {
  Condition condition = Condition::confined;
  double storativity = 0.0;     ///< -, S = Ss (top - bottom)
  double specific_yield = 0.0;  ///< -
  double top = 0.0;             ///< L (unused by water_table cells)
  double bottom = 0.0;          ///< L
};

/// Volumes per unit area (L), relative to a datum that cancels in every difference.
struct StoredWater {
  double elastic = 0.0;   ///< L
  double drainage = 0.0;  ///< L
  double total() const { return elastic + drainage; }
};

/// W(h). Confined: S (h - top). Water table: Sy (h - bottom), continued below the bottom so a
/// dry cell keeps a storage term. Switching: S max(h - top, 0) + Sy (min(h, top) - bottom).
inline StoredWater stored_water(const CellStorage& s, double h) {
  switch (s.condition) {
    case Condition::confined:
      return {s.storativity * (h - s.top), 0.0};
    case Condition::water_table:
      return {0.0, s.specific_yield * (h - s.bottom)};
    case Condition::switching:
      return {s.storativity * std::max(h - s.top, 0.0),
              s.specific_yield * (std::min(h, s.top) - s.bottom)};
  }
  return {};
}

/// W(h_new) - W(h_old) (L), computed from heads relative to top or bottom so that small
/// changes of large heads lose no digits to cancellation.
inline StoredWater stored_water_change(const CellStorage& s, double h_old, double h_new) {
  switch (s.condition) {
    case Condition::confined:
      return {s.storativity * (h_new - h_old), 0.0};
    case Condition::water_table:
      return {0.0, s.specific_yield * (h_new - h_old)};
    case Condition::switching:
      return {s.storativity * (std::max(h_new - s.top, 0.0) - std::max(h_old - s.top, 0.0)),
              s.specific_yield * (std::min(h_new, s.top) - std::min(h_old, s.top))};
  }
  return {};
}

/// Rates (L3/T, positive = released into the aquifer's flow) at which a cell of plan area
/// `area` (L2) gives water from storage over a step of length dt (T) from h_old to h_new,
/// by mechanism: -area (W(h_new) - W(h_old)) / dt for the elastic and the drainage part.
/// Used by the budget and the cell fields (the Newton row takes the total directly).
struct StorageRelease {
  double elastic = 0.0;   ///< L3/T
  double drainage = 0.0;  ///< L3/T
};
inline StorageRelease storage_release_rate(const CellStorage& s, double area, double h_old,
                                           double h_new, double dt) {
  const StoredWater change = stored_water_change(s, h_old, h_new);
  return {-area * change.elastic / dt, -area * change.drainage / dt};
}

/// dW/dh (-). At the kink h = top of a switching cell the confined (upper) slope is taken.
inline double stored_water_slope(const CellStorage& s, double h) {
  switch (s.condition) {
    case Condition::confined:
      return s.storativity;
    case Condition::water_table:
      return s.specific_yield;
    case Condition::switching:
      return h >= s.top ? s.storativity : s.specific_yield;
  }
  return 0.0;
}

/// The storage properties of grid cell c of a model.
inline CellStorage cell_storage(const Model& model, CellIndex c) {
  const auto i = static_cast<std::size_t>(c.value);
  const Aquifer& aq = model.aquifer;
  CellStorage s;
  s.condition = aq.condition;
  s.bottom = aq.bottom[i];
  s.top = i < aq.top.size() ? aq.top[i] : 0.0;
  if (aq.condition != Condition::water_table)
    s.storativity = aq.specific_storage[i] * (s.top - s.bottom);
  if (aq.condition != Condition::confined) s.specific_yield = aq.specific_yield[i];
  return s;
}

}  // namespace aquiledger
