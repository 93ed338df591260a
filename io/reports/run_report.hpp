#pragma once
#include <string>
#include <vector>

#include "io/results/result_tables.hpp"
#include "solver/model.hpp"
#include "solver/stress_flows.hpp"

namespace aquiledger {

/// The caution printed with every run and written into the summary.
inline constexpr const char* professional_caution =
    "A model supports, and never replaces, the judgement of a licensed professional and the "
    "local regulations that apply.";

/// Per-period water budget table for the terminal (volumes in the model's units).
std::string format_period_budget_table(const Model& model,
                                       const std::vector<BudgetPeriodRow>& rows);

}  // namespace aquiledger
