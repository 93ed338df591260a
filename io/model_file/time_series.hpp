#pragma once
// Time series from CSV files (io-internal header): a first column `time` (model time) or
// `date` (calendar dates, with [model].start_date), then value columns by name; an empty cell
// means no value at that row for that column. A value holds from its row's time to the next
// row's (a record of "from then on"): pumping logs, stage readings and monthly totals read
// the same way.
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "io/model_file/reader_context.hpp"

namespace aquiledger {

struct SeriesFile {
  std::filesystem::path file;
  std::vector<std::string> columns;         ///< value columns, header order after the time
  std::vector<double> time;                 ///< model time of each row, increasing
  std::vector<int> line;                    ///< file line of each row
  std::vector<std::vector<double>> values;  ///< per column, per row; NaN where empty
  std::optional<std::size_t> column(const std::string& name) const;
};

/// The file read and checked once per model (cached in ctx); nullptr when it could not be
/// read (reported once, at the first key that named it).
const SeriesFile* series_file(ReaderContext& ctx, const std::filesystem::path& file,
                              const SourceSpot& at, const std::string& key);

/// How a series gives one value per period: the mean of the held values over the period
/// (rates: the period's volume over its length), or the value in force at its start.
enum class SeriesRule { mean, start };

/// Time-weighted mean over [t0, t1] (t0 < t1) of the values held from each time to the next
/// (the last one beyond); times increasing and times[0] <= t0. The one copy of this rule.
double held_mean(const std::vector<double>& times, const std::vector<double>& values, double t0,
                 double t1);
/// The value in force at t (times[0] <= t).
double held_value(const std::vector<double>& times, const std::vector<double>& values, double t);

/// One value per period (ctx.period_bounds) of a column; errors (a period before the first
/// value, no value in the column) name the file, the column and `key`.
std::optional<std::vector<double>> values_per_period(ReaderContext& ctx, const SeriesFile& series,
                                                     const std::string& column, SeriesRule rule,
                                                     const SourceSpot& at, const std::string& key);

}  // namespace aquiledger
