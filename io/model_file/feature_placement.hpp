#pragma once
// Where a feature acts: edge, cells, mask, polyline or an (x, y) point (io-internal header).
#include <toml++/toml.h>

#include <optional>
#include <string>
#include <vector>

#include "io/model_file/reader_context.hpp"

namespace aquiledger {

enum class PlacementDefault { required, every_active_cell };

struct Placement {
  std::vector<CellIndex> cells;  ///< active cells, no repeats
  std::vector<double> length;    ///< L of channel per cell (polyline placement only)
  /// Polyline placement: per cell, the (vertex, weight) pairs of CellLength::vertex_weights,
  /// and the number of vertices (values given at the vertices, `{ vertices = [...] }`).
  std::vector<std::vector<std::pair<std::size_t, double>>> vertex_weights;
  std::size_t n_vertices = 0;
  bool polyline = false;
  bool defaulted = false;  ///< no placement key: every active cell
  SourceSpot at;           ///< the placement key's value
};

/// Reads the placement keys of a feature table; needs ctx.grid. Reports an error for a
/// placement that names no active cell, for two placements at once, and for cells outside
/// the grid or inactive.
std::optional<Placement> read_placement(ReaderContext& ctx, const toml::table& table,
                                        const std::string& path, PlacementDefault fallback);

}  // namespace aquiledger
