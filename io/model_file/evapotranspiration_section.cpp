// [[evapotranspiration]]: loss from a surface, falling to zero at the extinction depth.
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

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
