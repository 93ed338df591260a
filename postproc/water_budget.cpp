#include "postproc/water_budget.hpp"

#include <cassert>
#include <cmath>

#include "solver/face_table.hpp"
#include "solver/storage_function.hpp"

namespace aquiledger {

namespace {

void add_signed(InOut& io, double q) {
  if (q > 0.0)
    io.in += q;
  else
    io.out -= q;
}

}  // namespace

BudgetComponent budget_component_of(FeatureKind kind) {
  switch (kind) {
    case FeatureKind::well:
      return BudgetComponent::well;
    case FeatureKind::fixed_head:
      return BudgetComponent::fixed_head;
    case FeatureKind::recharge:
      return BudgetComponent::recharge;
    case FeatureKind::river:
      return BudgetComponent::river;
    case FeatureKind::drain:
      return BudgetComponent::drain;
    case FeatureKind::external_head:
      return BudgetComponent::external_head;
    case FeatureKind::evapotranspiration:
      return BudgetComponent::evapotranspiration;
    case FeatureKind::leakage:
      return BudgetComponent::leakage;
  }
  return BudgetComponent::well;
}

std::string_view component_label(BudgetComponent c) {
  switch (c) {
    case BudgetComponent::storage_skeleton:
      return "storage_skeleton";
    case BudgetComponent::storage_water:
      return "storage_water";
    case BudgetComponent::storage_drainage:
      return "storage_drainage";
    case BudgetComponent::storage_elastic:
      return "storage_elastic";
    case BudgetComponent::interbed_recoverable:
      return "interbed_recoverable";
    case BudgetComponent::interbed_permanent:
      return "interbed_permanent";
    case BudgetComponent::delay_bed_recoverable:
      return "delay_bed_recoverable";
    case BudgetComponent::delay_bed_permanent:
      return "delay_bed_permanent";
    case BudgetComponent::fixed_head:
      return "fixed_head";
    case BudgetComponent::well:
      return "well";
    case BudgetComponent::recharge:
      return "recharge";
    case BudgetComponent::river:
      return "river";
    case BudgetComponent::drain:
      return "drain";
    case BudgetComponent::external_head:
      return "external_head";
    case BudgetComponent::evapotranspiration:
      return "evapotranspiration";
    case BudgetComponent::leakage:
      return "leakage";
  }
  return "unknown";
}

double WaterBudget::total_in() const {
  double s = 0.0;
  for (const InOut& c : components) s += c.in;
  return s;
}

double WaterBudget::total_out() const {
  double s = 0.0;
  for (const InOut& c : components) s += c.out;
  return s;
}

double WaterBudget::imbalance_percent() const {
  const double in = total_in();
  const double out = total_out();
  if (in == 0.0 && out == 0.0) return 0.0;
  return 100.0 * (in - out) / (0.5 * (in + out));
}

void WaterBudget::add_scaled(const WaterBudget& other, double factor) {
  for (std::size_t k = 0; k < n_budget_components; ++k) {
    components[k].in += factor * other.components[k].in;
    components[k].out += factor * other.components[k].out;
  }
  if (features.size() < other.features.size()) features.resize(other.features.size());
  for (std::size_t k = 0; k < other.features.size(); ++k) {
    features[k].in += factor * other.features[k].in;
    features[k].out += factor * other.features[k].out;
  }
  well_shortfall += factor * other.well_shortfall;
}

WaterBudget step_budget(const Model& model, const SystemLayout& layout, std::size_t period,
                        bool steady, double dt, std::span<const double> head_old,
                        std::span<const double> head_new, std::span<const double> preconsolidation,
                        std::span<const double> delay_elastic,
                        std::span<const double> delay_inelastic) {
  return step_budget(model, layout, GridPart::whole(model.grid), period, steady, dt, head_old,
                     head_new, preconsolidation, delay_elastic, delay_inelastic);
}

WaterBudget step_budget(const Model& model, const SystemLayout& layout, const GridPart& part,
                        std::size_t period, bool steady, double dt, CellValues head_old,
                        CellValues head_new, CellValues preconsolidation, CellValues delay_elastic,
                        CellValues delay_inelastic) {
  WaterBudget budget;
  // Storage: released (positive) or taken (negative) in each unknown cell, by mechanism.
  if (!steady) {
    const bool split = model.aquifer.elastic_split();
    const UnknownRange owned = owned_unknowns(layout, part);
    const auto first = static_cast<std::ptrdiff_t>(owned.first);
    const auto n = static_cast<std::ptrdiff_t>(owned.end);
    // In and out of each storage mechanism as plain scalars so that OpenMP can reduce them.
    double skel_in = 0, skel_out = 0, water_in = 0, water_out = 0, el_in = 0, el_out = 0;
    double dr_in = 0, dr_out = 0, ire_in = 0, ire_out = 0, ipe_in = 0, ipe_out = 0;
    double dre_in = 0, dre_out = 0, dpe_in = 0, dpe_out = 0;
    const bool interbeds = !preconsolidation.values().empty();
    const bool delay = !delay_elastic.values().empty();
    assert(!delay || (model.aquifer.interbeds && model.aquifer.interbeds->delay));
    assert(interbeds == model.aquifer.interbeds.has_value());
#pragma omp parallel for schedule(static) reduction(+ : skel_in, skel_out, water_in, water_out, \
                                                        el_in, el_out, dr_in, dr_out, ire_in, \
                                                        ire_out, ipe_in, ipe_out, dre_in, dre_out, \
                                                        dpe_in, dpe_out)
    for (std::ptrdiff_t u = first; u < n; ++u) {
      const CellIndex c = layout.cell_of_unknown[static_cast<std::size_t>(u)];
      const std::size_t i = at(c);
      const double pc = interbeds ? preconsolidation[i] : 0.0;
      const StorageRelease release = storage_release_rate(
          cell_storage(model, c, pc), layout.area[i], head_old[i], head_new[i], dt);
      const double elastic = release.elastic;
      auto add = [](double& in, double& out, double q) { q > 0.0 ? in += q : out -= q; };
      if (split) {
        const double share = model.aquifer.skeleton_share[i];
        add(skel_in, skel_out, share * elastic);
        add(water_in, water_out, (1.0 - share) * elastic);
      } else {
        add(el_in, el_out, elastic);
      }
      add(dr_in, dr_out, release.drainage);
      add(ire_in, ire_out, release.interbed_elastic);
      add(ipe_in, ipe_out, release.interbed_inelastic);
      if (delay) {  // released over the step per unit area, as a rate
        add(dre_in, dre_out, delay_elastic[i] * layout.area[i] / dt);
        add(dpe_in, dpe_out, delay_inelastic[i] * layout.area[i] / dt);
      }
    }
    budget[BudgetComponent::storage_skeleton] = {skel_in, skel_out};
    budget[BudgetComponent::storage_water] = {water_in, water_out};
    budget[BudgetComponent::storage_elastic] = {el_in, el_out};
    budget[BudgetComponent::storage_drainage] = {dr_in, dr_out};
    budget[BudgetComponent::interbed_recoverable] = {ire_in, ire_out};
    budget[BudgetComponent::interbed_permanent] = {ipe_in, ipe_out};
    budget[BudgetComponent::delay_bed_recoverable] = {dre_in, dre_out};
    budget[BudgetComponent::delay_bed_permanent] = {dpe_in, dpe_out};
  }

