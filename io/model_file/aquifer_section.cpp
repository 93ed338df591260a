// [aquifer]: condition, geometry, conductivity, specific yield and one elastic storage route.
#include <cmath>

#include "io/model_file/array_source.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"
#include "io/model_file/unit_system.hpp"

namespace aquiledger {

namespace {

bool any_transient(const Model& model) {
  for (const Period& p : model.periods)
    if (!p.steady) return true;
  return model.periods.empty();
}

/// The mean over the active cells the field holds (a band's only, when reading a band).
double active_mean(const ReaderContext& ctx, const CellField& f) {
  double sum = 0.0;
  int n = 0;
  const auto first = static_cast<std::size_t>(f.first);
  for (std::size_t k = 0; k < f.values.size(); ++k)
    if (ctx.grid->is_active(CellIndex{static_cast<std::int32_t>(first + k)}))
      sum += f.values[k], ++n;
  return n > 0 ? sum / n : 0.0;
}

/// compressibility = { skeleton, porosity, water, density, gravity }: Ss = rho g (alpha + n beta)
/// (Jacob, 1940), in 1/m, converted to the model's length unit.
void read_compressibility(ReaderContext& ctx, const toml::node& node, Model& model) {
  const std::string path = "[aquifer].compressibility";
  const toml::table* t = node.as_table();
  if (!t) {
    ctx.error(node, path,
              "expected { skeleton = (1/Pa), porosity = (-) }, found " + type_name(node) + " " +
                  show(node));
    return;
  }
  check_keys(ctx, *t, path, {"skeleton", "porosity", "water", "density", "gravity"});
  auto alpha = read_field_key(ctx, *t, "skeleton", path, true);
  auto n = read_field_key(ctx, *t, "porosity", path, true);
  Compressibility c;  // defaults for water, density and gravity: solver/model.hpp
  c.water = read_number(ctx, *t, "water", path, false).value_or(c.water);
  c.density = read_number(ctx, *t, "density", path, false).value_or(c.density);
  c.gravity = read_number(ctx, *t, "gravity", path, false).value_or(c.gravity);
  bool ok = alpha && n;
  if (alpha)
    ok &= check_field(
        ctx, *alpha, path + ".skeleton", [](double v) { return v >= 0.0; }, ">= 0 1/Pa");
  if (n)
    ok &= check_field(
        ctx, *n, path + ".porosity", [](double v) { return v > 0.0 && v < 1.0; },
        "a porosity in (0, 1)");
  auto positive = [&](double v, const char* key, const char* unit) {
    if (v > 0.0) return true;
    ctx.error(*t, path + "." + key, "value " + show_number(v) + "; expected > 0 " + unit);
    return false;
  };
  ok &= positive(c.density, "density", "kg/m3");
  ok &= positive(c.gravity, "gravity", "m/s2");
  if (c.water < 0.0)
    ctx.error(*t, path + ".water", "value " + show_number(c.water) + "; expected >= 0 1/Pa"),
        ok = false;
  if (!ok || !ctx.grid) return;
  const double metres_per_unit = metres_per_length_unit(model.length_unit);  // 1/m -> 1/L
  Aquifer& a = model.aquifer;
  const std::size_t n_held = alpha->values.size();
  std::vector<double> ss(n_held), share(n_held);
  for (std::size_t k = 0; k < n_held; ++k) {
    ss[k] = specific_storage_per_metre(c, alpha->values[k], n->values[k]) * metres_per_unit;
    share[k] = skeleton_share_of_storage(c, alpha->values[k], n->values[k]);
  }
  a.specific_storage = CellArray<double>(std::move(ss), alpha->first);
  a.skeleton_share = CellArray<double>(std::move(share), alpha->first);
  c.skeleton = active_mean(ctx, *alpha);
  c.porosity = active_mean(ctx, *n);
  a.compressibility = c;
}

/// condition = "confined" | "water_table" | "switching" (required).
std::optional<Condition> read_condition(ReaderContext& ctx, const toml::table& t,
                                        const std::string& path) {
  auto condition = read_choice(ctx, t, "condition", path, {"confined", "water_table", "switching"});
  if (!t.contains("condition"))
    ctx.error(t, path + ".condition",
              "missing required key (expected confined | water_table | switching)");
  if (!condition) return std::nullopt;
  return *condition == "confined"      ? Condition::confined
         : *condition == "water_table" ? Condition::water_table
                                       : Condition::switching;
}

const char* condition_word(Condition c) {
  return c == Condition::confined      ? "confined"
         : c == Condition::water_table ? "water_table"
                                       : "switching";
}

/// The aquifer's geometry and conductivity as read, each checked.
struct GeometryFields {
  std::optional<CellField> top, bottom, k, ratio;
};

/// top (required unless water_table), bottom, k and k_ratio, with top above bottom.
GeometryFields read_geometry(ReaderContext& ctx, const toml::table& t, const std::string& path,
                             bool needs_top) {
  GeometryFields g;
  g.top = read_field_key(ctx, t, "top", path, needs_top);
  g.bottom = read_field_key(ctx, t, "bottom", path, true);
  g.k = read_field_key(ctx, t, "k", path, true);
  g.ratio = read_field_key(ctx, t, "k_ratio", path, false);
  if (g.k)
    check_field(
        ctx, *g.k, path + ".k", [](double v) { return v > 0.0; },
        "> 0 " + ctx.velocity_unit() + " (hydraulic conductivity)");
  if (g.ratio)
    check_field(
        ctx, *g.ratio, path + ".k_ratio", [](double v) { return v > 0.0; }, "> 0 (Ky / Kx)");
  if (g.bottom)
    check_field(
        ctx, *g.bottom, path + ".bottom", [](double v) { return std::isfinite(v); },
        "an elevation in " + ctx.length_unit);
  if (g.top && g.bottom) {
    CellField gap = *g.top;
    for (std::size_t c = 0; c < gap.values.size(); ++c)
      gap.values[c] = g.top->values[c] - g.bottom->values[c];
    check_field(
        ctx, gap, path + ".top", [](double v) { return v > 0.0; },
        "top above bottom (top - bottom > 0 " + ctx.length_unit +
            "; the value shown is top - bottom)");
  }
  return g;
}

/// specific_yield: required unless confined (ignored with a warning there).
std::optional<CellField> read_specific_yield(ReaderContext& ctx, const toml::table& t,
                                             const std::string& path, bool known, bool needs_sy) {
  auto sy = read_field_key(ctx, t, "specific_yield", path, needs_sy);
  if (sy && known && !needs_sy)
    ctx.warning(sy->at, path + ".specific_yield",
                "ignored: a confined aquifer has no specific yield");
  else if (sy)
    check_field(
        ctx, *sy, path + ".specific_yield", [](double v) { return v > 0.0 && v < 1.0; },
        "a fraction in (0, 1)");
  return sy;
}

/// Storage under pressure by exactly one route: specific_storage, storativity (divided by
/// top - bottom) or compressibility (which fills model.aquifer itself). Returns Ss per cell
/// for the first two routes.
std::optional<CellField> read_elastic_storage(ReaderContext& ctx, const toml::table& t,
                                              const std::string& path,
                                              std::optional<Condition> condition,
                                              const GeometryFields& g, Model& model) {
  const bool needs_storage = condition && *condition != Condition::water_table;
  const char* routes[] = {"specific_storage", "storativity", "compressibility"};
  std::vector<std::string> given;
  for (const char* r : routes)
    if (t.contains(r)) given.emplace_back(r);
  if (given.size() > 1) {
    ctx.error(*t.get(given[1]), path + "." + given[1],
              "give one storage input, not several (found " + given[0] + " and " + given[1] +
                  "; choose specific_storage, storativity or compressibility)");
  } else if (given.empty() && needs_storage && any_transient(model)) {
    ctx.error(t, path + ".specific_storage",
              std::string("missing storage input for a transient ") + condition_word(*condition) +
                  " model: give specific_storage (1/" + ctx.length_unit +
                  "), storativity (-) or compressibility (1/Pa)");
  }
  if (given.size() != 1) return std::nullopt;
  if (condition == Condition::water_table)
    ctx.warning(ctx.spot(*t.get(given[0])), path + "." + given[0],
                "ignored: water_table cells store water by specific yield only");

  std::optional<CellField> ss;
  if (given[0] == "specific_storage") {
    ss = read_field_key(ctx, t, "specific_storage", path, true);
    if (ss)
      check_field(
          ctx, *ss, path + ".specific_storage", [](double v) { return v >= 0.0; },
          ">= 0 1/" + ctx.length_unit);
  } else if (given[0] == "storativity") {
    auto s = read_field_key(ctx, t, "storativity", path, true);
    if (s && check_field(
                 ctx, *s, path + ".storativity", [](double v) { return v >= 0.0; },
                 ">= 0 (dimensionless)")) {
      if (!g.top) {
        ctx.error(s->at, path + ".storativity",
                  "storativity needs [aquifer].top (Ss = S / (top - bottom))");
      } else if (g.bottom) {
        ss = *s;
        for (std::size_t c = 0; c < ss->values.size(); ++c)
          ss->values[c] = s->values[c] / (g.top->values[c] - g.bottom->values[c]);
      }
    }
  } else {
    read_compressibility(ctx, *t.get("compressibility"), model);
  }
  return ss;
}

}  // namespace

void read_aquifer(ReaderContext& ctx, const toml::table& root, Model& model) {
  const std::string path = "[aquifer]";
  const toml::node* node = root.get("aquifer");
  if (!node || !node->as_table()) {
    if (node)
      ctx.error(*node, path, "expected a table, found " + type_name(*node));
    else
      ctx.error(ctx.file_spot(), path, "missing required section (bottom, k, condition, storage)");
    return;
  }
  const toml::table& t = *node->as_table();
  check_keys(ctx, t, path,
             {"top", "bottom", "k", "k_ratio", "condition", "specific_yield", "specific_storage",
              "storativity", "compressibility", "land_surface"});
  Aquifer& a = model.aquifer;
  const std::optional<Condition> condition = read_condition(ctx, t, path);
  if (condition) a.condition = *condition;
  const bool known = condition.has_value();
  GeometryFields g = read_geometry(ctx, t, path, known && a.condition != Condition::water_table);
  const bool needs_sy = known && a.condition != Condition::confined;
  std::optional<CellField> sy = read_specific_yield(ctx, t, path, known, needs_sy);
  std::optional<CellField> ss = read_elastic_storage(ctx, t, path, condition, g, model);
  std::optional<CellField> land = read_field_key(ctx, t, "land_surface", path, false);
  if (land)
    check_field(
        ctx, *land, path + ".land_surface", [](double v) { return std::isfinite(v); },
        "a ground elevation in " + ctx.length_unit);
  if (ctx.diagnostics.has_errors() || !ctx.grid || !g.k || !g.bottom) return;

  // Everything checked: the per-cell arrays of the model.
  const std::size_t n = g.k->values.size();
  const std::int32_t first = g.k->first;  // every field of the section holds the same rows
  a.kx = CellArray<double>(g.k->values, first);
  a.ky = CellArray<double>(g.k->values, first);
  for (const auto* f : {&g.k, &sy, &ss})
    if (*f && !(*f)->zone.empty())
      model.zone_maps.push_back({f == &g.k  ? "k"
                                 : f == &sy ? "specific_yield"
                                            : "specific_storage",
                                 (*f)->zone});
  if (g.ratio)
    for (std::size_t k = 0; k < n; ++k) a.ky.values()[k] *= g.ratio->values[k];
  a.bottom = g.bottom->take();
  a.top = g.top ? g.top->take() : CellArray<double>(std::vector<double>(n, std::nan("")), first);
  if (sy && needs_sy) a.specific_yield = sy->take();
  if (ss) a.specific_storage = ss->take();
  if (a.specific_storage.empty())
    a.specific_storage = CellArray<double>(std::vector<double>(n), first);
  if (land) a.land_surface = land->take();
}

}  // namespace aquiledger
