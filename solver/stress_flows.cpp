#include "solver/stress_flows.hpp"

#include <cmath>
#include <cstdint>
#include <span>

#include "solver/stress_kernels.hpp"

namespace aquiledger {

namespace {

/// Calls visit(k, cell, flow) for every cell of every stress feature, k being the feature's
/// position in list_features(model). Inactive and fixed-head cells carry no stress.
/// Recharges flagged in parallel_recharge (cells known distinct, and visit safe to call
/// concurrently for distinct cells) loop over their cells with OpenMP.
/// Only the cells the part owns are visited; head must hold them.
template <class Visit>
void visit_stress_flows(const Model& model, const SystemLayout& layout, std::size_t period,
                        CellValues head, const GridPart& part, Visit&& visit,
                        std::span<const std::uint8_t> parallel_recharge = {}) {
  const RectilinearGrid& grid = model.grid;
  const bool reducible = model.aquifer.condition != Condition::confined;
  auto carries_stress = [&](CellIndex c) {
    return part.owns(c) && grid.is_active(c) && layout.fixed[at(c)] == 0;
  };
  std::size_t k = 0;

  for (const Well& well : model.wells) {
    if (carries_stress(well.cell)) {
      const CellIndex c = well.cell;
      const ValueSlope b = saturated_thickness(model, layout, c, head[at(c)]);
      visit(k, c, well_flow(well.rate.at(period, 0), b, layout.reduction_length[at(c)], reducible));
    }
    ++k;
  }
  k += model.fixed_heads.size();

  for (std::size_t f = 0; f < model.recharges.size(); ++f) {
    const Recharge& recharge = model.recharges[f];
    const auto n_cells = static_cast<std::ptrdiff_t>(recharge.cells.size());
    const bool parallel = f < parallel_recharge.size() && parallel_recharge[f] != 0;
    const std::vector<double>& rates = recharge.rate.table(period);
#pragma omp parallel for schedule(static) if (parallel)
    for (std::ptrdiff_t jj = 0; jj < n_cells; ++jj) {
      const auto j = static_cast<std::size_t>(jj);
      const CellIndex c = recharge.cells[j];
      if (!carries_stress(c)) continue;
      const ValueSlope b = saturated_thickness(model, layout, c, head[at(c)]);
      const double rate = rates.size() == 1 ? rates[0] : rates[j];
      visit(k, c,
            recharge_flow(rate, layout.area[at(c)], b, layout.reduction_length[at(c)], reducible));
    }
    ++k;
  }

  // The features with a cells list: each cell's flow from its kernel in solver/stress_kernels.hpp.
  auto each_cell = [&](std::span<const auto> features, auto&& flow) {
    for (const auto& feature : features) {
      for (std::size_t j = 0; j < feature.cells.size(); ++j) {
        const CellIndex c = feature.cells[j];
        if (carries_stress(c)) visit(k, c, StressFlow{flow(feature, j, c)});
      }
      ++k;
    }
  };
  each_cell(
      std::span<const River>(model.rivers), [&](const River& river, std::size_t j, CellIndex c) {
        return river_flow(head[at(c)], river.stage.at(period, j), river.bed_bottom.at(period, j),
                          river.conductance.at(period, j), layout.smoothing_length[at(c)]);
      });
  each_cell(std::span<const Drain>(model.drains),
            [&](const Drain& drain, std::size_t j, CellIndex c) {
              return drain_flow(head[at(c)], drain.elevation.at(period, j),
                                drain.conductance.at(period, j), layout.smoothing_length[at(c)]);
            });
  each_cell(std::span<const ExternalHead>(model.external_heads),
            [&](const ExternalHead& external, std::size_t j, CellIndex c) {
              return external_head_flow(head[at(c)], external.head.at(period, j),
                                        external.conductance.at(period, j));
            });
  each_cell(std::span<const Evapotranspiration>(model.evapotranspiration),
            [&](const Evapotranspiration& et, std::size_t j, CellIndex c) {
              return evapotranspiration_flow(head[at(c)], et.surface.at(period, j),
                                             et.max_rate.at(period, j),
                                             et.extinction_depth.at(period, j), layout.area[at(c)],
                                             layout.smoothing_length[at(c)]);
            });
  if (model.leakage) {
    const bool has_top = !model.aquifer.top.empty();
    each_cell(std::span<const Leakage>(&*model.leakage, 1),
              [&](const Leakage& leakage, std::size_t j, CellIndex c) {
                const double top = has_top ? model.aquifer.top[at(c)] : std::nan("");
                return leakage_flow(head[at(c)], leakage.source_head.at(period, j), top,
                                    leakage.leakance.at(period, j), layout.area[at(c)],
                                    layout.smoothing_length[at(c)]);
              });
  }
}

}  // namespace

const char* feature_kind_label(FeatureKind kind) {
  switch (kind) {
    case FeatureKind::well:
      return "well";
    case FeatureKind::fixed_head:
      return "fixed_head";
    case FeatureKind::recharge:
      return "recharge";
    case FeatureKind::river:
      return "river";
    case FeatureKind::drain:
      return "drain";
    case FeatureKind::external_head:
      return "external_head";
    case FeatureKind::evapotranspiration:
      return "evapotranspiration";
    case FeatureKind::leakage:
      return "leakage";
  }
  return "unknown";
}

std::vector<FeatureRef> list_features(const Model& model) {
  std::vector<FeatureRef> features;
  auto add_all = [&features](const auto& list, FeatureKind kind) {
    for (std::size_t i = 0; i < list.size(); ++i) features.push_back({list[i].name, kind, i});
  };
  add_all(model.wells, FeatureKind::well);
  add_all(model.fixed_heads, FeatureKind::fixed_head);
  add_all(model.recharges, FeatureKind::recharge);
  add_all(model.rivers, FeatureKind::river);
  add_all(model.drains, FeatureKind::drain);
  add_all(model.external_heads, FeatureKind::external_head);
  add_all(model.evapotranspiration, FeatureKind::evapotranspiration);
  if (model.leakage) features.push_back({model.leakage->name, FeatureKind::leakage, 0});
  return features;
}

void add_stress_flows(const Model& model, const SystemLayout& layout, std::size_t period,
                      std::span<const double> head, std::span<double> q, std::span<double> dq_dh) {
  add_stress_flows(model, layout, period, head, q, dq_dh, {});
}

void add_stress_flows(const Model& model, const SystemLayout& layout, std::size_t period,
                      std::span<const double> head, std::span<double> q, std::span<double> dq_dh,
                      std::span<const std::uint8_t> parallel_recharge) {
  add_stress_flows(model, layout, period, GridPart::whole(model.grid), head, q, dq_dh,
                   parallel_recharge);
}

void add_stress_flows(const Model& model, const SystemLayout& layout, std::size_t period,
                      const GridPart& part, CellValues head, CellWindow<double> q,
                      CellWindow<double> dq_dh, std::span<const std::uint8_t> parallel_recharge) {
  visit_stress_flows(
      model, layout, period, head, part,
      [&](std::size_t, CellIndex c, const StressFlow& flow) {
        q[at(c)] += flow.q.value;
        dq_dh[at(c)] += flow.q.slope;
      },
      parallel_recharge);
}

std::vector<std::uint8_t> recharges_with_distinct_cells(const Model& model) {
  std::vector<std::uint8_t> flags(model.recharges.size(), 0);
  std::vector<std::uint8_t> seen(static_cast<std::size_t>(model.grid.n_cells()), 0);
  for (std::size_t f = 0; f < model.recharges.size(); ++f) {
    bool distinct = true;
    for (CellIndex c : model.recharges[f].cells) {
      if (!c.valid() || c.value >= model.grid.n_cells() || seen[at(c)]) distinct = false;
      if (!distinct) break;
      seen[at(c)] = 1;
    }
    for (CellIndex c : model.recharges[f].cells)
      if (c.valid() && c.value < model.grid.n_cells()) seen[at(c)] = 0;
    flags[f] = distinct ? 1 : 0;
  }
  return flags;
}

std::vector<CellStressFlow> feature_cell_flows(const Model& model, const SystemLayout& layout,
                                               std::size_t period, std::span<const double> head,
                                               std::size_t feature) {
  std::vector<CellStressFlow> cells;
  visit_stress_flows(model, layout, period, head, GridPart::whole(model.grid),
                     [&](std::size_t k, CellIndex c, const StressFlow& flow) {
                       if (k == feature) cells.push_back({c, flow.q});
                     });
  return cells;
}

void stress_flows_by_feature(const Model& model, const SystemLayout& layout, std::size_t period,
                             std::span<const double> head, std::span<FeatureFlow> flows) {
  stress_flows_by_feature(model, layout, period, GridPart::whole(model.grid), head, flows);
}

void stress_flows_by_feature(const Model& model, const SystemLayout& layout, std::size_t period,
                             const GridPart& part, CellValues head, std::span<FeatureFlow> flows) {
  const std::vector<FeatureRef> features = list_features(model);
  for (std::size_t k = 0; k < features.size(); ++k)
    if (features[k].kind != FeatureKind::fixed_head) flows[k] = FeatureFlow{};
  // Split cell by cell: a river losing in one cell and gaining in another reports both.
  visit_stress_flows(model, layout, period, head, part,
                     [&](std::size_t k, CellIndex, const StressFlow& flow) {
                       if (flow.q.value > 0.0)
                         flows[k].in += flow.q.value;
                       else
                         flows[k].out -= flow.q.value;
                       flows[k].shortfall += flow.shortfall;
                     });
}

}  // namespace aquiledger
