// [[external_head]]: exchange with a head outside the model through a conductance.
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

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

}  // namespace aquiledger
