#pragma once
// Stress values that may change by period (io-internal header).
#include <toml++/toml.h>

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/reader_context.hpp"
#include "solver/period_values.hpp"

namespace aquiledger {

/// A rule every value must keep, with the wording for the message ("> 0 m2/d").
struct ValueRule {
  std::function<bool(double)> ok;
  std::string expected;
};

/// Forms of a per-period value that depend on the feature.
struct ValueForms {
  /// The column a series without `column` takes (a feature table's row: the feature's name).
  std::string series_column;
  /// A polyline placement: values may be given at its vertices, `{ vertices = [...] }`, and
  /// each cell takes their mean along the channel inside it (linear between vertices).
  const Placement* polyline = nullptr;
};

/// Reads a stress value at `key`: one number, one field value ({ file = } or zones), or an
/// array with exactly one entry per period, each a number or a field value. Field values are
/// sampled at the feature's cells, or `{ series = "file.csv", column = "name" }`: one value
/// per period from a time series (io/model_file/time_series.hpp; `rule = "mean"` by default,
/// or "start"). With `fallback` the key is optional.
std::optional<PeriodValues> read_period_values(ReaderContext& ctx, const toml::table& table,
                                               std::string_view key, const std::string& path,
                                               const std::vector<CellIndex>& cells,
                                               std::optional<double> fallback,
                                               const ValueRule& rule, const ValueForms& forms = {});

/// The per-cell values times a per-cell factor (each table expanded to the feature's cells).
PeriodValues scale_by_cell(const PeriodValues& values, const std::vector<double>& factor);

/// Any value in any period and cell, for plausibility ranges: min and max over all tables.
std::pair<double, double> value_range(const PeriodValues& values);

}  // namespace aquiledger
