#include "postproc/cell_fields.hpp"

#include <cmath>

#include "postproc/land_surface.hpp"
#include "solver/face_table.hpp"
#include "solver/storage_function.hpp"

namespace aquiledger {

namespace {

void fill_heads(const Model& model, const SystemLayout& layout, const GridPart& part,
                CellValues initial_head, CellValues head, CellFields& f) {
  const double nan = std::nan("");
  const auto first = static_cast<std::size_t>(part.first_owned());
  for (std::size_t k = 0; k < f.head.size(); ++k) {
    const std::size_t i = first + k;
    const CellIndex c{static_cast<std::int32_t>(i)};
    if (!model.grid.is_active(c)) {
      f.head[k] = f.drawdown[k] = f.saturated_thickness[k] = f.state[k] = nan;
      continue;
    }
    f.head[k] = head[i];
    f.drawdown[k] = initial_head[i] - head[i];
    f.saturated_thickness[k] = saturated_thickness(model, layout, c, head[i]).value;
    f.state[k] = cell_state(model, c, head[i]);
  }
}

/// Face flows positive east and north; zero across the grid edge or into inactive cells.
void fill_face_flows(const Model& model, const SystemLayout& layout, const GridPart& part,
                     CellValues head, CellFields& f) {
  const RectilinearGrid& g = model.grid;
  const auto first = static_cast<std::size_t>(part.first_owned());
  for (int r = part.owned.first; r < part.owned.end(); ++r)
    for (int col = 0; col < g.n_cols(); ++col) {
      const CellIndex c = g.cell(r, col);
      const std::size_t i = at(c) - first;
      if (!g.is_active(c)) {
        f.flow_east[i] = f.flow_north[i] = std::nan("");
        continue;
      }
      f.flow_east[i] = f.flow_north[i] = 0.0;
      if (col + 1 < g.n_cols() && g.is_active(g.cell(r, col + 1))) {
        const CellIndex e = g.cell(r, col + 1);
        // Flow into e from c is the flow toward the east.
        f.flow_east[i] =
            face_flow(model, layout, e, c, face_factor(model, c, e, true), head[at(e)], head[at(c)])
                .q;
      }
      if (r > 0 && g.is_active(g.cell(r - 1, col))) {
        const CellIndex nn = g.cell(r - 1, col);
        f.flow_north[i] = face_flow(model, layout, nn, c, face_factor(model, nn, c, false),
                                    head[at(nn)], head[at(c)])
                              .q;
      }
    }
}

}  // namespace

int cell_state(const Model& model, CellIndex c, double h) {
  const Aquifer& aq = model.aquifer;
  const std::size_t i = at(c);
  if (aq.condition == Condition::confined) return 2;
  if (h <= aq.bottom[i]) return 0;
  if (aq.condition == Condition::switching && h >= aq.top[i]) return 2;
  return 1;
}

CellStateCounts count_cell_states(const Model& model, const GridPart& part, CellValues head) {
  CellStateCounts n;
  for (std::int32_t i = part.first_owned(); i < part.end_owned(); ++i) {
    const CellIndex c{i};
    if (!model.grid.is_active(c)) continue;
    switch (cell_state(model, c, head[at(c)])) {
      case 0:
        ++n.dry;
        break;
      case 1:
        ++n.water_table;
        break;
      default:
        ++n.confined;
    }
  }
  return n;
}

CellFields initial_cell_fields(const Model& model, const SystemLayout& layout,
                               std::span<const double> initial_head) {
  return initial_cell_fields(model, layout, GridPart::whole(model.grid), initial_head);
}

void update_cell_fields(const Model& model, const SystemLayout& layout, bool steady, double dt,
                        std::span<const double> initial_head, std::span<const double> head_old,
                        std::span<const double> head_new, CellFields& f,
                        std::span<const double> preconsolidation,
                        std::span<const double> delay_elastic,
                        std::span<const double> delay_inelastic) {
  update_cell_fields(model, layout, GridPart::whole(model.grid), steady, dt, initial_head, head_old,
                     head_new, preconsolidation, f, delay_elastic, delay_inelastic);
}

CellFields initial_cell_fields(const Model& model, const SystemLayout& layout, const GridPart& part,
                               CellValues initial_head) {
  const std::size_t n = part.n_owned();
  const auto first = static_cast<std::size_t>(part.first_owned());
  CellFields f;
  for (auto* v : {&f.head, &f.drawdown, &f.saturated_thickness, &f.state, &f.storage_rate,
                  &f.storage_skeleton_rate, &f.storage_water_rate, &f.storage_elastic_rate,
                  &f.storage_drainage_rate, &f.compaction, &f.flow_east, &f.flow_north})
    v->assign(n, 0.0);
  fill_heads(model, layout, part, initial_head, initial_head, f);
  for (std::size_t k = 0; k < n; ++k)
    if (!model.grid.is_active(CellIndex{static_cast<std::int32_t>(first + k)}))
      for (auto* v : {&f.storage_rate, &f.storage_skeleton_rate, &f.storage_water_rate,
                      &f.storage_elastic_rate, &f.storage_drainage_rate, &f.compaction})
        (*v)[k] = std::nan("");
  fill_face_flows(model, layout, part, initial_head, f);
  f.depth_to_water = depth_to_water(model, part, initial_head);
  if (model.aquifer.interbeds) {
    for (auto* v : {&f.interbed_elastic_compaction, &f.interbed_inelastic_compaction, &f.subsidence,
                    &f.preconsolidation_head})
      v->assign(n, std::nan(""));
    for (std::size_t k = 0; k < n; ++k) {
      if (!model.grid.is_active(CellIndex{static_cast<std::int32_t>(first + k)})) continue;
      f.interbed_elastic_compaction[k] = f.interbed_inelastic_compaction[k] = 0.0;
      f.subsidence[k] = 0.0;
      f.preconsolidation_head[k] =
          initial_preconsolidation(*model.aquifer.interbeds, first + k, initial_head[first + k]);
    }
  }
  return f;
}

void update_cell_fields(const Model& model, const SystemLayout& layout, const GridPart& part,
                        bool steady, double dt, CellValues initial_head, CellValues head_old,
                        CellValues head_new, CellValues preconsolidation, CellFields& f,
                        CellValues delay_elastic, CellValues delay_inelastic) {
  fill_heads(model, layout, part, initial_head, head_new, f);
  const bool delay = !delay_elastic.values().empty();
  const bool beds = model.aquifer.interbeds.has_value();
  const bool split = model.aquifer.elastic_split();
  const auto first = static_cast<std::size_t>(part.first_owned());
  for (std::size_t k = 0; k < f.head.size(); ++k) {
    const std::size_t i = first + k;
    const CellIndex c{static_cast<std::int32_t>(i)};
    if (!model.grid.is_active(c)) continue;
    double elastic = 0.0, drainage = 0.0;  // L3/T released
    double bed_elastic = 0.0, bed_inelastic = 0.0;
    const double pc = beds ? preconsolidation[i] : 0.0;
    // Fixed cells and steady steps have no storage term.
    if (!steady && !layout.fixed[i]) {
      const StorageRelease release = storage_release_rate(
          cell_storage(model, c, pc), layout.area[i], head_old[i], head_new[i], dt);
      elastic = release.elastic;
      drainage = release.drainage;
      bed_elastic = release.interbed_elastic;
      bed_inelastic = release.interbed_inelastic;
      if (delay) {  // delay beds: released over the step per unit area, as a rate
        bed_elastic += delay_elastic[i] * layout.area[i] / dt;
        bed_inelastic += delay_inelastic[i] * layout.area[i] / dt;
      }
    }
    const double share = split ? model.aquifer.skeleton_share[i] : 1.0;
    f.storage_rate[k] = elastic + drainage + bed_elastic + bed_inelastic;
    f.storage_skeleton_rate[k] = split ? share * elastic : 0.0;
    f.storage_water_rate[k] = split ? (1.0 - share) * elastic : 0.0;
    f.storage_elastic_rate[k] = split ? 0.0 : elastic;
    f.storage_drainage_rate[k] = drainage;
    // Skeleton release per unit area is compaction; with Ss given directly the whole elastic
    // release is used, an upper bound on the skeleton's share.
    if (!steady) f.compaction[k] += share * elastic * dt / layout.area[i];
    if (beds) {
      // Water squeezed from the beds per unit area is their compaction (no-delay and delay
      // beds).
      if (!steady) {
        f.interbed_elastic_compaction[k] += bed_elastic * dt / layout.area[i];
        f.interbed_inelastic_compaction[k] += bed_inelastic * dt / layout.area[i];
      }
      f.subsidence[k] =
          f.compaction[k] + f.interbed_elastic_compaction[k] + f.interbed_inelastic_compaction[k];
      f.preconsolidation_head[k] = lowered_preconsolidation(pc, head_new[i]);
    }
  }
  fill_face_flows(model, layout, part, head_new, f);
  f.depth_to_water = depth_to_water(model, part, head_new);
}

}  // namespace aquiledger
