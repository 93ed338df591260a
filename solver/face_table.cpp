#include "solver/face_table.hpp"

#include <utility>

namespace aquiledger {

namespace {

/// The arguments of harmonic_face_factor for the face between i and j (i before j).
struct FaceArguments {
  double w, ki, di, kj, dj;
};

FaceArguments face_arguments(const Model& model, CellIndex i, CellIndex j, bool east_west) {
  const RectilinearGrid& g = model.grid;
  const Aquifer& aq = model.aquifer;
  const RowCol a = g.row_col(i);
  const RowCol b = g.row_col(j);
  const auto ii = static_cast<std::size_t>(i.value);
  const auto jj = static_cast<std::size_t>(j.value);
  const double w = east_west ? g.dy(a.row) : g.dx(a.col);
  const double di = east_west ? g.dx(a.col) : g.dy(a.row);
  const double dj = east_west ? g.dx(b.col) : g.dy(b.row);
  double ki = east_west ? aq.kx[ii] : aq.ky[ii];
  double kj = east_west ? aq.kx[jj] : aq.ky[jj];
  if (aq.condition == Condition::confined) {
    ki *= aq.top[ii] - aq.bottom[ii];
    kj *= aq.top[jj] - aq.bottom[jj];
  }
  return {w, ki, di, kj, dj};
}

}  // namespace

double face_factor(const Model& model, CellIndex i, CellIndex j, bool east_west) {
  // The same bits seen from either side: the face flows of neighbours then cancel exactly
  // in the sum of the residuals, and the confined Jacobian is exactly symmetric.
  if (j < i) std::swap(i, j);
  const FaceArguments f = face_arguments(model, i, j, east_west);
  return harmonic_face_factor(f.w, f.ki, f.di, f.kj, f.dj);
}

FaceElasticity face_factor_elasticities(const Model& model, CellIndex i, CellIndex j,
                                        bool east_west) {
  const bool swapped = j < i;
  if (swapped) std::swap(i, j);
  const FaceArguments f = face_arguments(model, i, j, east_west);
  const FaceElasticity e = harmonic_face_factor_elasticities(f.ki, f.di, f.kj, f.dj);
  return swapped ? FaceElasticity{e.j, e.i} : e;
}

FaceFlow face_flow(const Model& model, const SystemLayout& layout, CellIndex i, CellIndex j,
                   double factor, double hi, double hj) {
  if (model.aquifer.condition == Condition::confined) return linear_face_flow(factor, hi, hj);
  return thickness_face_flow(model.solver.face_thickness, factor, hi,
                             saturated_thickness(model, layout, i, hi), hj,
                             saturated_thickness(model, layout, j, hj));
}

/// Net flow (L3/T) from fixed cell c into its active non-fixed neighbours.
double fixed_cell_net_flow(const Model& model, const SystemLayout& layout, CellIndex c,
                           CellValues head) {
  double net = 0.0;
  for_each_active_neighbour(model, c, [&](CellIndex nb, double factor) {
    if (layout.fixed[at(nb)]) return;
    net += face_flow(model, layout, nb, c, factor, head[at(nb)], head[at(c)]).q;
  });
  return net;
}

std::vector<Face> make_face_table(const Model& model) {
  const RectilinearGrid& g = model.grid;
  std::vector<Face> faces;
  for (int pass = 0; pass < 2; ++pass) {
    const bool east_west = pass == 0;
    for (int r = 0; r < g.n_rows(); ++r)
      for (int c = 0; c < g.n_cols(); ++c) {
        const CellIndex i = g.cell(r, c);
        const auto j = east_west ? g.east_of(i) : g.south_of(i);
        if (!j || !g.is_active(i) || !g.is_active(*j)) continue;
        faces.push_back({i, *j, face_factor(model, i, *j, east_west)});
      }
  }
  return faces;
}

}  // namespace aquiledger
