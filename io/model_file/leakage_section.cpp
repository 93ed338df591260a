// [leakage]: exchange through a confining layer with a source head, by leakance.
#include <cmath>

#include "io/model_file/feature_placement.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

void read_leakage(ReaderContext& ctx, const toml::table& root, Model& model) {
  const std::string path = "[leakage]";
  const toml::node* node = root.get("leakage");
  if (!node) return;
  const toml::table* t = node->as_table();
  if (!t) {
    ctx.error(*node, path, "expected a table, found " + type_name(*node));
    return;
  }
  check_keys(ctx, *t, path, {"source_head", "aquitard", "leakance"});
  const toml::node* aquifer = root.get("aquifer");
  const bool has_top = aquifer && aquifer->as_table() && aquifer->as_table()->contains("top");
  if (!has_top)
    ctx.error(*t, path,
              "leakage through an aquitard above needs [aquifer].top (the base of the aquitard)");
  if (!ctx.grid) return;
  Leakage leak;
  for (int c = 0; c < ctx.grid->n_cells(); ++c)
    if (ctx.grid->is_active(CellIndex{c})) leak.cells.push_back(CellIndex{c});
  auto source = read_period_values(ctx, *t, "source_head", path, leak.cells, std::nullopt,
                                   {[](double v) { return std::isfinite(v); }, "an elevation"});
  const bool by_aquitard = t->contains("aquitard"), by_value = t->contains("leakance");
  std::optional<PeriodValues> leakance;
  if (by_aquitard == by_value) {
    ctx.error(*t, path + (by_value ? ".leakance" : ".aquitard"),
              by_value ? "give leakance or aquitard = { k, thickness }, not both"
                       : "missing required key: aquitard = { k = (" + ctx.velocity_unit() +
                             "), thickness = (" + ctx.length_unit + ") } or leakance (1/" +
                             ctx.time_unit + ")");
  } else if (by_value) {
    leakance = read_period_values(ctx, *t, "leakance", path, leak.cells, std::nullopt,
                                  {[](double v) { return v >= 0.0; }, ">= 0 1/" + ctx.time_unit});
  } else {
    const std::string apath = path + ".aquitard";
    const toml::node& a = *t->get("aquitard");
    if (!a.as_table()) {
      ctx.error(a, apath,
                "expected { k = (" + ctx.velocity_unit() + "), thickness = (" + ctx.length_unit +
                    ") }, found " + type_name(a));
    } else {
      check_keys(ctx, *a.as_table(), apath, {"k", "thickness"});
      auto k = read_field_key(ctx, *a.as_table(), "k", apath, true);
      auto b = read_field_key(ctx, *a.as_table(), "thickness", apath, true);
      bool ok = k && b;
      if (k)
        ok &= check_field(
            ctx, *k, apath + ".k", [](double v) { return v >= 0.0; },
            ">= 0 " + ctx.velocity_unit());
      if (b)
        ok &= check_field(
            ctx, *b, apath + ".thickness", [](double v) { return v > 0.0; },
            "> 0 " + ctx.length_unit);
      if (ok) {
        std::vector<double> table;
        table.reserve(leak.cells.size());
        bool uniform = k->uniform && b->uniform;
        for (CellIndex c : leak.cells)
          table.push_back(k->values[std::size_t(c.value)] / b->values[std::size_t(c.value)]);
        if (uniform) table.resize(1);
        leakance = PeriodValues({std::move(table)}, {});
      }
    }
  }
  if (!source || !leakance || !has_top) return;
  leak.source_head = std::move(*source);
  leak.leakance = std::move(*leakance);
  model.leakage = std::move(leak);
}

}  // namespace aquiledger
