// [[fixed_head]], [[well]], [[recharge]], [[drain]], [[external_head]], [[evapotranspiration]].
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

const ValueRule any_elevation{[](double v) { return std::isfinite(v); }, "an elevation"};

ValueRule non_negative(const std::string& unit) {
  return {[](double v) { return v >= 0.0; }, ">= 0 " + unit};
}

struct FeatureHead {
  const toml::table* table = nullptr;
  std::string path;
  std::string name;
};

/// Every table of a section with its key path and a unique name; `keys` are checked.
std::vector<FeatureHead> feature_tables(ReaderContext& ctx, const toml::table& root,
                                        std::string_view section,
                                        std::initializer_list<std::string_view> keys) {
  std::vector<FeatureHead> out;
  const toml::array* arr = section_tables(ctx, root, section);
  if (!arr) return out;
  std::vector<std::string> names;
  for (std::size_t i = 0; i < arr->size(); ++i) {
    const toml::table& t = *(*arr)[i].as_table();
    FeatureHead f{&t, feature_path(section, t, i), ""};
    check_keys(ctx, t, f.path, keys);
    f.name = read_string(ctx, t, "name", f.path, false)
                 .value_or(std::string(section) + " " + std::to_string(i + 1));
    check_unique_name(ctx, t, f.path, f.name, names);
    out.push_back(std::move(f));
  }
  return out;
}

}  // namespace

/// Warns when an explicitly placed stress lands on fixed-head cells, where it is not applied.
void warn_fixed_overlap(ReaderContext& ctx, const std::string& path, const SourceSpot& at,
                        const std::vector<CellIndex>& cells) {
  int n = 0, first = -1;
  for (CellIndex c : cells)
    if (!ctx.fixed.empty() && ctx.fixed[std::size_t(c.value)] && n++ == 0) first = c.value;
  if (n > 0)
    ctx.warning(at, path,
                std::to_string(n) + " of its " + std::to_string(cells.size()) +
                    " cell(s) are fixed-head cells (first at " +
                    describe_cell(ctx.grid->n_cols(), first) +
                    "); the stress is not applied there");
}

void read_fixed_heads(ReaderContext& ctx, const toml::table& root, Model& model) {
  for (auto& f : feature_tables(ctx, root, "fixed_head",
                                {"name", "edge", "cells", "mask", "polyline", "x", "y", "head"})) {
    auto place = read_placement(ctx, *f.table, f.path, PlacementDefault::required);
    if (!place) continue;
    auto head = read_period_values(ctx, *f.table, "head", f.path, place->cells, std::nullopt,
                                   any_elevation);
    bool clash = false;
    for (CellIndex c : place->cells) {
      auto& mark = ctx.fixed[std::size_t(c.value)];
      if (mark && !clash) {
        ctx.error(place->at, f.path,
                  describe_cell(ctx.grid->n_cols(), c.value) +
                      " is already held by another [[fixed_head]]");
        clash = true;
      }
      mark = 1;
    }
    if (head && !clash)
      model.fixed_heads.push_back({f.name, std::move(place->cells), std::move(*head)});
  }
}

