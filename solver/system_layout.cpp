#include "solver/system_layout.hpp"

#include <algorithm>
#include <cmath>

#include "solver/saturation.hpp"

namespace aquiledger {

SystemLayout make_system_layout(const Model& model) {
  const RectilinearGrid& grid = model.grid;
  const auto n = static_cast<std::size_t>(grid.n_cells());
  SystemLayout layout;
  layout.fixed.assign(n, 0);
  for (const FixedHead& f : model.fixed_heads)
    for (CellIndex c : f.cells)
      if (grid.is_active(c)) layout.fixed[static_cast<std::size_t>(c.value)] = 1;

  layout.unknown_of_cell.assign(n, -1);
  const GridPart held = model.band ? *model.band : GridPart::whole(grid);
  const auto first = held.first_held();
  auto held_array = [&](double value) {
    return CellArray<double>(std::vector<double>(held.n_held(), value), first);
  };
  layout.area = held_array(0.0);
  layout.full_thickness = held_array(std::nan(""));
  layout.smoothing_length = held_array(0.0);
  layout.reduction_length = held_array(0.0);
  const Aquifer& aq = model.aquifer;
  for (auto i = static_cast<std::size_t>(first); i < first + held.n_held(); ++i) {
    const CellIndex c{static_cast<std::int32_t>(i)};
    layout.area[i] = grid.area(c);
    const bool has_top = aq.top.holds(i) && std::isfinite(aq.top[i]);
    if (has_top) layout.full_thickness[i] = aq.top[i] - aq.bottom[i];
    // A water-table cell without a top has no natural thickness scale: use a fixed one.
    const double scale = has_top ? layout.full_thickness[i] : reference_thickness_without_top;
    layout.smoothing_length[i] = smoothing_fraction * scale;
    layout.reduction_length[i] = reduction_fraction * scale;
  }
  for (std::size_t i = 0; i < n; ++i) {
    const CellIndex c{static_cast<std::int32_t>(i)};
    if (!grid.is_active(c) || layout.fixed[i]) continue;
    layout.unknown_of_cell[i] = static_cast<std::int32_t>(layout.cell_of_unknown.size());
    layout.cell_of_unknown.push_back(c);
  }
  return layout;
}

UnknownRange owned_unknowns(const SystemLayout& layout, const GridPart& part) {
  const auto& cells = layout.cell_of_unknown;
  auto position = [&](std::int32_t cell) {
    return static_cast<int>(std::lower_bound(cells.begin(), cells.end(), CellIndex{cell}) -
                            cells.begin());
  };
  return {position(part.first_owned()), position(part.end_owned())};
}

ValueSlope saturated_thickness(const Model& model, const SystemLayout& layout, CellIndex c,
                               double head) {
  const auto i = static_cast<std::size_t>(c.value);
  const Aquifer& aq = model.aquifer;
  const double eps = layout.smoothing_length[i];
  switch (aq.condition) {
    case Condition::confined:
      return {layout.full_thickness[i], 0.0};
    case Condition::water_table:
      return smooth_ramp(head - aq.bottom[i], eps);
    case Condition::switching: {
      const double full = layout.full_thickness[i];
      const double top = aq.top[i];
      if (head >= top) return {full, 0.0};
      if (head > top - eps) {
        // Mirror of the base ramp: C1 join to the constant full thickness at the top.
        const ValueSlope r = smooth_ramp(top - head, eps);
        return {full - r.value, r.slope};
      }
      return smooth_ramp(head - aq.bottom[i], eps);
    }
  }
  return {0.0, 0.0};
}

}  // namespace aquiledger
