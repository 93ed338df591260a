#pragma once
#include <cassert>
#include <cstddef>
#include <cstdint>
#include <vector>

namespace aquiledger {

/// A value per period for each cell of a feature, stored without repetition: every period
/// points at one table, and a table of length 1 applies to every cell of the feature.
class PeriodValues {
 public:
  PeriodValues() = default;
  /// The same value in every period and cell.
  explicit PeriodValues(double value) : tables_{{value}}, table_of_period_{} {}
  /// tables: distinct value tables (length 1 or the feature's cell count);
  /// table_of_period: for each period (0-based), the index of its table.
  PeriodValues(std::vector<std::vector<double>> tables, std::vector<std::uint32_t> table_of_period)
      : tables_(std::move(tables)), table_of_period_(std::move(table_of_period)) {}

  /// Value in period (0-based) at the feature's i-th cell. With no period map the first table
  /// holds in every period.
  double at(std::size_t period, std::size_t i) const {
    const auto& t = table(period);
    return t.size() == 1 ? t[0] : t[i];
  }
  const std::vector<double>& table(std::size_t period) const {
    if (table_of_period_.empty()) return tables_.front();
    assert(period < table_of_period_.size());
    return tables_[table_of_period_[period]];
  }
  bool empty() const { return tables_.empty(); }
  const std::vector<std::vector<double>>& tables() const { return tables_; }
  const std::vector<std::uint32_t>& table_of_period() const { return table_of_period_; }

 private:
  std::vector<std::vector<double>> tables_;
  std::vector<std::uint32_t> table_of_period_;
};

}  // namespace aquiledger
