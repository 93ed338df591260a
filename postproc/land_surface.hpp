#pragma once
// Heads against the land surface (Aquifer::land_surface): where the head stands above the
// ground the cell is flooded or, under a confining bed, flowing artesian; a model of a
// water-table aquifer without surface-water features there is likely wrong.
#include <span>
#include <vector>

#include "mesh/grid_part.hpp"
#include "solver/model.hpp"

namespace aquiledger {

struct HeadsAboveSurface {
  struct Cell {
    CellIndex cell;
    double excess = 0.0;  ///< L, head minus land surface (> 0)
  };
  long cells = 0;           ///< active cells whose head is above the land surface
  std::vector<Cell> worst;  ///< the largest excesses, largest first
};

/// The active cells a part owns whose head stands above the land surface (none without one),
/// with up to n_worst of the largest excesses; head holds the owned cells.
HeadsAboveSurface heads_above_land_surface(const Model& model, const GridPart& part,
                                           CellValues head, std::size_t n_worst = 3);

/// Land surface minus head (L) of the cells a part owns, NaN where inactive; empty without a
/// land surface. Negative above the ground.
std::vector<double> depth_to_water(const Model& model, const GridPart& part, CellValues head);

}  // namespace aquiledger
