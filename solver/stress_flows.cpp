#include "solver/stress_flows.hpp"

#include <cmath>

#include "solver/stress_kernels.hpp"

namespace aquiledger {

namespace {

std::size_t at(CellIndex c) { return static_cast<std::size_t>(c.value); }

/// Calls visit(k, cell, flow) for every cell of every stress feature, k being the feature's
/// position in list_features(model). Inactive and fixed-head cells carry no stress.
template <class Visit>
void visit_stress_flows(const Model& model, const SystemLayout& layout, std::size_t period,
                        std::span<const double> head, Visit&& visit) {
  const RectilinearGrid& grid = model.grid;
  const bool reducible = model.aquifer.condition != Condition::confined;
  auto carries_stress = [&](CellIndex c) { return grid.is_active(c) && layout.fixed[at(c)] == 0; };
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

  for (const Recharge& recharge : model.recharges) {
    for (std::size_t j = 0; j < recharge.cells.size(); ++j) {
      const CellIndex c = recharge.cells[j];
      if (!carries_stress(c)) continue;
      const ValueSlope b = saturated_thickness(model, layout, c, head[at(c)]);
      visit(k, c,
            recharge_flow(recharge.rate.at(period, j), layout.area[at(c)], b,
                          layout.reduction_length[at(c)], reducible));
    }
    ++k;
  }

  for (const River& river : model.rivers) {
    for (std::size_t j = 0; j < river.cells.size(); ++j) {
      const CellIndex c = river.cells[j];
      if (!carries_stress(c)) continue;
      visit(k, c,
            WithdrawalFlow{
                river_flow(head[at(c)], river.stage.at(period, j), river.bed_bottom.at(period, j),
                           river.conductance.at(period, j), layout.smoothing_length[at(c)])});
    }
    ++k;
  }

  for (const Drain& drain : model.drains) {
    for (std::size_t j = 0; j < drain.cells.size(); ++j) {
      const CellIndex c = drain.cells[j];
      if (!carries_stress(c)) continue;
      visit(k, c,
            WithdrawalFlow{drain_flow(head[at(c)], drain.elevation.at(period, j),
                                      drain.conductance.at(period, j),
                                      layout.smoothing_length[at(c)])});
    }
    ++k;
  }

  for (const ExternalHead& external : model.external_heads) {
    for (std::size_t j = 0; j < external.cells.size(); ++j) {
      const CellIndex c = external.cells[j];
      if (!carries_stress(c)) continue;
      visit(k, c,
            WithdrawalFlow{external_head_flow(head[at(c)], external.head.at(period, j),
                                              external.conductance.at(period, j))});
    }
    ++k;
  }

  for (const Evapotranspiration& et : model.evapotranspiration) {
    for (std::size_t j = 0; j < et.cells.size(); ++j) {
      const CellIndex c = et.cells[j];
      if (!carries_stress(c)) continue;
      visit(k, c,
            WithdrawalFlow{evapotranspiration_flow(
                head[at(c)], et.surface.at(period, j), et.max_rate.at(period, j),
                et.extinction_depth.at(period, j), layout.area[at(c)],
                layout.smoothing_length[at(c)])});
    }
    ++k;
  }

  if (model.leakage) {
    const Leakage& leakage = *model.leakage;
    const bool has_top = !model.aquifer.top.empty();
    for (std::size_t j = 0; j < leakage.cells.size(); ++j) {
      const CellIndex c = leakage.cells[j];
      if (!carries_stress(c)) continue;
      const double top = has_top ? model.aquifer.top[at(c)] : std::nan("");
      visit(k, c,
            WithdrawalFlow{leakage_flow(head[at(c)], leakage.source_head.at(period, j), top,
                                        leakage.leakance.at(period, j), layout.area[at(c)],
                                        layout.smoothing_length[at(c)])});
    }
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
  visit_stress_flows(model, layout, period, head,
                     [&](std::size_t, CellIndex c, const WithdrawalFlow& flow) {
                       q[at(c)] += flow.q.value;
                       dq_dh[at(c)] += flow.q.slope;
                     });
}

void stress_flows_by_feature(const Model& model, const SystemLayout& layout, std::size_t period,
                             std::span<const double> head, std::span<FeatureFlow> flows) {
  const std::vector<FeatureRef> features = list_features(model);
  for (std::size_t k = 0; k < features.size(); ++k)
    if (features[k].kind != FeatureKind::fixed_head) flows[k] = FeatureFlow{};
  // Split cell by cell: a river losing in one cell and gaining in another reports both.
  visit_stress_flows(model, layout, period, head,
                     [&](std::size_t k, CellIndex, const WithdrawalFlow& flow) {
                       if (flow.q.value > 0.0)
                         flows[k].in += flow.q.value;
                       else
                         flows[k].out -= flow.q.value;
                       flows[k].shortfall += flow.shortfall;
                     });
}

}  // namespace aquiledger
