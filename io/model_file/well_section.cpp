// [[well]]: a well at (x, y) pumping a rate per period (positive = withdrawal), or a table of
// wells (`table = "wells.csv"`: name, x, y and an optional pumping_rate column).
#include <algorithm>
#include <cmath>

#include "io/model_file/array_source.hpp"
#include "io/model_file/feature_placement.hpp"
#include "io/model_file/feature_table.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

ValueRule rate_rule(const ReaderContext& ctx) {
  return {[](double v) { return std::isfinite(v); },
          "a rate in " + ctx.flow_unit() + " (positive = withdrawal)"};
}

/// The wells of a `table` entry. A row's pumping_rate cell, when given, is its rate in every
/// period; otherwise the entry's pumping_rate applies, a series taking the column named
/// after the well.
void read_well_table(ReaderContext& ctx, const FeatureHead& f, NameSet& names, Model& model) {
  for (std::string_view key : {"name", "x", "y"})
    if (const toml::node* n = f.table->get(key))
      ctx.error(*n, key_path(f.path, key),
                "a well table takes names and points from its file; remove this key or the "
                "table");
  auto rows = read_feature_table(ctx, *f.table, f.path, {"pumping_rate"}, names);
  if (!rows) return;
  for (const FeatureTableRow& row : *rows) {
    std::optional<PeriodValues> rate;
    if (!row.extra[0].empty()) {
      auto v = parse_value(row.extra[0]);
      if (!v) {
        ctx.error(row.at, f.path + ".table",
                  "column 'pumping_rate': '" + row.extra[0] + "' is not a number (" +
                      rate_rule(ctx).expected +
                      "; leave it empty to take the entry's "
                      "pumping_rate)");
        continue;
      }
      rate = PeriodValues(*v);
    } else if (f.table->contains("pumping_rate")) {
      rate = read_period_values(ctx, *f.table, "pumping_rate", f.path, {row.cell}, std::nullopt,
                                rate_rule(ctx), {row.name});
    } else {
      ctx.error(row.at, f.path + ".table",
                "well '" + row.name +
                    "' has no rate: fill its pumping_rate cell or give the entry a "
                    "pumping_rate (a value, one per period, or a series whose columns are the "
                    "wells' names)");
      continue;
    }
    warn_fixed_overlap(ctx, f.path + " '" + row.name + "'", row.at, {row.cell});
    if (!rate) continue;
    Well w;
    w.name = row.name;
    w.x = row.x;
    w.y = row.y;
    w.cell = row.cell;
    w.rate = std::move(*rate);
    model.wells.push_back(std::move(w));
  }
}

}  // namespace

void read_wells(ReaderContext& ctx, const toml::table& root, Model& model) {
  auto entries = feature_tables(ctx, root, "well", {"name", "x", "y", "pumping_rate", "table"});
  NameSet names;  // every well's, the tables' rows included
  for (const auto& f : entries)
    if (!f.table->contains("table")) names.insert(f.name);
  for (auto& f : entries) {
    if (f.table->contains("table")) {
      read_well_table(ctx, f, names, model);
      continue;
    }
    if (!f.table->contains("x") || !f.table->contains("y")) {
      ctx.error(*f.table, f.path,
                "missing the well's location: give x and y (" + ctx.length_unit +
                    "), or a table of wells");
      continue;
    }
    auto place = read_placement(ctx, *f.table, f.path, PlacementDefault::required);
    if (!place) continue;
    auto rate = read_period_values(ctx, *f.table, "pumping_rate", f.path, place->cells,
                                   std::nullopt, rate_rule(ctx));
    warn_fixed_overlap(ctx, f.path, place->at, place->cells);
    if (!rate) continue;
    Well w;
    w.name = f.name;
    w.x = *number_of(*f.table->get("x"));
    w.y = *number_of(*f.table->get("y"));
    w.cell = place->cells.front();
    w.rate = std::move(*rate);
    model.wells.push_back(std::move(w));
  }
}

}  // namespace aquiledger
