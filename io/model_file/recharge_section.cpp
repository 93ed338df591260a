// [[recharge]]: a rate per unit area per period, on every active cell unless placed.
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

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

}  // namespace aquiledger
