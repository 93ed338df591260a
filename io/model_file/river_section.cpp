// [[river]]: channel length per cell and bed conductance (or bed = { k, thickness, width }).
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

std::optional<double> positive_number(ReaderContext& ctx, const toml::table& t,
                                      std::string_view key, const std::string& path,
                                      const std::string& unit) {
  auto v = read_number(ctx, t, key, path, true);
  if (v && !(*v > 0.0)) {
    ctx.error(*t.get(key), key_path(path, key),
              "value " + show_number(*v) + "; expected > 0 " + unit);
    return std::nullopt;
  }
  return v;
}

/// bed = { k, thickness, width }: conductance per unit channel length = k width / thickness (L/T).
std::optional<double> bed_conductance_per_length(ReaderContext& ctx, const toml::node& node,
                                                 const std::string& path) {
  const toml::table* t = node.as_table();
  if (!t) {
    ctx.error(node, path,
              "expected { k = (" + ctx.velocity_unit() + "), thickness = (" + ctx.length_unit +
                  "), width = (" + ctx.length_unit + ") }, found " + type_name(node));
    return std::nullopt;
  }
  check_keys(ctx, *t, path, {"k", "thickness", "width"});
  auto k = positive_number(ctx, *t, "k", path, ctx.velocity_unit());
  auto thickness = positive_number(ctx, *t, "thickness", path, ctx.length_unit);
  auto width = positive_number(ctx, *t, "width", path, ctx.length_unit);
  if (!k || !thickness || !width) return std::nullopt;
  return *k * *width / *thickness;
}

}  // namespace

void read_rivers(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::array* arr = section_tables(ctx, root, "river");
  if (!arr) return;
  NameSet names;
  for (std::size_t i = 0; i < arr->size(); ++i) {
    const toml::table& t = *(*arr)[i].as_table();
    const std::string path = feature_path("river", t, i);
    check_keys(ctx, t, path,
               {"name", "edge", "cells", "mask", "polyline", "x", "y", "stage", "bed_bottom",
                "bed_conductance", "bed"});
    River r;
    r.name = read_string(ctx, t, "name", path, false).value_or("river " + std::to_string(i + 1));
    check_unique_name(ctx, t, path, r.name, names);
    const bool by_value = t.contains("bed_conductance"), by_bed = t.contains("bed");
    if (by_value == by_bed)
      ctx.error(t, path + (by_bed ? ".bed" : ".bed_conductance"),
                by_bed ? "give bed_conductance or bed = { k, thickness, width }, not both"
                       : "missing required key: bed_conductance (" + ctx.velocity_unit() +
                             " per unit channel length) or bed = { k, thickness, width }");
    auto place = read_placement(ctx, t, path, PlacementDefault::required);
    if (!place) continue;
    // With cells or a mask each cell counts one length unit of channel: bed_conductance is
    // then the conductance of the cell (L2/T).
    r.cells = place->cells;
    r.length = place->polyline ? place->length : std::vector<double>(place->cells.size(), 1.0);
    // Stage and bed bottom may be given at the vertices of a polyline channel.
    const ValueForms along{{}, place->polyline ? &*place : nullptr};
    auto stage =
        read_period_values(ctx, t, "stage", path, r.cells, std::nullopt,
                           {[](double v) { return std::isfinite(v); }, "an elevation"}, along);
    auto bottom =
        read_period_values(ctx, t, "bed_bottom", path, r.cells, std::nullopt,
                           {[](double v) { return std::isfinite(v); }, "an elevation"}, along);
    std::optional<PeriodValues> per_length;
    if (by_value && !by_bed) {
      per_length = read_period_values(ctx, t, "bed_conductance", path, r.cells, std::nullopt,
                                      {[](double v) { return v >= 0.0; },
                                       ">= 0 " + ctx.velocity_unit() + " per unit channel length"});
    } else if (by_bed && !by_value) {
      if (auto c = bed_conductance_per_length(ctx, *t.get("bed"), path + ".bed"))
        per_length = PeriodValues(*c);
    }
    warn_fixed_overlap(ctx, path, place->at, r.cells);
    if (!stage || !bottom || !per_length) continue;
    r.stage = std::move(*stage);
    r.bed_bottom = std::move(*bottom);
    r.conductance = scale_by_cell(*per_length, r.length);
    model.rivers.push_back(std::move(r));
  }
}

}  // namespace aquiledger
