// [[drain]]: outflow above an elevation through a conductance, per period.
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

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

}  // namespace aquiledger
