// [[observation]]: bores at (x, y) with optional measured heads (a CSV of time, head).
#include <algorithm>
#include <cmath>
#include <fstream>

#include "io/files/calendar.hpp"
#include "io/files/input_file_guard.hpp"
#include "io/model_file/array_source.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/memory_guard.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

/// time,head rows; a first line that is not numbers is a header.
std::vector<MeasuredHead> read_measured(ReaderContext& ctx, const std::filesystem::path& file,
                                        const SourceSpot& at, const std::string& key) {
  std::vector<MeasuredHead> rows;
  if (auto refusal = input_file_refusal(file, max_measured_file_bytes)) {
    ctx.error(at, key, "measured-head file " + *refusal);
    return rows;
  }
  std::ifstream in(file);
  if (!in) {
    ctx.error(at, key,
              "cannot open measured-head file '" + file.string() +
                  "' (expected a CSV with columns time,head)");
    return rows;
  }
  std::string line;
  int line_no = 0;
  while (std::getline(in, line)) {
    ++line_no;
    if (auto hash = line.find('#'); hash != std::string::npos) line.erase(hash);
    if (line.find_first_not_of(" \t\r,") == std::string::npos) continue;
    std::vector<std::string> cells;
    std::string cell;
    for (char c : line + ",") {
      if (c == ',') {
        const auto b = cell.find_first_not_of(" \t\r"), e = cell.find_last_not_of(" \t\r");
        cells.push_back(b == std::string::npos ? "" : cell.substr(b, e - b + 1));
        cell.clear();
      } else {
        cell += c;
      }
    }
    std::optional<double> time = cells.size() >= 2 ? parse_value(cells[0]) : std::nullopt;
    std::optional<double> head = cells.size() >= 2 ? parse_value(cells[1]) : std::nullopt;
    const bool dated = cells.size() == 2 && !time && looks_like_date(cells[0]);
    if (dated && ctx.clock)
      if (auto seconds = parse_calendar_time(cells[0])) time = ctx.clock->model_time(*seconds);
    if (!time || !head || cells.size() != 2) {
      if (rows.empty() && line_no == 1 && cells.size() == 2 && !dated) continue;  // header line
      ctx.error(SourceSpot{file, line_no, 0}, key,
                dated && !ctx.clock
                    ? "'" + cells[0] +
                          "' is a date: give [model].start_date (the date of model time 0) to "
                          "measure times by dates"
                    : "expected time,head (time in " + ctx.time_unit + " or a date YYYY-MM-DD" +
                          (ctx.clock ? "" : " with [model].start_date") + ", head in " +
                          ctx.length_unit + "), found '" + line + "'");
      continue;
    }
    rows.push_back({*time, *head});
  }
  if (rows.empty()) ctx.error(SourceSpot{file, 0, 0}, key, "no time,head rows found");
  return rows;
}

}  // namespace

void read_observations(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::array* obs = section_tables(ctx, root, "observation");
  if (!obs) return;
  std::vector<std::string> names;
  for (std::size_t i = 0; i < obs->size(); ++i) {
    const toml::table& t = *(*obs)[i].as_table();
    const std::string path = feature_path("observation", t, i);
    check_keys(ctx, t, path, {"name", "x", "y", "measured"});
    Observation o;
    o.name =
        read_string(ctx, t, "name", path, false).value_or("observation " + std::to_string(i + 1));
    check_unique_name(ctx, t, path, o.name, names);
    auto x = read_number(ctx, t, "x", path, true);
    auto y = read_number(ctx, t, "y", path, true);
    auto measured = read_string(ctx, t, "measured", path, false);
    if (!x || !y || !ctx.grid) continue;
    o.x = *x;
    o.y = *y;
    const auto cell = ctx.grid->locate(*x, *y);
    const std::string where = "point (" + show_number(*x) + ", " + show_number(*y) + ")";
    if (!cell) {
      ctx.error(*t.get("x"), path + ".x",
                where + " lies outside the grid (x " + show_number(ctx.grid->x_min()) + ".." +
                    show_number(ctx.grid->x_max()) + ", y " + show_number(ctx.grid->y_min()) +
                    ".." + show_number(ctx.grid->y_max()) + " " + ctx.length_unit + ")");
      continue;
    }
    if (!ctx.grid->is_active(*cell)) {
      ctx.error(*t.get("x"), path + ".x",
                where + " lies in an inactive cell (" +
                    describe_cell(ctx.grid->n_cols(), cell->value) + ")");
      continue;
    }
    o.cell = *cell;
    if (measured) {
      o.measured_file = ctx.resolve(*measured);
      o.measured =
          read_measured(ctx, o.measured_file, ctx.spot(*t.get("measured")), path + ".measured");
    }
    model.observations.push_back(std::move(o));
  }
}

}  // namespace aquiledger
