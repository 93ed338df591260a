#include "io/model_file/feature_placement.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <set>

#include "io/model_file/field_value.hpp"
#include "io/model_file/toml_access.hpp"
#include "mesh/polyline_crossing.hpp"

namespace aquiledger {

namespace {

/// The outermost active cell of every row (west/east) or column (north/south): with an
/// irregular active mask this is the model's edge as drawn, not the grid's.
std::vector<CellIndex> edge_cells(const RectilinearGrid& g, const std::string& edge) {
  std::vector<CellIndex> cells;
  const bool along_rows = edge == "west" || edge == "east";
  const int n_lines = along_rows ? g.n_rows() : g.n_cols();
  const int n_along = along_rows ? g.n_cols() : g.n_rows();
  const bool from_start = edge == "west" || edge == "north";
  for (int line = 0; line < n_lines; ++line) {
    for (int k = 0; k < n_along; ++k) {
      const int pos = from_start ? k : n_along - 1 - k;
      const CellIndex c = along_rows ? g.cell(line, pos) : g.cell(pos, line);
      if (g.is_active(c)) {
        cells.push_back(c);
        break;
      }
    }
  }
  return cells;
}

/// Distance (L) from the grid's own edge to the outer face of an edge cell.
double inset_from_grid_edge(const RectilinearGrid& g, const std::string& edge, CellIndex c) {
  const RowCol rc = g.row_col(c);
  const auto xe = g.x_edges();
  const auto ye = g.y_edges();  // north first
  if (edge == "west") return xe[std::size_t(rc.col)] - g.x_min();
  if (edge == "east") return g.x_max() - xe[std::size_t(rc.col) + 1];
  if (edge == "north") return g.y_max() - ye[std::size_t(rc.row)];
  return ye[std::size_t(rc.row) + 1] - g.y_min();
}

/// With an irregular active mask, `edge` takes the outermost active cell of every row or
/// column, which can lie deep inside the grid (where the model's outline turns away from
/// that side). Warns when the farthest lies more than a tenth of the grid's extent across
/// that side inside the grid's edge (our threshold: far enough that the cells no longer
/// trace the side the user named).
void warn_far_edge_cells(ReaderContext& ctx, const toml::node& node, const std::string& path,
                         const std::string& edge, const std::vector<CellIndex>& cells) {
  const RectilinearGrid& g = *ctx.grid;
  const bool across_x = edge == "west" || edge == "east";
  const double extent = across_x ? g.x_max() - g.x_min() : g.y_max() - g.y_min();
  const double limit = 0.1 * extent;
  int far = 0;
  double farthest = 0.0;
  CellIndex where{0};
  for (CellIndex c : cells) {
    const double d = inset_from_grid_edge(g, edge, c);
    if (d > limit) ++far;
    if (d > farthest) farthest = d, where = c;
  }
  if (far == 0) return;
  const RowCol rc = g.row_col(where);
  ctx.warning(ctx.spot(node), path + ".edge",
              std::to_string(far) + " of the " + std::to_string(cells.size()) +
                  " cells of edge = \"" + edge + "\" lie more than " +
                  fmt::format("{:.4g}", limit) + " " + ctx.length_unit +
                  " (a tenth of the grid) inside the grid's " + edge + " edge, the farthest " +
                  fmt::format("{:.4g}", farthest) + " " + ctx.length_unit + " (row " +
                  std::to_string(rc.row + 1) + ", column " + std::to_string(rc.col + 1) +
                  "): the active outline turns away there; use cells, mask or polyline to place "
                  "the boundary exactly");
}

std::optional<std::vector<CellIndex>> listed_cells(ReaderContext& ctx, const toml::node& node,
                                                   const std::string& key) {
  const RectilinearGrid& g = *ctx.grid;
  const toml::array* arr = node.as_array();
  if (!arr) {
    ctx.error(node, key,
              "expected an array of [row, col] pairs (1-based), found " + type_name(node));
    return std::nullopt;
  }
  std::vector<CellIndex> cells;
  std::set<std::int32_t> seen;
  bool ok = true;
  for (const toml::node& item : *arr) {
    const toml::array* pair = item.as_array();
    if (!pair || pair->size() != 2 || !(*pair)[0].as_integer() || !(*pair)[1].as_integer()) {
      ctx.error(item, key, "expected a [row, col] pair of integers (1-based), found " + show(item));
      ok = false;
      continue;
    }
    const long long row = (*pair)[0].as_integer()->get(), col = (*pair)[1].as_integer()->get();
    if (row < 1 || row > g.n_rows() || col < 1 || col > g.n_cols()) {
      ctx.error(item, key,
                "cell [" + std::to_string(row) + ", " + std::to_string(col) +
                    "] lies outside the grid (rows 1.." + std::to_string(g.n_rows()) +
                    ", columns 1.." + std::to_string(g.n_cols()) + ")");
      ok = false;
      continue;
    }
    const CellIndex c = g.cell(int(row - 1), int(col - 1));
    if (!g.is_active(c)) {
      ctx.error(item, key,
                "cell [" + std::to_string(row) + ", " + std::to_string(col) + "] is inactive");
      ok = false;
    } else if (!seen.insert(c.value).second) {
      ctx.error(item, key,
                "cell [" + std::to_string(row) + ", " + std::to_string(col) + "] is listed twice");
      ok = false;
    } else {
      cells.push_back(c);
    }
  }
  if (!ok) return std::nullopt;
  return cells;
}

std::optional<std::vector<CellIndex>> mask_cells(ReaderContext& ctx, const toml::node& node,
                                                 const std::string& key, const std::string& path) {
  auto field = read_field(ctx, node, key);
  if (!field) return std::nullopt;
  const RectilinearGrid& g = *ctx.grid;
  std::vector<CellIndex> cells;
  int inactive = 0;
  for (int c = 0; c < g.n_cells(); ++c) {
    const double v = field->values[std::size_t(c)];
    if (!(v != 0.0) || std::isnan(v)) continue;
    if (g.is_active(CellIndex{c}))
      cells.push_back(CellIndex{c});
    else
      ++inactive;
  }
  if (inactive > 0)
    ctx.warning(
        field->at, path,
        std::to_string(inactive) + " nonzero mask cell(s) lie in inactive cells and are ignored");
  return cells;
}

std::optional<Placement> polyline_cells(ReaderContext& ctx, const toml::node& node,
                                        const std::string& key, const std::string& path) {
  const toml::array* arr = node.as_array();
  std::vector<std::array<double, 2>> points;
  if (arr) {
    for (const toml::node& item : *arr) {
      const toml::array* p = item.as_array();
      std::optional<double> x, y;
      if (p && p->size() == 2) x = number_of((*p)[0]), y = number_of((*p)[1]);
      if (!x || !y) {
        ctx.error(
            item, key,
            "expected an [x, y] pair of numbers (" + ctx.length_unit + "), found " + show(item));
        return std::nullopt;
      }
      points.push_back({*x, *y});
    }
  }
  if (!arr || points.size() < 2) {
    ctx.error(node, key,
              "expected an array of at least two [x, y] points (" + ctx.length_unit + ")");
    return std::nullopt;
  }
  const PolylineCrossing crossing = cross_polyline(*ctx.grid, points);
  Placement p;
  p.polyline = true;
  p.n_vertices = points.size();
  for (const CellLength& cl : crossing.active) {
    p.cells.push_back(cl.cell);
    p.length.push_back(cl.length);
    p.vertex_weights.push_back(cl.vertex_weights);
  }
  const double off = crossing.inactive_length + crossing.outside_length;
  if (p.cells.empty()) {
    ctx.error(node, key,
              "the polyline (" + show_number(crossing.total_length) + " " + ctx.length_unit +
                  " long) crosses no active cell");
    return std::nullopt;
  }
  if (off > 1.0e-9 * crossing.total_length)
    ctx.warning(ctx.spot(node), path,
                show_number(off) + " " + ctx.length_unit + " of the polyline's " +
                    show_number(crossing.total_length) + " " + ctx.length_unit +
                    " lie outside active cells (" + show_number(crossing.outside_length) +
                    " outside the grid, " + show_number(crossing.inactive_length) +
                    " in inactive cells) and are not counted");
  return p;
}

}  // namespace

std::optional<Placement> read_placement(ReaderContext& ctx, const toml::table& table,
                                        const std::string& path, PlacementDefault fallback) {
  static const char* const keys[] = {"edge", "cells", "mask", "polyline"};
  std::vector<std::string> given;
  for (const char* k : keys)
    if (table.contains(k)) given.emplace_back(k);
  const bool point = table.contains("x") || table.contains("y");
  if (point) given.emplace_back("x/y");
  if (given.size() > 1) {
    std::string list;
    for (auto& g : given) list += (list.empty() ? "" : ", ") + g;
    ctx.error(table, path, "give one placement, not several (found " + list + ")");
    return std::nullopt;
  }
  if (!ctx.grid) return std::nullopt;
  Placement p;
  p.at = ctx.spot(table);
  if (given.empty()) {
    if (fallback == PlacementDefault::required) {
      ctx.error(table, path,
                "missing placement: give one of edge, cells, mask, polyline or x and y");
      return std::nullopt;
    }
    p.defaulted = true;
    for (int c = 0; c < ctx.grid->n_cells(); ++c)
      if (ctx.grid->is_active(CellIndex{c})) p.cells.push_back(CellIndex{c});
    return p;
  }
  const std::string& which = given.front();
  if (which == "x/y") {
    auto x = read_number(ctx, table, "x", path, true);
    auto y = read_number(ctx, table, "y", path, true);
    if (!x || !y) return std::nullopt;
    p.at = ctx.spot(*table.get("x"));
    const auto cell = ctx.grid->locate(*x, *y);
    if (!cell) {
      ctx.error(p.at, path + ".x",
                "point (" + show_number(*x) + ", " + show_number(*y) +
                    ") lies outside the grid (x " + show_number(ctx.grid->x_min()) + ".." +
                    show_number(ctx.grid->x_max()) + ", y " + show_number(ctx.grid->y_min()) +
                    ".." + show_number(ctx.grid->y_max()) + " " + ctx.length_unit + ")");
      return std::nullopt;
    }
    if (!ctx.grid->is_active(*cell)) {
      ctx.error(p.at, path + ".x",
                "point (" + show_number(*x) + ", " + show_number(*y) +
                    ") lies in an inactive cell (" +
                    describe_cell(ctx.grid->n_cols(), cell->value) + ")");
      return std::nullopt;
    }
    p.cells.push_back(*cell);
    return p;
  }
  const toml::node& node = *table.get(which);
  const std::string key = key_path(path, which);
  p.at = ctx.spot(node);
  if (which == "polyline") {
    auto poly = polyline_cells(ctx, node, key, path);
    if (poly) poly->at = p.at;
    return poly;
  }
  std::optional<std::vector<CellIndex>> cells;
  if (which == "edge") {
    auto edge = read_choice(ctx, table, "edge", path, {"north", "south", "east", "west"});
    if (edge) {
      cells = edge_cells(*ctx.grid, *edge);
      warn_far_edge_cells(ctx, node, path, *edge, *cells);
    }
  } else if (which == "cells") {
    cells = listed_cells(ctx, node, key);
  } else {
    cells = mask_cells(ctx, node, key, path);
  }
  if (!cells) return std::nullopt;
  if (cells->empty()) {
    ctx.error(node, key, "the placement names no active cell");
    return std::nullopt;
  }
  p.cells = std::move(*cells);
  return p;
}

}  // namespace aquiledger
