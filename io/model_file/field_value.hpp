#pragma once
// Field values: a cell property given as a number, { file = }, or { zones =, values = }
// (io-internal header).
#include <toml++/toml.h>

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "io/model_file/reader_context.hpp"

namespace aquiledger {

/// A field value read for every grid cell, with where it came from (for messages).
struct CellField {
  std::vector<double> values;  ///< raster order from cell `first`; NaN where a raster has NODATA
  std::int32_t first = 0;      ///< grid cell of values[0]: 0, or a band's first cell
  SourceSpot at;               ///< the TOML value
  std::filesystem::path file;  ///< the array file, empty for a number
  std::vector<int> row_line;   ///< line of each grid row in `file` (empty for a number)
  bool uniform = false;        ///< given as one number
  std::vector<int> zone;       ///< zone number per value when given by zones (0 = none)
  /// The values indexed by grid cell.
  CellWindow<const double> cells() const { return {std::span<const double>(values), first}; }
  /// Moves the values out as a per-cell array of the model (from grid cell `first`).
  CellArray<double> take() { return {std::move(values), first}; }
};

/// Reads a field value; needs ctx.shape. Returns nullopt (after reporting) when invalid.
/// With ctx.band set, keeps the values of the band's rows only (CellField::first on).
std::optional<CellField> read_field(ReaderContext& ctx, const toml::node& node,
                                    const std::string& key);
std::optional<CellField> read_field_key(ReaderContext& ctx, const toml::table& table,
                                        std::string_view key, const std::string& path,
                                        bool required);

/// Reports one error for the cells (active ones once the grid exists) where `ok` fails:
/// the first offending value, its row and column, the number of such cells and what was
/// expected. Returns true when every cell passes.
bool check_field(ReaderContext& ctx, const CellField& field, const std::string& key,
                 const std::function<bool(double)>& ok, const std::string& expected);

/// Where a cell of the field was written: the array file line, else the TOML value.
SourceSpot field_cell_spot(const CellField& field, int n_cols, int cell);

/// Column widths or row heights: a number, an array of `count` numbers or { file = }.
std::optional<std::vector<double>> read_spacing(ReaderContext& ctx, const toml::table& table,
                                                std::string_view key, const std::string& path,
                                                int count, const std::string& count_name);

/// Loads an array file through the context's cache; reports a missing file.
const ArraySource* load_cached(ReaderContext& ctx, const std::filesystem::path& file,
                               const SourceSpot& at, const std::string& key);

}  // namespace aquiledger
