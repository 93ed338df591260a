#pragma once
// Heads at chosen times as files that `[initial] head = { file = ... }` reads back, so that a
// scenario can start from the state of an earlier (calibrated) run: a text array (one grid
// row per line, northern row first) and, on a uniform grid, an ESRI ASCII grid (.asc).
#include <filesystem>
#include <optional>
#include <span>
#include <string>

#include "io/files/output_error.hpp"
#include "io/model_file/array_source.hpp"
#include "solver/model.hpp"

namespace aquiledger {

/// The text array: comment lines (#) naming the model, time and units, then n_rows lines of
/// n_cols heads (L) in the shortest text that reads back to the same double.
/// head: per grid cell (raster order), NaN where inactive.
std::string head_text_array(const Model& model, std::span<const double> head, double time);

/// The ESRI ASCII grid of the same heads, or nothing when the grid is not uniform (every
/// dx and dy the same): a raster has one cell size.
std::optional<std::string> head_ascii_grid(const Model& model, std::span<const double> head);

/// The files written for one time.
struct HeadArrayFiles {
  std::string text;  ///< file name in the folder
  std::string grid;  ///< empty when the grid is not uniform
};

/// "head_at_365": the stem of the files for a time (T, shortest text).
std::string head_array_stem(double time);

/// Writes STEM.txt and (on a uniform grid) STEM.asc into folder, atomically; throws
/// OutputError naming the file on failure.
HeadArrayFiles write_head_arrays(const std::filesystem::path& folder, const Model& model,
                                 std::span<const double> head, double time);

}  // namespace aquiledger
