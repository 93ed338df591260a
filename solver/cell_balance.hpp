#pragma once
// The mass balance of one unknown cell and its row of -dR/dh. Both engines evaluate rows
// through this function: the serial one (flow_system.cpp) and the distributed one
// (solver/distributed/), so there is one copy of the discrete physics.
#include <cmath>

#include "mesh/cell_index.hpp"
#include "solver/face_conductance.hpp"
#include "solver/storage_function.hpp"

namespace aquiledger {

struct CellRowInput {
  double head = 0.0;       ///< L
  ValueSlope thickness;    ///< L and -, saturated thickness at head (unused when confined)
  double stress_q = 0.0;   ///< L3/T into the cell from every stress
  double stress_dq = 0.0;  ///< L2/T, its head derivative
  const CellStorage* storage = nullptr;                ///< null for a steady step (no storage term)
  double head_old = 0.0;                               ///< L, start of the step
  double area = 0.0;                                   ///< L2
  double inv_dt = 0.0;                                 ///< 1/T
  FaceThickness face_thickness = FaceThickness::mean;  ///< unused when confined
};

struct CellRow {
  double residual = 0.0;      ///< L3/T: face flows + stresses + storage release rate
  double diagonal = 0.0;      ///< L2/T: dR/dh of the cell itself
  double budget_terms = 0.0;  ///< L3/T: |stresses| + |storage release|
  double head_quantum = 0.0;  ///< L3/T: |diagonal| |head|, see rounding_floor
};

/// ~ 500 machine epsilons: the sum over a cell's terms and over all cells loses a few bits.
inline constexpr double rounding_factor = 1.0e-13;

/// Two machine epsilons (2^-51): the double nearest a head h lies within eps |h| of it.
inline constexpr double head_quantum_factor = 0x1p-51;

/// L3/T: the imbalance rounding alone can leave, so tolerances below it are not asked for.
/// term_sum: sum of |stresses| and |storage release| (and fixed-head net flows); face_sum:
/// sum of |face flows|; quantum_sum: sum over cells of |diagonal| |head| (CellRow). The
/// first part is the rounding of evaluating the terms. The second is the quantisation of the
/// heads themselves: at the double nearest the exact solution a cell's residual is still
/// up to sum_j |J_ij| eps |h_j| <= 2 eps |J_ii| |h| (the Jacobian is diagonally dominant), a
/// level no Newton update can go below. It decides only near an equilibrium, where every
/// flow and storage change tends to zero while the heads stay finite (a strip that has
/// filled to its canal's level, a basin at steady state in a transient period).
inline double rounding_floor(double term_sum, double face_sum, double quantum_sum) {
  return rounding_factor * (term_sum + face_sum) + head_quantum_factor * quantum_sum;
}

/// A cell has at most four neighbours (west, east, north, south) on the rectilinear grid.
inline constexpr int max_cell_neighbours = 4;

/// What every row of one step shares: storage only in a transient step (1/dt), and the face
/// thickness rule of the model.
struct RowStep {
  bool transient = false;
  double inv_dt = 0.0;  ///< 1/T, 0 in a steady step
  FaceThickness face_thickness = FaceThickness::mean;
};

inline RowStep row_step(bool steady, double dt, FaceThickness face_thickness) {
  return {!steady, steady ? 0.0 : 1.0 / dt, face_thickness};
}

/// Cell c's CellRowInput in both engines: head_at(c) and thickness_at(c) give a cell's head
/// and saturated thickness (the latter never called when Confined); the stresses' flow and
/// slope; the storage law, start head and area, which only a transient step uses.
template <bool Confined, class HeadAt, class ThicknessAt>
inline CellRowInput row_input(const RowStep& step, CellIndex c, HeadAt&& head_at,
                              ThicknessAt&& thickness_at, double stress_q, double stress_dq,
                              const CellStorage& storage, double head_old, double area) {
  CellRowInput in;
  in.head = head_at(c);
  if constexpr (!Confined) {
    in.thickness = thickness_at(c);
    in.face_thickness = step.face_thickness;
  }
  in.stress_q = stress_q;
  in.stress_dq = stress_dq;
  if (step.transient) {
    in.storage = &storage;
    in.head_old = head_old;
    in.area = area;
    in.inv_dt = step.inv_dt;
  }
  return in;
}

/// The faces argument of cell_row over a cell's neighbour list (max_cell_neighbours entries
/// with a cell and a factor, ended early by an invalid cell): head_at(c) and thickness_at(c)
/// give a neighbour's head and saturated thickness (the latter never called when Confined).
template <bool Confined, class Neighbour, class HeadAt, class ThicknessAt>
inline auto neighbour_faces(const Neighbour* neighbours, HeadAt&& head_at,
                            ThicknessAt&& thickness_at) {
  return [=, &head_at, &thickness_at](auto&& visit) {
    for (int k = 0; k < max_cell_neighbours; ++k) {
      const Neighbour& nb = neighbours[k];
      if (!nb.cell.valid()) break;
      if constexpr (Confined)
        visit(k, nb.factor, head_at(nb.cell), ValueSlope{});
      else
        visit(k, nb.factor, head_at(nb.cell), thickness_at(nb.cell));
    }
  };
}

/// faces(visit) calls visit(k, factor, hj, bj) for each active neighbour k in the order W, E,
/// N, S (factor: see Face::factor; hj its head; bj its saturated thickness when not confined);
/// off(k, value) receives the entry -dR/dhj of that neighbour. The sum of |face flows| is
/// added to face_sum as the faces come, so that a caller's running sum keeps its order.
template <bool Confined, class Faces, class OffDiagonal>
inline CellRow cell_row(const CellRowInput& in, Faces&& faces, OffDiagonal&& off,
                        double& face_sum) {
  CellRow row{in.stress_q, in.stress_dq, std::abs(in.stress_q)};
  faces([&](int k, double factor, double hj, ValueSlope bj) {
    const FaceFlow f =
        Confined ? linear_face_flow(factor, in.head, hj)
                 : thickness_face_flow(in.face_thickness, factor, in.head, in.thickness, hj, bj);
    row.residual += f.q;
    face_sum += std::abs(f.q);
    row.diagonal += f.dq_dhi;
    off(k, -f.dq_dhj);
  });
  if (in.storage != nullptr) {
    const double release =
        -in.area * stored_water_change(*in.storage, in.head_old, in.head).total() * in.inv_dt;
    row.residual += release;
    row.diagonal -= in.area * stored_water_slope(*in.storage, in.head) * in.inv_dt;
    row.budget_terms += std::abs(release);
  }
  row.head_quantum = std::abs(row.diagonal) * std::abs(in.head);
  return row;
}

}  // namespace aquiledger
