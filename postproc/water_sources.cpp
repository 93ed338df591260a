#include "postproc/water_sources.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace aquiledger {

namespace {

double net(const InOut& io) { return io.in - io.out; }

/// Every component's in - out summed: the run's imbalance E (L3).
double imbalance(const WaterBudget& b) { return b.total_in() - b.total_out(); }

}  // namespace

std::string_view storage_source_label(BudgetComponent c) {
  switch (c) {
    case BudgetComponent::storage_skeleton:
    case BudgetComponent::storage_water:
    case BudgetComponent::storage_drainage:
    case BudgetComponent::storage_elastic:
    case BudgetComponent::interbed_recoverable:
    case BudgetComponent::interbed_permanent:
    case BudgetComponent::delay_bed_recoverable:
    case BudgetComponent::delay_bed_permanent:
      return component_label(c);
    default:
      return "";
  }
}

std::vector<BudgetComponent> storage_components(const Model& model) {
  std::vector<BudgetComponent> out;
  if (model.aquifer.elastic_split())
    out = {BudgetComponent::storage_skeleton, BudgetComponent::storage_water};
  else
    out = {BudgetComponent::storage_elastic};
  if (model.aquifer.condition != Condition::confined)
    out.push_back(BudgetComponent::storage_drainage);
  if (model.aquifer.interbeds) {
    out.push_back(BudgetComponent::interbed_recoverable);
    out.push_back(BudgetComponent::interbed_permanent);
    if (model.aquifer.interbeds->delay) {
      out.push_back(BudgetComponent::delay_bed_recoverable);
      out.push_back(BudgetComponent::delay_bed_permanent);
    }
  }
  return out;
}

std::string_view source_group(std::string_view source) {
  if (source.rfind("storage_", 0) == 0 || source.rfind("interbed_", 0) == 0 ||
      source.rfind("delay_bed_", 0) == 0)
    return "storage";
  if (source == "river" || source == "drain") return "rivers and drains";
  if (source == "fixed_head" || source == "external_head" || source == "leakage")
    return "boundaries";
  return "other stresses";
}

double share_of(double volume, double withdrawn) {
  return withdrawn == 0.0 ? std::numeric_limits<double>::quiet_NaN() : volume / withdrawn;
}

WaterSources water_sources(std::span<const SourceFeature> features,
                           std::span<const BudgetComponent> storage,
                           std::span<const PeriodPair> periods) {
  WaterSources out;
  for (BudgetComponent c : storage) {
    if (storage_source_label(c).empty())
      throw std::invalid_argument(
          "water_sources: a storage line names a component that is not storage");
    out.lines.push_back({std::string(storage_source_label(c)), ""});
  }
  for (const SourceFeature& f : features)
    if (!f.chosen) out.lines.push_back({feature_kind_label(f.kind), f.name});
  out.lines.push_back({"imbalance", ""});

  std::vector<double> cumulative(out.lines.size(), 0.0);
  double cumulative_withdrawn = 0.0;
  for (const PeriodPair& p : periods) {
    if (p.with_wells.features.size() != features.size() ||
        p.without_wells.features.size() != features.size())
      throw std::invalid_argument("water_sources: period '" + p.name +
                                  "' does not hold one budget entry per feature");
    SourcePeriod row{p.name, p.start, p.end, 0.0, 0.0, {}, {}};
    for (BudgetComponent c : storage)
      row.volume.push_back(net(p.with_wells[c]) - net(p.without_wells[c]));
    for (std::size_t k = 0; k < features.size(); ++k) {
      const double change = net(p.with_wells.features[k]) - net(p.without_wells.features[k]);
      if (features[k].chosen)
        row.withdrawn -= change;
      else
        row.volume.push_back(change);
    }
    // Storage the caller left out would break the identity below.
    for (std::size_t k = 0; k < n_budget_components; ++k) {
      const auto c = static_cast<BudgetComponent>(k);
      const bool listed = std::find(storage.begin(), storage.end(), c) != storage.end();
      if (!listed && !storage_source_label(c).empty() &&
          (net(p.with_wells[c]) != 0.0 || net(p.without_wells[c]) != 0.0))
        throw std::invalid_argument("water_sources: period '" + p.name + "' has " +
                                    std::string(component_label(c)) + " but no line for it");
    }
    row.volume.push_back(imbalance(p.without_wells) - imbalance(p.with_wells));
    cumulative_withdrawn += row.withdrawn;
    row.cumulative_withdrawn = cumulative_withdrawn;
    for (std::size_t k = 0; k < row.volume.size(); ++k) cumulative[k] += row.volume[k];
    row.cumulative = cumulative;
    out.periods.push_back(std::move(row));
  }
  return out;
}

Model without_wells(const Model& model, std::span<const std::size_t> chosen_wells) {
  Model m = model;
  for (std::size_t w : chosen_wells) m.wells.at(w).rate = PeriodValues(0.0);
  return m;
}

Model starting_from(const Model& model, std::vector<double> head) {
  Model m = model;
  m.initial.steady = false;
  m.initial.head = std::move(head);
  return m;
}

PeriodVolumeObserver::PeriodVolumeObserver(const Model& model)
    : model_(model), layout_(make_system_layout(model)) {}

void PeriodVolumeObserver::initial_state(std::span<const double> head) {
  initial.assign(head.begin(), head.end());
}

void PeriodVolumeObserver::step_done(const StepInfo& info, std::span<const double> head_old,
                                     std::span<const double> head_new) {
  if (periods.size() <= info.period) periods.resize(info.period + 1);
  const WaterBudget rates =
      step_budget(model_, layout_, info.period, info.steady, info.dt, head_old, head_new,
                  info.preconsolidation, info.delay_bed_elastic, info.delay_bed_inelastic);
  periods[info.period].add_scaled(rates, info.dt);
  head.assign(head_new.begin(), head_new.end());
}

WaterSourcesRun run_water_sources(const Model& model, std::span<const std::size_t> chosen_wells) {
  WaterSourcesRun out;
  const Model base = without_wells(model, chosen_wells);
  PeriodVolumeObserver without(base);
  RunResult r = run_simulation(base, without);
  if (!r.converged) {
    out.converged = false;
    out.failure = "the run without the chosen wells did not converge: " + r.failure;
    return out;
  }
  const Model pumped = starting_from(model, without.initial);
  PeriodVolumeObserver with(pumped);
  r = run_simulation(pumped, with);
  if (!r.converged) {
    out.converged = false;
    out.failure = "the run with the chosen wells did not converge: " + r.failure;
    return out;
  }
  std::vector<SourceFeature> features;
  for (const FeatureRef& f : list_features(model)) {
    bool chosen = false;
    for (std::size_t w : chosen_wells) chosen |= f.kind == FeatureKind::well && f.index == w;
    features.push_back({f.name, f.kind, chosen});
  }
  std::vector<PeriodPair> pairs;
  double start = 0.0;
  for (std::size_t p = 0; p < model.periods.size(); ++p) {
    const Period& period = model.periods[p];
    pairs.push_back(
        {period.name, start, start + period.length, with.periods.at(p), without.periods.at(p)});
    double planned = 0.0;
    for (std::size_t w : chosen_wells) planned += model.wells[w].rate.at(p, 0) * period.length;
    out.planned.push_back(planned);
    start += period.length;
  }
  out.sources = water_sources(features, storage_components(model), pairs);
  out.initial = std::move(without.initial);
  out.head_with = std::move(with.head);
  return out;
}

}  // namespace aquiledger
