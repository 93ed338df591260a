#include "io/model_file/field_value.hpp"

#include <cmath>
#include <set>

#include "io/files/input_file_guard.hpp"
#include "io/model_file/raster_file.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

const ArraySource* load_cached(ReaderContext& ctx, const std::filesystem::path& file,
                               const SourceSpot& at, const std::string& key) {
  auto it = ctx.array_cache.find(file);
  // A file read for other rows than those wanted now (the active mask and the features take
  // whole grids, the per-cell sections a band) is read again for these.
  const auto rows = [](const std::optional<RowBand>& b) {
    return b ? std::pair{b->first, b->count} : std::pair{-1, -1};
  };
  if (it != ctx.array_cache.end() && rows(it->second.band) != rows(ctx.band)) {
    ctx.array_cache.erase(it);
    it = ctx.array_cache.end();
  }
  if (it == ctx.array_cache.end()) {
    // No array can need more values than the grid has cells.
    // (dx and dy files are read before the grid is known: at most 10 million values.)
    const double n_values =
        ctx.shape ? static_cast<double>(ctx.shape->nrow) * ctx.shape->ncol : 1.0e7;
    it = ctx.array_cache
             .emplace(file, load_array_source(file, max_array_file_bytes(n_values), ctx.band))
             .first;
  }
  const ArraySource& src = it->second;
  if (!src.refusal.empty()) {
    ctx.error(at, key, "array file " + src.refusal);
    return nullptr;
  }
  if (!src.readable) {
    ctx.error(at, key,
              "cannot open array file '" + file.string() +
                  "' (relative paths start in the model file's folder)");
    return nullptr;
  }
  return &src;
}

