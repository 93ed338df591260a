// TEMPORARY (output branch): only the totals and labels of WaterBudget, so the result writers
// build and test before the solver branch brings the full file (with step_budget). Delete
// this file in favour of the solver branch's version when merging.
#include "postproc/water_budget.hpp"

#include <cmath>

namespace aquiledger {

std::string_view component_label(BudgetComponent c) {
  switch (c) {
    case BudgetComponent::storage_skeleton: return "storage_skeleton";
    case BudgetComponent::storage_water: return "storage_water";
    case BudgetComponent::storage_drainage: return "storage_drainage";
    case BudgetComponent::storage_elastic: return "storage_elastic";
    case BudgetComponent::fixed_head: return "fixed_head";
    case BudgetComponent::wells: return "wells";
    case BudgetComponent::recharge: return "recharge";
    case BudgetComponent::river: return "river";
    case BudgetComponent::drain: return "drain";
    case BudgetComponent::external_head: return "external_head";
    case BudgetComponent::evapotranspiration: return "evapotranspiration";
    case BudgetComponent::leakage: return "leakage";
  }
  return "unknown";
}

double WaterBudget::total_in() const {
  double sum = 0.0;
  for (const InOut& c : components) sum += c.in;
  return sum;
}

double WaterBudget::total_out() const {
  double sum = 0.0;
  for (const InOut& c : components) sum += c.out;
  return sum;
}

double WaterBudget::discrepancy_percent() const {
  const double in = total_in();
  const double out = total_out();
  if (in == 0.0 && out == 0.0) return 0.0;
  return 100.0 * (in - out) / (0.5 * (in + out));
}

void WaterBudget::add_scaled(const WaterBudget& other, double factor) {
  for (std::size_t i = 0; i < n_budget_components; ++i) {
    components[i].in += factor * other.components[i].in;
    components[i].out += factor * other.components[i].out;
  }
  if (features.size() < other.features.size()) features.resize(other.features.size());
  for (std::size_t k = 0; k < other.features.size(); ++k) {
    features[k].in += factor * other.features[k].in;
    features[k].out += factor * other.features[k].out;
  }
  well_shortfall += factor * other.well_shortfall;
}

}  // namespace aquiledger
