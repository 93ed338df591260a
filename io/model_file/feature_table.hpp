#pragma once
// Point features listed in a CSV file (io-internal header): a `[[well]]` or `[[observation]]`
// entry with `table = "wells.csv"` stands for one feature per row. Columns by name (any
// order): name, x, y, then the section's optional columns. Every row is checked (name given
// and unique, numbers, a point in an active cell) and every error names the file, the line
// and the column.
#include <toml++/toml.h>

#include <initializer_list>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "io/model_file/reader_context.hpp"

namespace aquiledger {

struct FeatureTableRow {
  SourceSpot at;  ///< file and line of the row
  std::string name;
  double x = 0.0, y = 0.0;  ///< L
  CellIndex cell;
  /// The optional columns' cells, trimmed, in the order asked for ("" when absent or empty).
  std::vector<std::string> extra;
};

/// The rows of the file named by `table` in the entry at `path`; `seen` holds the names
/// already used in the section (the rows' names are added). Rows with errors are reported
/// and left out; nullopt when the file cannot be used at all. Needs ctx.grid.
std::optional<std::vector<FeatureTableRow>> read_feature_table(
    ReaderContext& ctx, const toml::table& entry, const std::string& path,
    std::initializer_list<std::string_view> optional_columns, NameSet& seen);

}  // namespace aquiledger