namespace {

bool close(double a, double b, double scale) {
  return std::abs(a - b) <= 1.0e-6 * std::max(1.0, std::abs(scale));
}

/// Checks a raster's header against the grid; one message per mismatch.
bool check_raster_header(ReaderContext& ctx, const ArraySource& src, const std::string& key) {
  const GridShape& g = *ctx.shape;
  const RasterHeader& h = *src.raster;
  const SourceSpot at{src.file, 1, 0};
  bool ok = true;
  auto mismatch = [&](const std::string& what) {
    ctx.error(at, key, "raster header does not match the grid: " + what);
    ok = false;
  };
  if (h.ncols != g.ncol)
    mismatch("ncols " + std::to_string(h.ncols) + ", grid ncol " + std::to_string(g.ncol));
  if (h.nrows != g.nrow)
    mismatch("nrows " + std::to_string(h.nrows) + ", grid nrow " + std::to_string(g.nrow));
  const bool uniform_dx = std::all_of(g.dx.begin(), g.dx.end(),
                                      [&](double w) { return close(w, h.cellsize, h.cellsize); });
  const bool uniform_dy = std::all_of(g.dy.begin(), g.dy.end(),
                                      [&](double w) { return close(w, h.cellsize, h.cellsize); });
  if (!uniform_dx || !uniform_dy)
    mismatch("cellsize " + show_number(h.cellsize) + " " + ctx.length_unit +
             ", but the grid's dx/dy are not all equal to it (a raster needs a uniform grid)");
  const double half = h.centre_given ? 0.5 * h.cellsize : 0.0;
  if (!close(h.xll - half, g.x0, h.cellsize) || !close(h.yll - half, g.y0, h.cellsize))
    mismatch("lower-left corner (" + show_number(h.xll - half) + ", " + show_number(h.yll - half) +
             "), grid origin (" + show_number(g.x0) + ", " + show_number(g.y0) + ")");
  return ok;
}

/// Copies a full nrow x ncol array file into the field, checking its shape.
bool fill_from_file(ReaderContext& ctx, const ArraySource& src, const std::string& key,
                    CellField& field) {
  const GridShape& g = *ctx.shape;
  bool ok = true;
  for (const ArrayProblem& p : src.problems) {
    ctx.error(SourceSpot{src.file, p.line, 0}, key, p.message);
    ok = false;
  }
  if (src.raster && !check_raster_header(ctx, src, key)) return false;
  if (static_cast<int>(src.rows.size()) != g.nrow) {
    const int line = src.rows.empty() ? 0 : src.rows.back().line;
    ctx.error(SourceSpot{src.file, line, 0}, key,
              "array has " + std::to_string(src.rows.size()) + " rows of values, expected nrow = " +
                  std::to_string(g.nrow) + " (one grid row per line, northern row first)");
    return false;
  }
  for (const ArrayRow& row : src.rows) {
    if (static_cast<int>(row.n_values) != g.ncol) {
      ctx.error(SourceSpot{src.file, row.line, 0}, key,
                "line has " + std::to_string(row.n_values) +
                    " values, expected ncol = " + std::to_string(g.ncol));
      ok = false;
    }
  }
  if (!ok) return false;
  const RowBand band = src.band ? *src.band : RowBand{0, g.nrow};
  field.first = band.first * g.ncol;
  field.values.resize(static_cast<std::size_t>(band.count) * g.ncol);
  field.row_line.resize(static_cast<std::size_t>(g.nrow));
  for (int r = 0; r < g.nrow; ++r) field.row_line[r] = src.rows[r].line;
  for (int r = band.first; r < band.end(); ++r)
    std::copy(src.rows[r].values.begin(), src.rows[r].values.end(),
              field.values.begin() + std::ptrdiff_t(r - band.first) * g.ncol);
  field.file = src.file;
  return true;
}

bool active_cell(const ReaderContext& ctx, std::size_t c) {
  return !ctx.grid || ctx.grid->is_active(CellIndex{static_cast<std::int32_t>(c)});
}

/// { zones = "file", values = { 1 = 12.5, ... } }
std::optional<CellField> read_zones(ReaderContext& ctx, const toml::table& t,
                                    const std::string& key, CellField field) {
  check_keys(ctx, t, key, {"zones", "values"});
  auto file = read_string(ctx, t, "zones", key, true);
  const toml::node* values_node = t.get("values");
  if (!values_node) {
    ctx.error(
        t, key + ".values",
        "missing required key (expected a table of zone = value, e.g. { 1 = 12.5, 2 = 0.8 })");
    return std::nullopt;
  }
  const toml::table* values = values_node->as_table();
  if (!values) {
    ctx.error(*values_node, key + ".values",
              "expected a table of zone = value, found " + type_name(*values_node));
    return std::nullopt;
  }
  std::map<long long, double> zone_value;
  bool ok = true;
  for (auto&& [zone_key, v] : *values) {
    auto zone = parse_value(std::string(zone_key.str()));
    auto number = number_of(v);
    if (!zone || *zone != std::floor(*zone)) {
      ctx.error(ctx.spot(zone_key.source()), key + ".values",
                "zone '" + std::string(zone_key.str()) + "' is not an integer zone number");
      ok = false;
    } else if (!number) {
      ctx.error(v, key + ".values." + std::string(zone_key.str()),
                "expected a number, found " + type_name(v));
      ok = false;
    } else {
      zone_value[static_cast<long long>(*zone)] = *number;
    }
  }
  if (!file || !ok) return std::nullopt;
  CellField zones = field;
  if (looks_like_gdal_raster(*file)) {
    // A zone raster: the zone at each cell's centre.
    auto read = read_raster_field(ctx, ctx.resolve(*file), 1, RasterMethod::nearest,
                                  ctx.spot(*t.get("zones")), key + ".zones");
    if (!read) return std::nullopt;
    zones = std::move(*read);
  } else {
    const ArraySource* src = load_cached(ctx, ctx.resolve(*file), field.at, key + ".zones");
    if (!src || !fill_from_file(ctx, *src, key + ".zones", zones)) return std::nullopt;
  }
  field.file = zones.file;
  field.row_line = zones.row_line;
  field.first = zones.first;
  field.values.assign(zones.values.size(), std::nan(""));
  field.zone.assign(zones.values.size(), 0);
  std::map<long long, std::pair<int, int>> missing;  // zone -> (cell count, first cell)
  for (std::size_t i = 0; i < zones.values.size(); ++i) {
    const std::size_t c = i + static_cast<std::size_t>(zones.first);  // grid cell
    const double z = zones.values[i];
    if (std::isnan(z) && !active_cell(ctx, c)) continue;
    if (!(z == std::floor(z))) {
      ctx.error(field_cell_spot(zones, ctx.shape->ncol, int(c)), key + ".zones",
                "zone number " + show_number(z) + " at " + describe_cell(ctx.shape->ncol, int(c)) +
                    " is not an integer");
      return std::nullopt;
    }
    auto it = zone_value.find(static_cast<long long>(z));
    if (it != zone_value.end()) {
      field.values[i] = it->second;
      field.zone[i] = static_cast<int>(z);
    } else if (active_cell(ctx, c)) {
      auto& m = missing[static_cast<long long>(z)];
      if (m.first++ == 0) m.second = int(c);
    }
  }
  for (auto& [zone, info] : missing)
    ctx.error(field_cell_spot(zones, ctx.shape->ncol, info.second), key + ".values",
              "zone " + std::to_string(zone) + " is used in " + std::to_string(info.first) +
                  " active cell(s) (first at " + describe_cell(ctx.shape->ncol, info.second) +
                  ") but has no value");
  if (!missing.empty()) return std::nullopt;
  return field;
}

}  // namespace

