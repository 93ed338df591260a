#pragma once
#include <cstddef>
#include <cstdint>
#include <functional>

namespace aquiledger {

/// Index of a grid cell in raster order: row-major, the northern row first, 0-based.
struct CellIndex {
  std::int32_t value = -1;
  constexpr bool valid() const { return value >= 0; }
  friend constexpr bool operator==(CellIndex, CellIndex) = default;
  friend constexpr auto operator<=>(CellIndex, CellIndex) = default;
};

/// The cell's position in a per-cell array (raster order).
constexpr std::size_t at(CellIndex c) { return static_cast<std::size_t>(c.value); }

/// Row and column of a cell, 0-based; row 0 is the northern edge, column 0 the western edge.
struct RowCol {
  std::int32_t row = 0;
  std::int32_t col = 0;
  friend constexpr bool operator==(RowCol, RowCol) = default;
};

}  // namespace aquiledger
