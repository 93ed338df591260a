#pragma once
// Array files as written by users: plain text (one grid row per line, the northern row
// first, values split by white space or commas, '#' starts a comment) or ESRI ASCII
// rasters (.asc). This layer only parses; io/model_file/field_value checks the shape against the
// grid.
#include <cstdint>
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "mesh/grid_part.hpp"

namespace aquiledger {

/// What inactive cells hold in the head arrays a run writes (io/results/head_arrays.hpp) and
/// `[initial] head = { file = ... }` reads back (the .asc's NODATA_value; the reader ignores
/// the values of inactive cells, and a NODATA cell reads as no value).
inline constexpr double head_array_no_value = -9999.0;

struct ArrayRow {
  int line = 0;                ///< 1-based line in the file
  std::size_t n_values = 0;    ///< values on the line, whether kept or not
  std::vector<double> values;  ///< the values; empty for a row outside the band read
};

struct ArrayProblem {
  int line = 0;
  std::string message;
};

/// Header of an ESRI ASCII raster.
struct RasterHeader {
  int ncols = 0;
  int nrows = 0;
  double xll = 0.0;           ///< L, x of the lower-left corner (or centre, see below)
  double yll = 0.0;           ///< L
  bool centre_given = false;  ///< xllcenter/yllcenter instead of corner
  double cellsize = 0.0;      ///< L
  std::optional<double> nodata;
};

struct ArraySource {
  std::filesystem::path file;
  bool readable = false;
  std::vector<ArrayRow> rows;          ///< every data row; NODATA cells of a raster hold NaN
  std::optional<RowBand> band;         ///< data rows whose values are kept (all when unset)
  std::optional<RasterHeader> raster;  ///< set for .asc files
  std::vector<ArrayProblem> problems;  ///< unreadable values, NaN, bad header
  std::string refusal;  ///< set when the file was not read (io/files/input_file_guard)
  std::size_t n_values() const;
};

/// Reads a text array or (by the .asc extension) a raster. Never throws; problems are listed.
/// A file that is not a regular file or exceeds max_bytes is not read (refusal says why).
/// With a band, the file is still read and checked line by line to the end (every process
/// of a distributed run finds the same problems), but only the values of data rows
/// [band.first, band.end()) are kept (data row 0 is the first data line, the northern grid
/// row); the other rows keep their line and value count only.
ArraySource load_array_source(const std::filesystem::path& file,
                              std::uintmax_t max_bytes = UINTMAX_MAX,
                              std::optional<RowBand> band = std::nullopt);

/// Parses one value token; rejects NaN, infinities and trailing text.
std::optional<double> parse_value(const std::string& token);

}  // namespace aquiledger
