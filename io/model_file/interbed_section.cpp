// [interbeds]: fine-grained beds within the aquifer that equilibrate within a step (no delay):
// thickness, elastic and inelastic skeletal specific storage, initial preconsolidation head
// (docs/model-format.md, docs/subsidence.md).
#include <cmath>

#include "io/model_file/field_value.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

void read_interbeds(ReaderContext& ctx, const toml::table& root, Model& model) {
  const std::string path = "[interbeds]";
  const toml::node* node = root.get("interbeds");
  if (!node) return;
  const toml::table* t = node->as_table();
  if (!t) {
    ctx.error(*node, path, "expected a table, found " + type_name(*node));
    return;
  }
  check_keys(ctx, *t, path,
             {"thickness", "elastic_storage", "inelastic_storage", "preconsolidation_head",
              "preconsolidation_below_initial"});
  const std::string per_length = ">= 0 1/" + ctx.length_unit;
  auto b = read_field_key(ctx, *t, "thickness", path, true);
  auto ske = read_field_key(ctx, *t, "elastic_storage", path, true);
  auto skv = read_field_key(ctx, *t, "inelastic_storage", path, true);
  bool ok = b && ske && skv;
  if (b)
    ok &= check_field(
        ctx, *b, path + ".thickness", [](double v) { return v >= 0.0; },
        ">= 0 " + ctx.length_unit + " (total thickness of the beds in the cell)");
  if (ske)
    ok &= check_field(
        ctx, *ske, path + ".elastic_storage", [](double v) { return v >= 0.0; }, per_length);
  if (skv)
    ok &= check_field(
        ctx, *skv, path + ".inelastic_storage", [](double v) { return v >= 0.0; }, per_length);
  // Thickness within the aquifer where it has a top.
  if (b && ok && model.aquifer.top.size() == b->values.size() &&
      model.aquifer.bottom.size() == b->values.size())
    for (std::size_t k = 0; k < b->values.size(); ++k) {
      const std::size_t i = k + static_cast<std::size_t>(b->first);  // grid cell
      const double full = model.aquifer.top[i] - model.aquifer.bottom[i];
      if (ctx.grid && ctx.grid->is_active(CellIndex{static_cast<std::int32_t>(i)}) &&
          std::isfinite(full) && b->values[k] > full) {
        ctx.error(field_cell_spot(*b, ctx.grid->n_cols(), static_cast<int>(i)), path + ".thickness",
                  "value " + show_number(b->values[k]) + " in row " +
                      std::to_string(i / static_cast<std::size_t>(ctx.grid->n_cols()) + 1) +
                      ", col " +
                      std::to_string(i % static_cast<std::size_t>(ctx.grid->n_cols()) + 1) +
                      "; expected at most the aquifer's thickness top - bottom (" +
                      show_number(full) + " " + ctx.length_unit + ")");
        ok = false;
        break;
      }
    }
  const bool by_field = t->contains("preconsolidation_head");
  const bool by_offset = t->contains("preconsolidation_below_initial");
  Interbeds ib;
  if (by_field == by_offset) {
    ctx.error(*t, path + (by_field ? ".preconsolidation_below_initial" : ".preconsolidation_head"),
              by_field ? "give preconsolidation_head or preconsolidation_below_initial, not both"
                       : "missing required key: preconsolidation_head (" + ctx.length_unit +
                             ", a field) or preconsolidation_below_initial (" + ctx.length_unit +
                             ", >= 0)");
    ok = false;
  } else if (by_field) {
    auto pc = read_field_key(ctx, *t, "preconsolidation_head", path, true);
    ok &=
        pc && check_field(
                  ctx, *pc, path + ".preconsolidation_head",
                  [](double v) { return std::isfinite(v); }, "an elevation in " + ctx.length_unit);
    if (pc) ib.preconsolidation = pc->take();
  } else {
    const auto offset = read_number(ctx, *t, "preconsolidation_below_initial", path, true);
    if (offset && !(*offset >= 0.0)) {
      ctx.error(*t->get("preconsolidation_below_initial"), path + ".preconsolidation_below_initial",
                "value " + show_number(*offset) + "; expected >= 0 " + ctx.length_unit);
      ok = false;
    }
    ok &= offset.has_value();
    if (offset) ib.preconsolidation_offset = *offset;
  }
  if (!ok || ctx.diagnostics.has_errors()) return;
  ib.thickness = b->take();
  ib.elastic_storage = ske->take();
  ib.inelastic_storage = skv->take();
  model.aquifer.interbeds = std::move(ib);
}

}  // namespace aquiledger
