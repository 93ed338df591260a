#pragma once
// The faces between active neighbouring cells, with their geometric conductance factors,
// and the flow across one face for a model. Index space (which cells) stays in the grid;
// this file adds the geometry and the aquifer properties.
#include <vector>

#include "mesh/grid_part.hpp"
#include "solver/face_conductance.hpp"
#include "solver/model.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

struct Face {
  CellIndex i;  ///< west or north cell
  CellIndex j;  ///< east or south cell
  /// Confined model: conductance (L2/T). Otherwise: conductance per unit saturated
  /// thickness (L/T), multiplied by the face thickness (thickness_face_flow).
  double factor = 0.0;
};

/// Conductance factor of the face between i and its east (east_west) or south neighbour j.
double face_factor(const Model& model, CellIndex i, CellIndex j, bool east_west);

/// The elasticities of face_factor(model, i, j, east_west) with respect to the conductivity
/// of i and of j (harmonic_face_factor_elasticities; a confined cell's transmissivity is its
/// conductivity times a fixed thickness, so the same elasticities hold).
FaceElasticity face_factor_elasticities(const Model& model, CellIndex i, CellIndex j,
                                        bool east_west);

/// Flow into i from j across a face with the given factor (L3/T) and its derivatives.
FaceFlow face_flow(const Model& model, const SystemLayout& layout, CellIndex i, CellIndex j,
                   double factor, double hi, double hj);

/// Net flow (L3/T) from fixed cell c into its active non-fixed neighbours, summed W, E, N, S;
/// head must hold c and its neighbours.
double fixed_cell_net_flow(const Model& model, const SystemLayout& layout, CellIndex c,
                           CellValues head);

/// Calls visit(n, factor) for the active neighbours n of c with the face factor seen from c,
/// in the order W, E, N, S.
template <class Visit>
void for_each_active_neighbour(const Model& model, CellIndex c, Visit&& visit) {
  const RectilinearGrid& g = model.grid;
  const RowCol rc = g.row_col(c);
  auto consider = [&](int r, int col, bool east_west) {
    if (r < 0 || r >= g.n_rows() || col < 0 || col >= g.n_cols()) return;
    const CellIndex n = g.cell(r, col);
    if (!g.is_active(n)) return;
    visit(n, face_factor(model, c, n, east_west));
  };
  consider(rc.row, rc.col - 1, true);
  consider(rc.row, rc.col + 1, true);
  consider(rc.row - 1, rc.col, false);
  consider(rc.row + 1, rc.col, false);
}

/// Every face between two active cells: east faces first in raster order, then south faces.
std::vector<Face> make_face_table(const Model& model);

}  // namespace aquiledger
