#include "postproc/cell_fields.hpp"

#include <cmath>

#include "solver/face_table.hpp"
#include "solver/storage_function.hpp"

namespace aquiledger {

namespace {

std::size_t at(CellIndex c) { return static_cast<std::size_t>(c.value); }

/// 0 dry (h <= bottom), 1 water table, 2 confined (a confined model is confined everywhere).
double cell_state(const Model& model, std::size_t i, double h) {
  const Aquifer& aq = model.aquifer;
  if (aq.condition == Condition::confined) return 2.0;
  if (h <= aq.bottom[i]) return 0.0;
  if (aq.condition == Condition::switching && h >= aq.top[i]) return 2.0;
  return 1.0;
}

void fill_heads(const Model& model, const SystemLayout& layout,
                std::span<const double> initial_head, std::span<const double> head, CellFields& f) {
  const double nan = std::nan("");
  for (std::size_t i = 0; i < f.head.size(); ++i) {
    const CellIndex c{static_cast<std::int32_t>(i)};
    if (!model.grid.is_active(c)) {
      f.head[i] = f.drawdown[i] = f.saturated_thickness[i] = f.state[i] = nan;
      continue;
    }
    f.head[i] = head[i];
    f.drawdown[i] = initial_head[i] - head[i];
    f.saturated_thickness[i] = saturated_thickness(model, layout, c, head[i]).value;
    f.state[i] = cell_state(model, i, head[i]);
  }
}

/// Face flows positive east and north; zero across the grid edge or into inactive cells.
void fill_face_flows(const Model& model, const SystemLayout& layout, std::span<const double> head,
                     CellFields& f) {
  const RectilinearGrid& g = model.grid;
  for (int r = 0; r < g.n_rows(); ++r)
    for (int col = 0; col < g.n_cols(); ++col) {
      const CellIndex c = g.cell(r, col);
      const std::size_t i = at(c);
      if (!g.is_active(c)) {
        f.flow_east[i] = f.flow_north[i] = std::nan("");
        continue;
      }
      f.flow_east[i] = f.flow_north[i] = 0.0;
      if (col + 1 < g.n_cols() && g.is_active(g.cell(r, col + 1))) {
        const CellIndex e = g.cell(r, col + 1);
        // Flow into e from c is the flow toward the east.
        f.flow_east[i] =
            face_flow(model, layout, e, c, face_factor(model, c, e, true), head[at(e)], head[i]).q;
      }
      if (r > 0 && g.is_active(g.cell(r - 1, col))) {
        const CellIndex nn = g.cell(r - 1, col);
        f.flow_north[i] =
            face_flow(model, layout, nn, c, face_factor(model, nn, c, false), head[at(nn)], head[i])
                .q;
      }
    }
}

}  // namespace

CellFields initial_cell_fields(const Model& model, const SystemLayout& layout,
                               std::span<const double> initial_head) {
  const auto n = static_cast<std::size_t>(model.grid.n_cells());
  CellFields f;
  for (auto* v : {&f.head, &f.drawdown, &f.saturated_thickness, &f.state, &f.storage_rate,
                  &f.storage_skeleton_rate, &f.storage_water_rate, &f.storage_elastic_rate,
                  &f.storage_drainage_rate, &f.compaction, &f.flow_east, &f.flow_north})
    v->assign(n, 0.0);
  fill_heads(model, layout, initial_head, initial_head, f);
  for (std::size_t i = 0; i < n; ++i)
    if (!model.grid.is_active(CellIndex{static_cast<std::int32_t>(i)}))
      for (auto* v : {&f.storage_rate, &f.storage_skeleton_rate, &f.storage_water_rate,
                      &f.storage_elastic_rate, &f.storage_drainage_rate, &f.compaction})
        (*v)[i] = std::nan("");
  fill_face_flows(model, layout, initial_head, f);
  return f;
}

void update_cell_fields(const Model& model, const SystemLayout& layout, bool steady, double dt,
                        std::span<const double> initial_head, std::span<const double> head_old,
                        std::span<const double> head_new, CellFields& f) {
  fill_heads(model, layout, initial_head, head_new, f);
  const bool split = model.aquifer.elastic_split();
  for (std::size_t i = 0; i < f.head.size(); ++i) {
    const CellIndex c{static_cast<std::int32_t>(i)};
    if (!model.grid.is_active(c)) continue;
    double elastic = 0.0, drainage = 0.0;  // L3/T released
    // Fixed cells and steady steps have no storage term.
    if (!steady && !layout.fixed[i]) {
      const StoredWater change =
          stored_water_change(cell_storage(model, c), head_old[i], head_new[i]);
      elastic = -layout.area[i] * change.elastic / dt;
      drainage = -layout.area[i] * change.drainage / dt;
    }
    const double share = split ? model.aquifer.skeleton_share[i] : 1.0;
    f.storage_rate[i] = elastic + drainage;
    f.storage_skeleton_rate[i] = split ? share * elastic : 0.0;
    f.storage_water_rate[i] = split ? (1.0 - share) * elastic : 0.0;
    f.storage_elastic_rate[i] = split ? 0.0 : elastic;
    f.storage_drainage_rate[i] = drainage;
    // Skeleton release per unit area is compaction; with Ss given directly the whole elastic
    // release is used, an upper bound on the skeleton's share.
    if (!steady) f.compaction[i] += share * elastic * dt / layout.area[i];
  }
  fill_face_flows(model, layout, head_new, f);
}

}  // namespace aquiledger
