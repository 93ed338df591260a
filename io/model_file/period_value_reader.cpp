#include "io/model_file/period_value_reader.hpp"

#include <algorithm>
#include <limits>

#include "io/model_file/field_value.hpp"
#include "io/model_file/time_series.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

/// `{ vertices = [v1, v2, ...] }` along a polyline: each cell's mean of the values,
/// linear between vertices, over the channel inside it.
std::optional<std::vector<double>> vertex_table(ReaderContext& ctx, const toml::table& t,
                                                const std::string& key, const Placement* polyline,
                                                const ValueRule& rule) {
  check_keys(ctx, t, key, {"vertices"});
  if (!polyline) {
    ctx.error(t, key + ".vertices",
              "values at vertices need a feature placed by polyline (one value per vertex)");
    return std::nullopt;
  }
  const toml::array* arr = t.get("vertices")->as_array();
  if (!arr || arr->size() != polyline->n_vertices) {
    ctx.error(*t.get("vertices"), key + ".vertices",
              "expected an array of " + std::to_string(polyline->n_vertices) +
                  " numbers, one per vertex of the polyline, found " + show(*t.get("vertices")));
    return std::nullopt;
  }
  std::vector<double> at_vertex;
  for (std::size_t v = 0; v < arr->size(); ++v) {
    auto x = number_of((*arr)[v]);
    if (!x || !rule.ok(*x)) {
      ctx.error((*arr)[v], key + ".vertices[" + std::to_string(v + 1) + "]",
                "value " + show((*arr)[v]) + "; expected " + rule.expected);
      return std::nullopt;
    }
    at_vertex.push_back(*x);
  }
  std::vector<double> table;
  for (std::size_t c = 0; c < polyline->cells.size(); ++c) {
    double sum = 0.0;
    for (const auto& [v, w] : polyline->vertex_weights[c]) sum += w * at_vertex[v];
    table.push_back(sum / polyline->length[c]);
  }
  return table;
}

/// The table of one period's entry: one number, the field sampled at the cells, or values at
/// a polyline's vertices.
std::optional<std::vector<double>> entry_table(ReaderContext& ctx, const toml::node& node,
                                               const std::string& key,
                                               const std::vector<CellIndex>& cells,
                                               const ValueRule& rule, const ValueForms& forms) {
  if (auto v = number_of(node)) {
    if (!rule.ok(*v)) {
      ctx.error(node, key, "value " + show_number(*v) + "; expected " + rule.expected);
      return std::nullopt;
    }
    return std::vector<double>{*v};
  }
  if (const toml::table* t = node.as_table(); t && t->contains("vertices"))
    return vertex_table(ctx, *t, key, forms.polyline, rule);
  auto field = read_field(ctx, node, key);
  if (!field) return std::nullopt;
  std::vector<double> table;
  table.reserve(cells.size());
  for (CellIndex c : cells) {
    const double v = field->values[std::size_t(c.value)];
    if (!rule.ok(v)) {
      ctx.error(field_cell_spot(*field, ctx.shape->ncol, c.value), key,
                "value " + show_number(v) + " at " + describe_cell(ctx.shape->ncol, c.value) +
                    "; expected " + rule.expected);
      return std::nullopt;
    }
    table.push_back(v);
  }
  return table;
}

std::uint32_t table_slot(std::vector<std::vector<double>>& tables, std::vector<double> table) {
  auto it = std::find(tables.begin(), tables.end(), table);
  if (it != tables.end()) return static_cast<std::uint32_t>(it - tables.begin());
  tables.push_back(std::move(table));
  return static_cast<std::uint32_t>(tables.size() - 1);
}

