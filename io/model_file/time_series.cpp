#include "io/model_file/time_series.hpp"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <limits>

#include "io/files/calendar.hpp"
#include "io/files/csv_table.hpp"
#include "io/files/input_file_guard.hpp"
#include "io/files/read_error.hpp"
#include "io/model_file/array_source.hpp"
#include "io/model_file/toml_access.hpp"

namespace aquiledger {

namespace {

std::shared_ptr<const SeriesFile> read_series(ReaderContext& ctx, const std::filesystem::path& file,
                                              const SourceSpot& at, const std::string& key) {
  if (auto refusal = input_file_refusal(file, max_measured_file_bytes)) {
    ctx.error(at, key, "time-series file " + *refusal);
    return nullptr;
  }
  CsvTable table;
  try {
    table = read_csv_file(file);
  } catch (const ReadError&) {
    ctx.error(at, key, "cannot open time-series file '" + file.string() + "'");
    return nullptr;
  }
  const SourceSpot head{file, table.header_line, 0};
  if (table.header.size() < 2) {
    ctx.error(table.header.empty() ? SourceSpot{file, 0, 0} : head, key,
              "expected a header line: time (or date), then one named column per series");
    return nullptr;
  }
  auto series = std::make_shared<SeriesFile>();
  series->file = file;
  const std::string first = trimmed_cell(table.header[0]);
  const bool dates = first == "date";
  if (!dates && first != "time") {
    ctx.error(head, key,
              "first column is '" + first + "'; expected time (" + ctx.time_unit +
                  ") or date (YYYY-MM-DD)");
    return nullptr;
  }
  if (dates && !ctx.clock) {
    ctx.error(head, key,
              "a date column needs a calendar: give [model].start_date (the date of model time 0)");
    return nullptr;
  }
  for (std::size_t c = 1; c < table.header.size(); ++c) {
    std::string name = trimmed_cell(table.header[c]);
    if (name.empty() ||
        std::find(series->columns.begin(), series->columns.end(), name) != series->columns.end()) {
      ctx.error(head, key,
                name.empty() ? "column " + std::to_string(c + 1) + " has no name"
                             : "column '" + name + "' appears twice");
      return nullptr;
    }
    series->columns.push_back(std::move(name));
  }
  series->values.resize(series->columns.size());
  const int errors_before = ctx.diagnostics.n_errors();
  for (std::size_t r = 0; r < table.rows.size(); ++r) {
    const auto& row = table.rows[r];
    const SourceSpot spot{file, table.row_lines[r], 0};
    if (row.size() != table.header.size()) {
      ctx.error(spot, key,
                std::to_string(row.size()) + " cells; the header has " +
                    std::to_string(table.header.size()));
      continue;
    }
    const std::string when = trimmed_cell(row[0]);
    std::optional<double> t;
    if (dates) {
      if (auto seconds = parse_calendar_time(when)) t = ctx.clock->model_time(*seconds);
    } else {
      t = parse_value(when);
    }
    if (!t) {
      ctx.error(
          spot, key,
          "'" + when + "' is not " +
              (dates ? std::string("a date (YYYY-MM-DD, optionally Thh:mm[:ss])")
                     : "a time in " + ctx.time_unit) +
              (!dates && looks_like_date(when) ? "; name the column date to give dates" : ""));
      continue;
    }
    if (!series->time.empty() && !(*t > series->time.back())) {
      ctx.error(spot, key, "'" + when + "' is not after the row before; times must increase");
      continue;
    }
    series->time.push_back(*t);
    series->line.push_back(table.row_lines[r]);
    for (std::size_t c = 1; c < row.size(); ++c) {
      const std::string cell = trimmed_cell(row[c]);
      double v = std::numeric_limits<double>::quiet_NaN();
      if (!cell.empty()) {
        auto parsed = parse_value(cell);
        if (!parsed) {
          ctx.error(spot, key,
                    "column '" + series->columns[c - 1] + "': '" + cell +
                        "' is not a number (leave the cell empty where there is no value)");
          continue;
        }
        v = *parsed;
      }
      series->values[c - 1].push_back(v);
    }
  }
  if (ctx.diagnostics.n_errors() != errors_before) return nullptr;
  if (series->time.empty()) {
    ctx.error(head, key, "no rows below the header");
    return nullptr;
  }
  return series;
}

}  // namespace

std::optional<std::size_t> SeriesFile::column(const std::string& name) const {
  for (std::size_t i = 0; i < columns.size(); ++i)
    if (columns[i] == name) return i;
  return std::nullopt;
}

const SeriesFile* series_file(ReaderContext& ctx, const std::filesystem::path& file,
                              const SourceSpot& at, const std::string& key) {
  auto it = ctx.series_cache.find(file);
  if (it == ctx.series_cache.end())
    it = ctx.series_cache.emplace(file, read_series(ctx, file, at, key)).first;
  return it->second.get();
}

double held_value(const std::vector<double>& times, const std::vector<double>& values, double t) {
  assert(!times.empty() && times.front() <= t);
  const auto after = std::upper_bound(times.begin(), times.end(), t);
  return values[static_cast<std::size_t>(after - times.begin()) - 1];
}

double held_mean(const std::vector<double>& times, const std::vector<double>& values, double t0,
                 double t1) {
  assert(t0 < t1 && !times.empty() && times.front() <= t0);
  std::size_t i =
      static_cast<std::size_t>(std::upper_bound(times.begin(), times.end(), t0) - times.begin()) -
      1;
  double integral = 0.0, from = t0;
  for (; from < t1; ++i) {
    const double to = i + 1 < times.size() ? std::min(times[i + 1], t1) : t1;
    integral += values[i] * (to - from);
    from = to;
  }
  return integral / (t1 - t0);
}

std::optional<std::vector<double>> values_per_period(ReaderContext& ctx, const SeriesFile& series,
                                                     const std::string& column, SeriesRule rule,
                                                     const SourceSpot& at, const std::string& key) {
  const auto c = series.column(column);
  if (!c) {
    std::string known;
    for (const auto& name : series.columns) known += (known.empty() ? "" : ", ") + name;
    ctx.error(
        at, key,
        "no column '" + column + "' in '" + series.file.string() + "' (columns: " + known + ")");
    return std::nullopt;
  }
  std::vector<double> times, values;
  for (std::size_t r = 0; r < series.time.size(); ++r)
    if (!std::isnan(series.values[*c][r])) {
      times.push_back(series.time[r]);
      values.push_back(series.values[*c][r]);
    }
  if (times.empty()) {
    ctx.error(at, key, "column '" + column + "' of '" + series.file.string() + "' has no values");
    return std::nullopt;
  }
  const auto& bounds = ctx.period_bounds;
  auto when = [&](double t) {
    return ctx.clock ? ctx.clock->date_of(t) : show_number(t) + " " + ctx.time_unit;
  };
  if (bounds.size() < 2) return std::nullopt;  // periods invalid: already reported
  if (times.front() > bounds.front()) {
    ctx.error(at, key,
              "column '" + column + "' of '" + series.file.string() + "' starts at " +
                  when(times.front()) + ", after the first period's start " + when(bounds.front()) +
                  "; give a value in force from then on");
    return std::nullopt;
  }
  std::vector<double> out;
  for (std::size_t p = 0; p + 1 < bounds.size(); ++p)
    out.push_back(rule == SeriesRule::mean ? held_mean(times, values, bounds[p], bounds[p + 1])
                                           : held_value(times, values, bounds[p]));
  return out;
}

}  // namespace aquiledger