std::optional<CellField> read_field(ReaderContext& ctx, const toml::node& node,
                                    const std::string& key) {
  CellField field;
  field.at = ctx.spot(node);
  if (auto v = number_of(node)) {
    // Without a grid a number is still checked, as a field of one cell.
    std::size_t n = ctx.shape ? static_cast<std::size_t>(ctx.shape->n_cells()) : 1;
    if (ctx.shape && ctx.band) {
      field.first = ctx.band->first * ctx.shape->ncol;
      n = static_cast<std::size_t>(ctx.band->count) * ctx.shape->ncol;
    }
    field.values.assign(n, *v);
    field.uniform = true;
    return field;
  }
  const toml::table* t = node.as_table();
  if (!t || !(t->contains("file") || t->contains("zones") || t->contains("raster"))) {
    ctx.error(node, key,
              "expected a field value: a number, { file = \"...\" }, { raster = \"...\" } or { "
              "zones = \"...\", values = { 1 = ... } }; found " +
                  type_name(node) + " " + show(node));
    return std::nullopt;
  }
  if (t->contains("raster")) {
    if (!ctx.shape) return std::nullopt;
    return read_raster_table(ctx, *t, key, RasterMethod::average);
  }
  if (t->contains("zones")) {
    if (!ctx.shape) return std::nullopt;
    return read_zones(ctx, *t, key, std::move(field));
  }
  check_keys(ctx, *t, key, {"file"});
  auto file = read_string(ctx, *t, "file", key, true);
  if (!file || !ctx.shape) return std::nullopt;
  const ArraySource* src = load_cached(ctx, ctx.resolve(*file), field.at, key);
  if (!src || !fill_from_file(ctx, *src, key, field)) return std::nullopt;
  return field;
}

std::optional<CellField> read_field_key(ReaderContext& ctx, const toml::table& table,
                                        std::string_view key, const std::string& path,
                                        bool required) {
  const toml::node* node = table.get(key);
  if (!node) {
    if (required)
      ctx.error(table, key_path(path, key),
                "missing required key (expected a number, { file = } or { zones =, values = })");
    return std::nullopt;
  }
  return read_field(ctx, *node, key_path(path, key));
}

