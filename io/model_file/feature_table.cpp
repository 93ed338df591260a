#include "io/model_file/feature_table.hpp"

#include <algorithm>

#include "io/files/csv_table.hpp"
#include "io/files/input_file_guard.hpp"
#include "io/files/read_error.hpp"
#include "io/model_file/array_source.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

std::optional<std::vector<FeatureTableRow>> read_feature_table(
    ReaderContext& ctx, const toml::table& entry, const std::string& path,
    std::initializer_list<std::string_view> optional_columns, NameSet& seen) {
  auto name = read_string(ctx, entry, "table", path, true);
  if (!name || !ctx.grid) return std::nullopt;
  const std::string key = path + ".table";
  const SourceSpot at = ctx.spot(*entry.get("table"));
  const std::filesystem::path file = ctx.resolve(*name);
  ctx.other_inputs.push_back(file);
  if (auto refusal = input_file_refusal(file, max_measured_file_bytes)) {
    ctx.error(at, key, "feature table " + *refusal);
    return std::nullopt;
  }
  CsvTable table;
  try {
    table = read_csv_file(file);
  } catch (const ReadError&) {
    ctx.error(at, key, "cannot open feature table '" + file.string() + "'");
    return std::nullopt;
  }
  std::vector<std::string> header;
  for (const auto& h : table.header) header.push_back(trimmed_cell(h));
  auto column = [&](std::string_view wanted) -> std::optional<std::size_t> {
    auto it = std::find(header.begin(), header.end(), wanted);
    if (it == header.end()) return std::nullopt;
    return static_cast<std::size_t>(it - header.begin());
  };
  const SourceSpot head{file, table.header.empty() ? 0 : table.header_line, 0};
  std::vector<std::string> allowed = {"name", "x", "y"};
  for (auto c : optional_columns) allowed.emplace_back(c);
  std::string listed;
  for (const auto& a : allowed) listed += (listed.empty() ? "" : ", ") + a;
  bool header_ok = !header.empty();
  for (std::string_view required : {"name", "x", "y"})
    if (!column(required)) {
      ctx.error(head, key,
                "feature table '" + file.string() + "' has no column '" + std::string(required) +
                    "' (columns: " + listed + ")");
      header_ok = false;
    }
  for (std::size_t c = 0; c < header.size(); ++c)
    if (std::find(allowed.begin(), allowed.end(), header[c]) == allowed.end() ||
        std::find(header.begin(), header.begin() + c, header[c]) != header.begin() + c) {
      ctx.error(head, key,
                "column '" + header[c] + "' " +
                    (std::find(allowed.begin(), allowed.end(), header[c]) == allowed.end()
                         ? "is not one of " + listed
                         : "appears twice"));
      header_ok = false;
    }
  if (!header_ok) return std::nullopt;
  if (table.rows.empty()) {
    ctx.error(head, key, "feature table '" + file.string() + "' has no rows below the header");
    return std::nullopt;
  }
  const RectilinearGrid& grid = *ctx.grid;
  std::vector<FeatureTableRow> rows;
  for (std::size_t r = 0; r < table.rows.size(); ++r) {
    const auto& cells = table.rows[r];
    FeatureTableRow row;
    row.at = {file, table.row_lines[r], 0};
    auto cell_of = [&](std::string_view col) {
      const auto c = column(col);
      return c && *c < cells.size() ? trimmed_cell(cells[*c]) : std::string();
    };
    auto fail = [&](std::string_view col, const std::string& why) {
      ctx.error(row.at, key, "column '" + std::string(col) + "': " + why);
    };
    if (cells.size() != header.size()) {
      ctx.error(
          row.at, key,
          std::to_string(cells.size()) + " cells; the header has " + std::to_string(header.size()));
      continue;
    }
    row.name = cell_of("name");
    if (row.name.empty()) {
      fail("name", "empty; every feature needs a name");
      continue;
    }
    if (!seen.insert(row.name).second) {
      fail("name", "'" + row.name + "' is already used by another feature of this section");
      continue;
    }
    auto x = parse_value(cell_of("x")), y = parse_value(cell_of("y"));
    if (!x || !y) {
      fail(!x ? "x" : "y",
           "'" + cell_of(!x ? "x" : "y") + "' is not a number (" + ctx.length_unit + ")");
      continue;
    }
    row.x = *x;
    row.y = *y;
    const std::string where = "point (" + show_number(*x) + ", " + show_number(*y) + ")";
    const auto cell = grid.locate(*x, *y);
    if (!cell) {
      fail("x", where + " of '" + row.name + "' lies outside the grid (x " +
                    show_number(grid.x_min()) + ".." + show_number(grid.x_max()) + ", y " +
                    show_number(grid.y_min()) + ".." + show_number(grid.y_max()) + " " +
                    ctx.length_unit + ")");
      continue;
    }
    if (!grid.is_active(*cell)) {
      fail("x", where + " of '" + row.name + "' lies in an inactive cell (" +
                    describe_cell(grid.n_cols(), cell->value) + ")");
      continue;
    }
    row.cell = *cell;
    for (auto c : optional_columns) row.extra.push_back(cell_of(c));
    rows.push_back(std::move(row));
  }
  return rows;
}

}  // namespace aquiledger