void read_wells(ReaderContext& ctx, const toml::table& root, Model& model) {
  for (auto& f : feature_tables(ctx, root, "well", {"name", "x", "y", "pumping_rate"})) {
    if (!f.table->contains("x") || !f.table->contains("y")) {
      ctx.error(*f.table, f.path,
                "missing the well's location: give x and y (" + ctx.length_unit + ")");
      continue;
    }
    auto place = read_placement(ctx, *f.table, f.path, PlacementDefault::required);
    if (!place) continue;
    auto rate =
        read_period_values(ctx, *f.table, "pumping_rate", f.path, place->cells, std::nullopt,
                           {[](double v) { return std::isfinite(v); },
                            "a rate in " + ctx.flow_unit() + " (positive = withdrawal)"});
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

void read_recharges(ReaderContext& ctx, const toml::table& root, Model& model) {
  for (auto& f : feature_tables(ctx, root, "recharge",
                                {"name", "edge", "cells", "mask", "polyline", "x", "y", "rate"})) {
    auto place = read_placement(ctx, *f.table, f.path, PlacementDefault::every_active_cell);
    if (!place) continue;
    auto rate = read_period_values(
        ctx, *f.table, "rate", f.path, place->cells, std::nullopt,
        {[](double v) { return std::isfinite(v); }, "a rate in " + ctx.velocity_unit()});
    if (!place->defaulted) warn_fixed_overlap(ctx, f.path, place->at, place->cells);
    if (rate) model.recharges.push_back({f.name, std::move(place->cells), std::move(*rate)});
  }
}

void read_drains(ReaderContext& ctx, const toml::table& root, Model& model) {
  for (auto& f : feature_tables(
           ctx, root, "drain",
           {"name", "edge", "cells", "mask", "polyline", "x", "y", "elevation", "conductance"})) {
    auto place = read_placement(ctx, *f.table, f.path, PlacementDefault::required);
    if (!place) continue;
    auto elevation = read_period_values(ctx, *f.table, "elevation", f.path, place->cells,
                                        std::nullopt, any_elevation);
    auto conductance =
        read_period_values(ctx, *f.table, "conductance", f.path, place->cells, std::nullopt,
                           non_negative(ctx.conductance_unit() + " per cell"));
    warn_fixed_overlap(ctx, f.path, place->at, place->cells);
    if (elevation && conductance)
      model.drains.push_back(
          {f.name, std::move(place->cells), std::move(*elevation), std::move(*conductance)});
  }
}

void read_external_heads(ReaderContext& ctx, const toml::table& root, Model& model) {
  for (auto& f : feature_tables(
           ctx, root, "external_head",
           {"name", "edge", "cells", "mask", "polyline", "x", "y", "head", "conductance"})) {
    auto place = read_placement(ctx, *f.table, f.path, PlacementDefault::required);
    if (!place) continue;
    auto head = read_period_values(ctx, *f.table, "head", f.path, place->cells, std::nullopt,
                                   any_elevation);
    auto conductance =
        read_period_values(ctx, *f.table, "conductance", f.path, place->cells, std::nullopt,
                           non_negative(ctx.conductance_unit() + " per cell"));
    warn_fixed_overlap(ctx, f.path, place->at, place->cells);
    if (head && conductance)
      model.external_heads.push_back(
          {f.name, std::move(place->cells), std::move(*head), std::move(*conductance)});
  }
}

void read_evapotranspiration(ReaderContext& ctx, const toml::table& root, Model& model) {
  for (auto& f : feature_tables(ctx, root, "evapotranspiration",
                                {"name", "edge", "cells", "mask", "polyline", "x", "y", "surface",
                                 "max_rate", "extinction_depth"})) {
    auto place = read_placement(ctx, *f.table, f.path, PlacementDefault::every_active_cell);
    if (!place) continue;
    auto surface = read_period_values(ctx, *f.table, "surface", f.path, place->cells, std::nullopt,
                                      any_elevation);
    auto rate = read_period_values(ctx, *f.table, "max_rate", f.path, place->cells, std::nullopt,
                                   non_negative(ctx.velocity_unit()));
    auto depth =
        read_period_values(ctx, *f.table, "extinction_depth", f.path, place->cells, std::nullopt,
                           {[](double v) { return v > 0.0; }, "> 0 " + ctx.length_unit});
    if (!place->defaulted) warn_fixed_overlap(ctx, f.path, place->at, place->cells);
    if (surface && rate && depth)
      model.evapotranspiration.push_back({f.name, std::move(place->cells), std::move(*surface),
                                          std::move(*rate), std::move(*depth)});
  }
}

}  // namespace aquiledger
