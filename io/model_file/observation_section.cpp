// [[observation]]: bores at (x, y) with optional measured heads (a CSV of time, head);
// [[subsidence_point]]: points placed the same way with optional measured subsidence.
#include <algorithm>
#include <cmath>
#include <fstream>

#include "io/files/calendar.hpp"
#include "io/files/input_file_guard.hpp"
#include "io/model_file/array_source.hpp"
#include "io/model_file/feature_table.hpp"
#include "io/model_file/field_value.hpp"
#include "io/model_file/memory_guard.hpp"
#include "io/model_file/section_readers.hpp"
#include "io/model_file/time_series.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

/// What a measured file holds: heads at bores, or subsidence at subsidence points.
struct MeasuredKind {
  const char* value;  ///< the second column's name: "head" or "subsidence"
  const char* file;   ///< in messages: "measured-head file"
};
constexpr MeasuredKind measured_heads{"head", "measured-head file"};
constexpr MeasuredKind measured_subsidence{"subsidence", "measured-subsidence file"};

/// time,value rows; a first line that is not numbers is a header.
std::vector<MeasuredHead> read_measured(ReaderContext& ctx, const std::filesystem::path& file,
                                        const SourceSpot& at, const std::string& key,
                                        const MeasuredKind& kind = measured_heads) {
  std::vector<MeasuredHead> rows;
  const std::string value = kind.value;
  if (auto refusal = input_file_refusal(file, max_measured_file_bytes)) {
    ctx.error(at, key, std::string(kind.file) + " " + *refusal);
    return rows;
  }
  std::ifstream in(file);
  if (!in) {
    ctx.error(at, key,
              "cannot open " + std::string(kind.file) + " '" + file.string() +
                  "' (expected a CSV with columns time," + value + ")");
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
                    : "expected two numbers time," + value + " (" + ctx.time_unit + ", " +
                          ctx.length_unit + "; the time may be a date YYYY-MM-DD" +
                          (ctx.clock ? "" : " with [model].start_date") + "), found '" + line +
                          "'");
      continue;
    }
    rows.push_back({*time, *head});
  }
  if (rows.empty()) ctx.error(SourceSpot{file, 0, 0}, key, "no time," + value + " rows found");
  return rows;
}

/// x, y (inside an active cell) and an optional measured file of one point; false when the
/// point cannot be placed (the errors are reported).
bool read_point(ReaderContext& ctx, const toml::table& t, const std::string& path,
                const MeasuredKind& kind, Observation& o) {
  auto x = read_number(ctx, t, "x", path, true);
  auto y = read_number(ctx, t, "y", path, true);
  auto measured = read_string(ctx, t, "measured", path, false);
  if (!x || !y || !ctx.grid) return false;
  o.x = *x;
  o.y = *y;
  const auto cell = ctx.grid->locate(*x, *y);
  const std::string where = "point (" + show_number(*x) + ", " + show_number(*y) + ")";
  if (!cell) {
    ctx.error(*t.get("x"), path + ".x",
              where + " lies outside the grid (x " + show_number(ctx.grid->x_min()) + ".." +
                  show_number(ctx.grid->x_max()) + ", y " + show_number(ctx.grid->y_min()) + ".." +
                  show_number(ctx.grid->y_max()) + " " + ctx.length_unit + ")");
    return false;
  }
  if (!ctx.grid->is_active(*cell)) {
    ctx.error(*t.get("x"), path + ".x",
              where + " lies in an inactive cell (" +
                  describe_cell(ctx.grid->n_cols(), cell->value) + ")");
    return false;
  }
  o.cell = *cell;
  if (measured) {
    o.measured_file = ctx.resolve(*measured);
    o.measured =
        read_measured(ctx, o.measured_file, ctx.spot(*t.get("measured")), path + ".measured", kind);
  }
  return true;
}

}  // namespace

