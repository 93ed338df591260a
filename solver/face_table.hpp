#pragma once
// The faces between active neighbouring cells, with their geometric conductance factors,
// and the flow across one face for a model. Index space (which cells) stays in the grid;
// this file adds the geometry and the aquifer properties.
#include <vector>

#include "solver/face_conductance.hpp"
#include "solver/model.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

struct Face {
  CellIndex i;  ///< west or north cell
  CellIndex j;  ///< east or south cell
  /// Confined model: conductance (L2/T). Otherwise: conductance per unit saturated
  /// thickness (L/T), multiplied by the upstream thickness.
  double factor = 0.0;
};

/// Conductance factor of the face between i and its east (east_west) or south neighbour j.
double face_factor(const Model& model, CellIndex i, CellIndex j, bool east_west);

/// Flow into i from j across a face with the given factor (L3/T) and its derivatives.
FaceFlow face_flow(const Model& model, const SystemLayout& layout, CellIndex i, CellIndex j,
                   double factor, double hi, double hj);

/// Every face between two active cells: east faces first in raster order, then south faces.
std::vector<Face> make_face_table(const Model& model);

}  // namespace aquiledger
