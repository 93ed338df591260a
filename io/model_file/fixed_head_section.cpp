// [[fixed_head]]: cells whose head is given per period (they are not unknowns).
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

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

}  // namespace aquiledger