  const std::vector<FeatureRef> features = list_features(model);
  std::vector<FeatureFlow> flows(features.size());
  stress_flows_by_feature(model, layout, period, part, head_new, flows);
  budget.features.resize(features.size());
  // Fixed heads: each fixed cell counted once, under the first feature that holds it.
  std::vector<std::uint8_t> counted(layout.fixed.size(), 0);
  for (std::size_t k = 0; k < features.size(); ++k) {
    InOut& row = budget.features[k];
    if (features[k].kind == FeatureKind::fixed_head) {
      for (CellIndex c : model.fixed_heads[features[k].index].cells) {
        if (!part.owns(c) || !model.grid.is_active(c) || counted[at(c)]) continue;
        counted[at(c)] = 1;
        add_signed(row, fixed_cell_net_flow(model, layout, c, head_new));
      }
    } else {
      row = {flows[k].in, flows[k].out};
      if (features[k].kind == FeatureKind::well) budget.well_shortfall += flows[k].shortfall;
    }
    InOut& total = budget[budget_component_of(features[k].kind)];
    total.in += row.in;
    total.out += row.out;
  }
  return budget;
}

void sum_across_processes(WaterBudget& b, ResultReduction& reduction) {
  std::vector<double> v;
  v.reserve(2 * (b.components.size() + b.features.size()) + 1);
  for (const InOut& c : b.components) v.insert(v.end(), {c.in, c.out});
  for (const InOut& f : b.features) v.insert(v.end(), {f.in, f.out});
  v.push_back(b.well_shortfall);
  reduction.sum(v);
  std::size_t k = 0;
  for (InOut& c : b.components) c = {v[k], v[k + 1]}, k += 2;
  for (InOut& f : b.features) f = {v[k], v[k + 1]}, k += 2;
  b.well_shortfall = v[k];
}

}  // namespace aquiledger
