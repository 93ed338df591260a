// [interbeds]: fine-grained beds within the aquifer that equilibrate within a step (no delay):
// thickness, elastic and inelastic skeletal specific storage, initial preconsolidation head;
// optionally delay beds (number, equivalent thickness, Kv, Ske, Skv, nodes per half-bed)
// (docs/model-format.md, docs/subsidence.md).
#include <cmath>

#include "io/model_file/field_value.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

/// The delay-bed keys of [interbeds]; nullopt after reporting. no_delay: the no-delay beds'
/// thickness (for the check that all beds fit in the aquifer), null when it was refused.
std::optional<DelayBeds> read_delay_bed_keys(ReaderContext& ctx, const toml::table& t,
                                             const std::string& path, const Model& model,
                                             const CellField* no_delay) {
  auto count = read_field_key(ctx, t, "delay_beds", path, true);
  auto b = read_field_key(ctx, t, "delay_bed_thickness", path, true);
  auto kv = read_field_key(ctx, t, "delay_bed_vertical_k", path, true);
  auto ske = read_field_key(ctx, t, "delay_bed_elastic_storage", path, true);
  auto skv = read_field_key(ctx, t, "delay_bed_inelastic_storage", path, true);
  const auto nodes = read_integer(ctx, t, "delay_bed_nodes", path, false);
  bool ok = count && b && kv && ske && skv;
  if (nodes && (*nodes < 1 || *nodes > 1000)) {
    ctx.error(*t.get("delay_bed_nodes"), path + ".delay_bed_nodes",
              "value " + std::to_string(*nodes) + "; expected 1 .. 1000 (slices of a half-bed)");
    ok = false;
  }
  if (!ok) return std::nullopt;
  const std::string per_length = "> 0 1/" + ctx.length_unit + " where delay_beds > 0";
  ok &= check_field(
      ctx, *count, path + ".delay_beds", [](double v) { return v >= 0.0 && std::isfinite(v); },
      ">= 0 (number of delay beds in the cell)");
  // The other fields matter only where the cell has beds; the check runs cell by cell.
  auto where_beds = [&](const CellField& f, const std::string& key, const std::string& expected) {
    const CellWindow<const double> n = count->cells();
    const CellWindow<const double> v = f.cells();
    int bad = -1, n_bad = 0;
    for (std::size_t k = 0; k < f.values.size(); ++k) {
      const std::size_t i = k + static_cast<std::size_t>(f.first);
      if (ctx.grid && !ctx.grid->is_active(CellIndex{static_cast<std::int32_t>(i)})) continue;
      if (n[i] > 0.0 && !(v[i] > 0.0 && std::isfinite(v[i]))) {
        if (bad < 0) bad = static_cast<int>(i);
        ++n_bad;
      }
    }
    if (bad < 0) return true;
    const int cols = ctx.grid ? ctx.grid->n_cols() : 1;
    ctx.error(field_cell_spot(f, cols, bad), path + "." + key,
              "value " + show_number(v[static_cast<std::size_t>(bad)]) + " in row " +
                  std::to_string(bad / cols + 1) + ", col " + std::to_string(bad % cols + 1) +
                  " (" + std::to_string(n_bad) + " cells in all); expected " + expected);
    return false;
  };
  ok &= where_beds(*b, "delay_bed_thickness",
                   "> 0 " + ctx.length_unit + " where delay_beds > 0 (one bed's thickness)");
  ok &= where_beds(*kv, "delay_bed_vertical_k",
                   "> 0 " + ctx.length_unit + "/" + ctx.time_unit + " where delay_beds > 0");
  ok &= where_beds(*ske, "delay_bed_elastic_storage", per_length);
  ok &= where_beds(*skv, "delay_bed_inelastic_storage", per_length);
  // All beds together within the aquifer where it has a top.
  if (ok && ctx.grid && model.aquifer.top.size() == b->values.size() &&
      model.aquifer.bottom.size() == b->values.size())
    for (std::size_t k = 0; k < b->values.size(); ++k) {
      const std::size_t i = k + static_cast<std::size_t>(b->first);
      const double full = model.aquifer.top[i] - model.aquifer.bottom[i];
      const double beds =
          count->values[k] * b->values[k] +
          (no_delay && no_delay->values.size() == b->values.size() ? no_delay->values[k] : 0.0);
      if (ctx.grid->is_active(CellIndex{static_cast<std::int32_t>(i)}) && std::isfinite(full) &&
          count->values[k] > 0.0 && beds > full) {
        const int cols = ctx.grid->n_cols();
        ctx.error(field_cell_spot(*b, cols, static_cast<int>(i)), path + ".delay_bed_thickness",
                  "value " + show_number(b->values[k]) + " in row " +
                      std::to_string(static_cast<int>(i) / cols + 1) + ", col " +
                      std::to_string(static_cast<int>(i) % cols + 1) +
                      "; delay_beds times delay_bed_thickness plus thickness is " +
                      show_number(beds) + ", expected at most the aquifer's thickness top - " +
                      "bottom (" + show_number(full) + " " + ctx.length_unit + ")");
        ok = false;
        break;
      }
    }
  if (!ok) return std::nullopt;
  DelayBeds d;
  d.count = count->take();
  d.thickness = b->take();
  d.vertical_k = kv->take();
  d.elastic_storage = ske->take();
  d.inelastic_storage = skv->take();
  if (nodes) d.nodes = static_cast<int>(*nodes);
  return d;
}

}  // namespace

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
              "preconsolidation_below_initial", "delay_beds", "delay_bed_thickness",
              "delay_bed_vertical_k", "delay_bed_elastic_storage", "delay_bed_inelastic_storage",
              "delay_bed_nodes"});
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
  std::optional<DelayBeds> delay;
  if (t->contains("delay_beds")) {
    delay = read_delay_bed_keys(ctx, *t, path, model, b ? &*b : nullptr);
    ok &= delay.has_value();
  } else {
    for (const char* key :
         {"delay_bed_thickness", "delay_bed_vertical_k", "delay_bed_elastic_storage",
          "delay_bed_inelastic_storage", "delay_bed_nodes"})
      if (const toml::node* n = t->get(key)) {
        ctx.error(*n, path + "." + key, "needs delay_beds (the number of delay beds per cell)");
        ok = false;
      }
  }
  if (!ok || ctx.diagnostics.has_errors()) return;
  ib.delay = std::move(delay);
  ib.thickness = b->take();
  ib.elastic_storage = ske->take();
  ib.inelastic_storage = skv->take();
  model.aquifer.interbeds = std::move(ib);
}

}  // namespace aquiledger
