#pragma once
// State shared by the section readers while one model file is read (io-internal header).
#include <toml++/toml.h>

#include <filesystem>
#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <unordered_set>
#include <vector>

#include "io/files/calendar.hpp"
#include "io/model_file/array_source.hpp"
#include "io/model_file/diagnostics.hpp"
#include "mesh/grid_part.hpp"
#include "mesh/rectilinear_grid.hpp"

namespace aquiledger {

/// The names already used in one kind of feature (hashed: a run of calendar periods can hold
/// 1e5 of them, and a linear search per name made reading quadratic).
using NameSet = std::unordered_set<std::string>;

/// The grid's shape as soon as [grid] has been read, before the active mask exists.
struct GridShape {
  int nrow = 0;
  int ncol = 0;
  std::vector<double> dx;  ///< L, west to east
  std::vector<double> dy;  ///< L, north to south
  double x0 = 0.0;         ///< L, south-west corner
  double y0 = 0.0;         ///< L
  int n_cells() const { return nrow * ncol; }
};

struct ReaderContext {
  std::filesystem::path model_file;  ///< for messages
  std::filesystem::path base_dir;    ///< relative paths start here
  Diagnostics diagnostics;
  std::string length_unit = "m";
  std::string time_unit = "d";
  std::optional<GridShape> shape;       ///< set when [grid] read without errors
  std::optional<RectilinearGrid> grid;  ///< set once the active mask is known too
  int n_periods = 0;                    ///< 0 while [[period]] is unknown or invalid
  /// Model times of the period boundaries (n_periods + 1, from 0) once [[period]] is valid.
  std::vector<double> period_bounds;
  /// Set when [model] gives a start date: dates in the model and its files map to times.
  std::optional<CalendarClock> clock;
  /// [grid].epsg: the model's coordinate system, against which rasters are checked.
  std::optional<int> epsg;
  /// Time-series files read so far (a file serves many features; read and checked once).
  std::map<std::filesystem::path, std::shared_ptr<const struct SeriesFile>> series_cache;
  /// Other files read (feature tables); with the caches and the measured-head files they
  /// make Model::input_files.
  std::vector<std::filesystem::path> other_inputs;
  std::vector<std::uint8_t> fixed;  ///< per cell: 1 when a fixed_head holds it
  std::map<std::filesystem::path, ArraySource> array_cache;
  /// Rows whose per-cell field values are kept (read_field); every row when unset. Array
  /// files are still read and checked to the end, so every band finds the same errors.
  std::optional<RowBand> band;
  /// The rows this process keeps of the aquifer, interbed and initial-head fields: unset for
  /// the whole grid; otherwise read into `band` while those sections are read (window rows).
  std::optional<GridPart> part;
  /// Gives `part` from the grid's rows and columns (read_model_file's band_of); may be empty.
  std::function<GridPart(int, int)> band_of;

  SourceSpot spot(const toml::node& node) const;
  SourceSpot spot(const toml::source_region& region) const;
  SourceSpot file_spot() const { return {model_file, 0, 0}; }
  void error(const toml::node& at, const std::string& key, std::string message) {
    diagnostics.error(spot(at), key, std::move(message));
  }
  void error(const SourceSpot& at, const std::string& key, std::string message) {
    diagnostics.error(at, key, std::move(message));
  }
  void warning(const SourceSpot& at, const std::string& key, std::string message) {
    diagnostics.warning(at, key, std::move(message));
  }
  std::filesystem::path resolve(const std::string& relative) const;
  /// Unit strings for messages, e.g. "m/d" for a conductivity.
  std::string velocity_unit() const { return length_unit + "/" + time_unit; }
  std::string flow_unit() const { return length_unit + "3/" + time_unit; }
  std::string conductance_unit() const { return length_unit + "2/" + time_unit; }
};

/// "row R, column C" (1-based) of a cell, for messages.
std::string describe_cell(int n_cols, int cell);

}  // namespace aquiledger
