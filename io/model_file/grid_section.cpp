// [model] and [grid]: units, the grid's shape (after the memory guard) and the active mask.
#include <cmath>
#include <limits>

#include "io/model_file/field_value.hpp"
#include "io/model_file/memory_guard.hpp"
#include "io/model_file/raster_file.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

void read_model_section(ReaderContext& ctx, const toml::table& root, Model& model) {
  model.title = ctx.model_file.stem().string();
  const toml::node* node = root.get("model");
  if (!node) return;
  const toml::table* t = node->as_table();
  if (!t) {
    ctx.error(*node, "[model]", "expected a table, found " + type_name(*node));
    return;
  }
  check_keys(ctx, *t, "[model]", {"title", "length_unit", "time_unit", "start_date"});
  if (auto title = read_string(ctx, *t, "title", "[model]", false)) model.title = *title;
  if (auto u = read_choice(ctx, *t, "length_unit", "[model]", {"m", "ft"})) model.length_unit = *u;
  if (auto u = read_choice(ctx, *t, "time_unit", "[model]", {"s", "min", "h", "d", "yr"}))
    model.time_unit = *u;
  ctx.length_unit = model.length_unit;
  ctx.time_unit = model.time_unit;
  if (auto start = read_calendar_time(ctx, *t, "start_date", "[model]", false)) {
    model.start_date = *start;
    ctx.clock = CalendarClock{*start, *seconds_per_time_unit(model.time_unit)};
  }
}

bool read_grid_shape(ReaderContext& ctx, const toml::table& root) {
  const toml::node* node = root.get("grid");
  if (!node) {
    ctx.error(ctx.file_spot(), "[grid]", "missing required section (nrow, ncol, dx, dy)");
    return false;
  }
  const toml::table* t = node->as_table();
  if (!t) {
    ctx.error(*node, "[grid]", "expected a table, found " + type_name(*node));
    return false;
  }
  const std::string path = "[grid]";
  check_keys(ctx, *t, path, {"nrow", "ncol", "dx", "dy", "origin", "active", "epsg"});
  if (auto epsg = read_integer(ctx, *t, "epsg", path, false)) {
    if (*epsg < 1 || *epsg > 999999 || !known_epsg(static_cast<int>(*epsg)))
      ctx.error(*t->get("epsg"), path + ".epsg",
                "EPSG:" + std::to_string(*epsg) +
                    " is not a coordinate system GDAL knows (expected an EPSG code such as 32633)");
    else
      ctx.epsg = static_cast<int>(*epsg);
  }
  auto nrow = read_integer(ctx, *t, "nrow", path, true);
  auto ncol = read_integer(ctx, *t, "ncol", path, true);
  if (!nrow || !ncol) return false;
  bool ok = true;
  if (*nrow < 1)
    ctx.error(*t->get("nrow"), path + ".nrow",
              "value " + std::to_string(*nrow) + "; expected >= 1"),
        ok = false;
  if (*ncol < 1)
    ctx.error(*t->get("ncol"), path + ".ncol",
              "value " + std::to_string(*ncol) + "; expected >= 1"),
        ok = false;
  if (!ok) return false;
  const double n_cells = static_cast<double>(*nrow) * static_cast<double>(*ncol);
  // Cell numbers travel as 32-bit integers.
  if (n_cells > static_cast<double>(std::numeric_limits<std::int32_t>::max())) {
    ctx.error(
        *t->get("nrow"), path + ".nrow",
        "nrow x ncol = " + show_number(n_cells) + " cells; at most 2147483647 cells are supported");
    return false;
  }
  // A process that keeps one band of rows needs the memory of its rows only.
  if (ctx.band_of) ctx.part = ctx.band_of(static_cast<int>(*nrow), static_cast<int>(*ncol));
  const double n_held =
      ctx.part ? static_cast<double>(ctx.part->n_held()) : static_cast<double>(n_cells);
  if (auto memory = usable_memory_bytes()) {
    if (auto refusal = memory_refusal(n_held, *memory, ctx.part.has_value())) {
      ctx.error(*t->get("nrow"), path + ".nrow", *refusal);
      return false;
    }
  }
  GridShape shape;
  shape.nrow = static_cast<int>(*nrow);
  shape.ncol = static_cast<int>(*ncol);
  auto dx = read_spacing(ctx, *t, "dx", path, shape.ncol, "ncol");
  auto dy = read_spacing(ctx, *t, "dy", path, shape.nrow, "nrow");
  if (const toml::node* o = t->get("origin")) {
    const toml::array* arr = o->as_array();
    std::optional<double> x, y;
    if (arr && arr->size() == 2) x = number_of((*arr)[0]), y = number_of((*arr)[1]);
    if (!x || !y) {
      ctx.error(
          *o, path + ".origin",
          "expected [x, y] of the south-west corner (" + ctx.length_unit + "), found " + show(*o));
      ok = false;
    } else {
      shape.x0 = *x;
      shape.y0 = *y;
    }
  }
  if (!dx || !dy || !ok) return false;
  shape.dx = std::move(*dx);
  shape.dy = std::move(*dy);
  ctx.shape = std::move(shape);
  return true;
}

void read_active_mask(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::table& t = *root.get("grid")->as_table();
  std::vector<std::uint8_t> active;
  if (const toml::node* node = t.get("active")) {
    // A mask raster takes the pixel at each cell's centre unless told otherwise.
    const toml::table* raster = node->as_table();
    auto field = raster && raster->contains("raster")
                     ? read_raster_table(ctx, *raster, "[grid].active", RasterMethod::nearest)
                     : read_field(ctx, *node, "[grid].active");
    if (!field) return;
    if (!check_field(
            ctx, *field, "[grid].active", [](double v) { return v == 0.0 || v == 1.0; },
            "1 (active) or 0 (outside the model)"))
      return;
    active.resize(field->values.size());
    for (std::size_t c = 0; c < active.size(); ++c) active[c] = field->values[c] != 0.0 ? 1 : 0;
    if (std::find(active.begin(), active.end(), 1) == active.end()) {
      ctx.error(*node, "[grid].active", "no cell is active; at least one cell must be 1");
      return;
    }
  }
  const GridShape& s = *ctx.shape;
  model.grid = RectilinearGrid(s.dx, s.dy, s.x0, s.y0, std::move(active));
  model.epsg = ctx.epsg;
  ctx.grid = model.grid;
  ctx.fixed.assign(static_cast<std::size_t>(s.n_cells()), 0);
}

}  // namespace aquiledger