SourceSpot field_cell_spot(const CellField& field, int n_cols, int cell) {
  if (field.file.empty() || field.row_line.empty()) return field.at;
  return SourceSpot{field.file, field.row_line[static_cast<std::size_t>(cell / n_cols)], 0};
}

bool check_field(ReaderContext& ctx, const CellField& field, const std::string& key,
                 const std::function<bool(double)>& ok, const std::string& expected) {
  int n_bad = 0, first = -1;  // first: grid cell
  for (std::size_t i = 0; i < field.values.size(); ++i) {
    const std::size_t c = i + static_cast<std::size_t>(field.first);
    if (!active_cell(ctx, c) || ok(field.values[i])) continue;
    if (n_bad++ == 0) first = static_cast<int>(c);
  }
  if (n_bad == 0) return true;
  const int ncol = ctx.shape ? ctx.shape->ncol : 1;
  const double v = field.values[static_cast<std::size_t>(first - field.first)];
  std::string message = (field.uniform ? "value " + show_number(v)
                                       : (std::isnan(v) ? std::string("no value (NODATA)")
                                                        : "value " + show_number(v)) +
                                             " at " + describe_cell(ncol, first)) +
                        "; expected " + expected;
  if (!field.uniform && n_bad > 1) message += " (" + std::to_string(n_bad) + " active cells fail)";
  ctx.error(field_cell_spot(field, ncol, first), key, message);
  return false;
}

std::optional<std::vector<double>> read_spacing(ReaderContext& ctx, const toml::table& table,
                                                std::string_view key, const std::string& path,
                                                int count, const std::string& count_name) {
  const std::string name = key_path(path, key);
  const toml::node* node = table.get(key);
  if (!node) {
    ctx.error(table, name,
              "missing required key (expected a number, an array of " + count_name +
                  " numbers or { file = })");
    return std::nullopt;
  }
  std::vector<double> values;
  SourceSpot at = ctx.spot(*node);
  if (auto v = number_of(*node)) {
    values.assign(static_cast<std::size_t>(count), *v);
  } else if (auto arr = node->as_array()) {
    for (const toml::node& item : *arr) {
      auto v = number_of(item);
      if (!v) {
        ctx.error(item, name,
                  "expected numbers in the array, found " + type_name(item) + " " + show(item));
        return std::nullopt;
      }
      values.push_back(*v);
    }
  } else if (auto t = node->as_table(); t && t->contains("file")) {
    check_keys(ctx, *t, name, {"file"});
    auto file = read_string(ctx, *t, "file", name, true);
    if (!file) return std::nullopt;
    const ArraySource* src = load_cached(ctx, ctx.resolve(*file), at, name);
    if (!src) return std::nullopt;
    for (const ArrayProblem& p : src->problems)
      ctx.error(SourceSpot{src->file, p.line, 0}, name, p.message);
    if (!src->problems.empty()) return std::nullopt;
    for (const auto& row : src->rows)
      values.insert(values.end(), row.values.begin(), row.values.end());
    at = SourceSpot{src->file, 0, 0};
  } else {
    ctx.error(*node, name,
              "expected a number, an array of " + count_name + " numbers or { file = }, found " +
                  type_name(*node) + " " + show(*node));
    return std::nullopt;
  }
  if (static_cast<int>(values.size()) != count) {
    ctx.error(at, name,
              "has " + std::to_string(values.size()) + " values, expected " + count_name + " = " +
                  std::to_string(count));
    return std::nullopt;
  }
  for (std::size_t i = 0; i < values.size(); ++i) {
    if (!(values[i] > 0.0)) {
      ctx.error(at, name,
                "value " + show_number(values[i]) + " (entry " + std::to_string(i + 1) +
                    ") must be > 0 " + ctx.length_unit);
      return std::nullopt;
    }
  }
  return values;
}

}  // namespace aquiledger