/// `{ series = "file.csv", column = "name", rule = "mean" | "start" }`: one value per period
/// from a time series (io/model_file/time_series.hpp).
std::optional<PeriodValues> series_values(ReaderContext& ctx, const toml::table& t,
                                          const std::string& key, const ValueRule& rule,
                                          const std::string& default_column) {
  check_keys(ctx, t, key, {"series", "column", "rule"});
  auto file = read_string(ctx, t, "series", key, true);
  auto column = read_string(ctx, t, "column", key, default_column.empty());
  if (!column && !default_column.empty() && !t.contains("column")) column = default_column;
  auto how = read_choice(ctx, t, "rule", key, {"mean", "start"});
  if (!file || !column || (t.contains("rule") && !how)) return std::nullopt;
  if (ctx.n_periods == 0) return std::nullopt;  // periods invalid: already reported
  const SourceSpot at = ctx.spot(*t.get("series"));
  const SeriesFile* series = series_file(ctx, ctx.resolve(*file), at, key + ".series");
  if (!series) return std::nullopt;
  const SeriesRule r = how.value_or("mean") == "start" ? SeriesRule::start : SeriesRule::mean;
  const toml::node& column_node = t.contains("column") ? *t.get("column") : *t.get("series");
  auto values = values_per_period(ctx, *series, *column, r, ctx.spot(column_node),
                                  key + (t.contains("column") ? ".column" : ".series"));
  if (!values) return std::nullopt;
  std::vector<std::vector<double>> tables;
  std::vector<std::uint32_t> map;
  for (std::size_t p = 0; p < values->size(); ++p) {
    const double v = (*values)[p];
    if (!rule.ok(v)) {
      ctx.error(ctx.spot(column_node), key,
                "period " + std::to_string(p + 1) + " takes " + show_number(v) + " from column '" +
                    *column + "' of '" + series->file.string() + "'; expected " + rule.expected);
      return std::nullopt;
    }
    map.push_back(table_slot(tables, {v}));
  }
  return PeriodValues(std::move(tables), std::move(map));
}

}  // namespace

std::optional<PeriodValues> read_period_values(ReaderContext& ctx, const toml::table& table,
                                               std::string_view key, const std::string& path,
                                               const std::vector<CellIndex>& cells,
                                               std::optional<double> fallback,
                                               const ValueRule& rule, const ValueForms& forms) {
  const std::string name = key_path(path, key);
  const toml::node* node = table.get(key);
  if (!node) {
    if (fallback) return PeriodValues(*fallback);
    ctx.error(table, name,
              "missing required key (expected one value, one per period, or a field value; " +
                  rule.expected + ")");
    return std::nullopt;
  }
  if (const toml::table* t = node->as_table(); t && t->contains("series"))
    return series_values(ctx, *t, name, rule, forms.series_column);
  const toml::array* arr = node->as_array();
  if (!arr) {
    auto t = entry_table(ctx, *node, name, cells, rule, forms);
    if (!t) return std::nullopt;
    return PeriodValues({std::move(*t)}, {});
  }
  if (ctx.n_periods == 0) return std::nullopt;  // periods invalid: already reported
  if (static_cast<int>(arr->size()) != ctx.n_periods) {
    ctx.error(*node, name,
              "has " + std::to_string(arr->size()) + " entries, expected one per period (" +
                  std::to_string(ctx.n_periods) + " periods) or a single value");
    return std::nullopt;
  }
  std::vector<std::vector<double>> tables;
  std::vector<std::uint32_t> map;
  bool ok = true;
  for (std::size_t p = 0; p < arr->size(); ++p) {
    auto t =
        entry_table(ctx, (*arr)[p], name + "[" + std::to_string(p + 1) + "]", cells, rule, forms);
    if (!t) {
      ok = false;
      continue;
    }
    map.push_back(table_slot(tables, std::move(*t)));
  }
  if (!ok) return std::nullopt;
  return PeriodValues(std::move(tables), std::move(map));
}

PeriodValues scale_by_cell(const PeriodValues& values, const std::vector<double>& factor) {
  std::vector<std::vector<double>> tables;
  for (const auto& t : values.tables()) {
    std::vector<double> scaled(factor.size());
    for (std::size_t i = 0; i < factor.size(); ++i)
      scaled[i] = (t.size() == 1 ? t[0] : t[i]) * factor[i];
    tables.push_back(std::move(scaled));
  }
  return PeriodValues(std::move(tables), values.table_of_period());
}

std::pair<double, double> value_range(const PeriodValues& values) {
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  for (const auto& t : values.tables())
    for (double v : t) lo = std::min(lo, v), hi = std::max(hi, v);
  return {lo, hi};
}

}  // namespace aquiledger