namespace {

/// The bores of a `table` entry (name, x, y and an optional measured column naming each
/// bore's time,head file), with measured heads also from `measured_series`: a time series
/// with one column per bore (io/model_file/time_series.hpp; an empty cell: no reading).
void read_observation_table(ReaderContext& ctx, const toml::table& t, const std::string& path,
                            NameSet& names, Model& model) {
  for (std::string_view key : {"name", "x", "y", "measured"})
    if (const toml::node* n = t.get(key))
      ctx.error(*n, key_path(path, key),
                std::string("an observation table takes names and points from its file") +
                    (key == "measured" ? " (measured files in its measured column, or "
                                         "measured_series = a file with a column per bore)"
                                       : "") +
                    "; remove this key or the table");
  auto rows = read_feature_table(ctx, t, path, {"measured"}, names);
  if (!rows) return;
  const SeriesFile* series = nullptr;
  if (auto file = read_string(ctx, t, "measured_series", path, false)) {
    series = series_file(ctx, ctx.resolve(*file), ctx.spot(*t.get("measured_series")),
                         path + ".measured_series");
    if (!series) return;
    for (const std::string& column : series->columns)
      if (std::none_of(rows->begin(), rows->end(),
                       [&](const FeatureTableRow& r) { return r.name == column; }))
        ctx.warning(ctx.spot(*t.get("measured_series")), path + ".measured_series",
                    "column '" + column + "' of '" + series->file.string() +
                        "' names no bore of the table; its readings are not used");
  }
  for (const FeatureTableRow& row : *rows) {
    Observation o;
    o.name = row.name;
    o.x = row.x;
    o.y = row.y;
    o.cell = row.cell;
    if (!row.extra[0].empty()) {
      o.measured_file = ctx.resolve(row.extra[0]);
      o.measured = read_measured(ctx, o.measured_file, row.at,
                                 path + ".table (bore '" + row.name + "').measured");
    }
    if (series)
      if (auto c = series->column(row.name)) {
        if (!o.measured.empty()) {
          ctx.error(row.at, path + ".table",
                    "bore '" + row.name + "' has measured heads in its own file and in column '" +
                        row.name + "' of '" + series->file.string() + "'; give one");
          continue;
        }
        for (std::size_t r = 0; r < series->time.size(); ++r)
          if (!std::isnan(series->values[*c][r]))
            o.measured.push_back({series->time[r], series->values[*c][r]});
      }
    model.observations.push_back(std::move(o));
  }
}

}  // namespace

void read_observations(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::array* obs = section_tables(ctx, root, "observation");
  if (!obs) return;
  NameSet names;
  for (std::size_t i = 0; i < obs->size(); ++i) {
    const toml::table& t = *(*obs)[i].as_table();
    const std::string path = feature_path("observation", t, i);
    check_keys(ctx, t, path, {"name", "x", "y", "measured", "table", "measured_series"});
    if (t.contains("table")) {
      read_observation_table(ctx, t, path, names, model);
      continue;
    }
    if (const toml::node* n = t.get("measured_series"))
      ctx.error(*n, path + ".measured_series",
                "measured_series goes with a table of bores; a single bore takes measured = "
                "\"file.csv\" (time,head)");
    Observation o;
    o.name =
        read_string(ctx, t, "name", path, false).value_or("observation " + std::to_string(i + 1));
    check_unique_name(ctx, t, path, o.name, names);
    if (read_point(ctx, t, path, measured_heads, o)) model.observations.push_back(std::move(o));
  }
}

void read_subsidence_points(ReaderContext& ctx, const toml::table& root, Model& model) {
  const toml::array* points = section_tables(ctx, root, "subsidence_point");
  if (!points) return;
  NameSet names;
  for (std::size_t i = 0; i < points->size(); ++i) {
    const toml::table& t = *(*points)[i].as_table();
    const std::string path = feature_path("subsidence_point", t, i);
    check_keys(ctx, t, path, {"name", "x", "y", "measured"});
    Observation p;
    p.name = read_string(ctx, t, "name", path, false)
                 .value_or("subsidence point " + std::to_string(i + 1));
    check_unique_name(ctx, t, path, p.name, names);
    if (read_point(ctx, t, path, measured_subsidence, p))
      model.subsidence_points.push_back(std::move(p));
  }
}

}  // namespace aquiledger
