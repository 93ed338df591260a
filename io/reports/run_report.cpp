#include "io/reports/run_report.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "io/files/calendar.hpp"
#include "postproc/water_budget.hpp"

namespace aquiledger {

namespace {

double storage_net_release(const WaterBudget& b) {
  double net = 0.0;
  for (auto c : {BudgetComponent::storage_skeleton, BudgetComponent::storage_water,
                 BudgetComponent::storage_drainage, BudgetComponent::storage_elastic,
                 BudgetComponent::interbed_recoverable, BudgetComponent::interbed_permanent,
                 BudgetComponent::delay_bed_recoverable, BudgetComponent::delay_bed_permanent})
    net += b[c].in - b[c].out;
  return net;
}

std::string volume(double v) { return fmt::format("{:.4g}", v); }

}  // namespace

std::string format_period_budget_table(const Model& model,
                                       const std::vector<BudgetPeriodRow>& rows) {
  const std::string vu = model.length_unit + "3";
  std::size_t name_width = 6;
  for (const auto& r : rows) name_width = std::max(name_width, r.name.size());
  name_width = std::min<std::size_t>(name_width, 24);

  // The words of the result files: into / out of the aquifer, storage released (net).
  std::string out = fmt::format(
      "Water budget per period (volumes in {}; balance_periods.csv and budget_periods.csv hold "
      "them all)\n",
      vu);
  // With a start date the period's end date follows its end time.
  const std::optional<CalendarClock> clock = model_clock(model);
  out += fmt::format("  {:>3}  {:<{}}  {:>10}{}  {:>12}  {:>14}  {:>13}  {:>11}  {:>11}  {:>10}\n",
                     "#", "period", name_width, fmt::format("end ({})", model.time_unit),
                     clock ? fmt::format("  {:<10}", "end date") : "", "into aquifer",
                     "out of aquifer", "storage, net", "of it pores", "pumped", "imbalance");
  const bool beds = model.aquifer.interbeds.has_value();
  if (beds) {
    out.pop_back();
    out += fmt::format("  {:>11}  {:>11}\n", "beds, elast", "beds, lost");
  }
  const bool slow = beds && model.aquifer.interbeds->delay.has_value();
  if (slow) {
    out.pop_back();
    out += fmt::format("  {:>12}  {:>11}\n", "slow, elast", "slow, lost");
  }
  for (const auto& r : rows) {
    const WaterBudget& b = r.volumes;
    const std::string name = r.name.size() > name_width ? r.name.substr(0, name_width) : r.name;
    out += fmt::format(
        "  {:>3}  {:<{}}  {:>10.4g}{}  {:>12}  {:>14}  {:>13}  {:>11}  {:>11}  {:>9.2e}%", r.period,
        name, name_width, r.end,
        clock ? fmt::format("  {:<10}", clock->date_of(r.end).substr(0, 10)) : "",
        volume(b.total_in()), volume(b.total_out()), volume(storage_net_release(b)),
        volume(b[BudgetComponent::storage_drainage].in - b[BudgetComponent::storage_drainage].out),
        volume(b[BudgetComponent::well].out), b.imbalance_percent());
    if (beds) {
      const InOut& e = b[BudgetComponent::interbed_recoverable];
      out += fmt::format("  {:>11}  {:>11}", volume(e.in - e.out),
                         volume(b[BudgetComponent::interbed_permanent].in));
    }
    if (slow) {
      const InOut& e = b[BudgetComponent::delay_bed_recoverable];
      out += fmt::format("  {:>12}  {:>11}", volume(e.in - e.out),
                         volume(b[BudgetComponent::delay_bed_permanent].in));
    }
    out += "\n";
  }
  out +=
      "  (storage, net: released minus taken into storage; of it pores: by draining pores at the "
      "water table)\n";
  if (beds)
    out +=
        "  (beds, elast: net elastic release of the interbeds, recoverable; beds, lost: water "
        "squeezed from the interbeds below their preconsolidation head, a permanent loss of "
        "storage)\n";
  if (slow)
    out +=
        "  (slow, elast and slow, lost: the same for the delay beds, which drain slowly into "
        "the aquifer)\n";
  return out;
}

}  // namespace aquiledger
