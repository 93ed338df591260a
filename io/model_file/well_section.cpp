// [[well]]: a well at (x, y) pumping a rate per period (positive = withdrawal).
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

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

}  // namespace aquiledger
