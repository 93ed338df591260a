#pragma once
#include <cstdint>
#include <vector>

#include "mesh/grid_part.hpp"
#include "solver/model.hpp"
#include "solver/saturation.hpp"

namespace aquiledger {

/// Numbers derived once from a model before the time loop: which cells are unknowns, cell
/// areas, and the per-cell lengths of the smoothing intervals.
struct SystemLayout {
  std::vector<std::uint8_t> fixed;            ///< per grid cell: 1 when held by a fixed_head
  std::vector<std::int32_t> unknown_of_cell;  ///< per grid cell: equation number, -1 if none
  std::vector<CellIndex> cell_of_unknown;     ///< per equation: its grid cell
  // The arrays below hold the cells whose aquifer arrays the model holds (every cell, or a
  // distributed rank's window of rows: Model::band); the numbering above is the whole grid's.
  CellArray<double> area;  ///< L2 per cell
  /// L per cell: full saturated thickness top - bottom (NaN when there is no top).
  CellArray<double> full_thickness;
  /// L per cell: width of the smoothing of saturated thickness near the base and top.
  CellArray<double> smoothing_length;
  /// L per cell: saturated thickness below which withdrawals are reduced smoothly.
  CellArray<double> reduction_length;
  int n_unknowns() const { return static_cast<int>(cell_of_unknown.size()); }
};

/// Smoothing widths as fractions of the full saturated thickness (top - bottom); where a
/// water-table cell has no top, of `reference_thickness_without_top` instead.
inline constexpr double smoothing_fraction = 1.0e-3;
inline constexpr double reduction_fraction = 1.0e-2;
// withdrawal_inflection_head (stress_kernels.hpp) lies above the base's smoothing ramp.
static_assert(0.5 * reduction_fraction > smoothing_fraction);
inline constexpr double reference_thickness_without_top = 10.0;  ///< L

SystemLayout make_system_layout(const Model& model);

/// Unknowns [first, end): those of the cells a part owns (unknowns follow raster order).
struct UnknownRange {
  int first = 0;
  int end = 0;
};
UnknownRange owned_unknowns(const SystemLayout& layout, const GridPart& part);

/// Saturated thickness of a cell (L) and its derivative with respect to head.
ValueSlope saturated_thickness(const Model& model, const SystemLayout& layout, CellIndex c,
                               double head);

}  // namespace aquiledger
