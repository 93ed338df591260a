#pragma once
// A delay bed: a fine-grained bed too thick to drain within a step, in which head diffuses
// vertically (Terzaghi, 1925, one-dimensional consolidation):
//   Ss dh/dt = Kv d2h/dz2,
// solved on the bed's own fine grid, implicitly (backward Euler), over the half-bed by
// symmetry: the face at z = 0 drains to the aquifer's head, the mid-plane of the bed
// (z = b/2) has no flow. A building block for docs/subsidence.md ("Delay beds"); it is not
// yet coupled to the cells of a model.
#include <cassert>
#include <cstddef>
#include <vector>

namespace aquiledger {

/// One delay bed of equivalent thickness b (L): n nodes at the centres of equal slices of
/// the half-bed (b/2), each with its head (L).
struct DelayBed {
  double thickness = 0.0;         ///< L, b (the whole bed; the grid covers b/2)
  double vertical_k = 0.0;        ///< L/T, Kv of the bed
  double specific_storage = 0.0;  ///< 1/L, skeletal specific storage of the bed (Ske or Skv)
  std::vector<double> head;       ///< L, per node from the drained face to the mid-plane
  double slice() const { return 0.5 * thickness / static_cast<double>(head.size()); }
};

/// Water (L, per unit plan area of one bed, both halves) that one step releases to the
/// aquifer across the bed's two drained faces.
struct DelayBedStep {
  double released = 0.0;  ///< L, = storage lost by the bed over the step
};

/// Advances the bed over dt (T) with the aquifer's head h_aquifer (L) on its drained face
/// (held over the step, implicit in time). The drained face is half a slice from the first
/// node. The tridiagonal system is solved by the Thomas algorithm (diagonally dominant, so
/// no pivoting is needed). Returns the water released, both halves, which equals
/// 2 Ss dz sum(h_old - h_new) exactly (up to rounding): the bed's own balance.
inline DelayBedStep advance_delay_bed(DelayBed& bed, double h_aquifer, double dt) {
  const std::size_t n = bed.head.size();
  assert(n >= 1 && dt > 0.0);
  const double dz = bed.slice();
  const double c = bed.specific_storage * dz / dt;  // 1/T per unit area: storage of a slice
  const double g = bed.vertical_k / dz;             // conductance between node centres
  const double g0 = bed.vertical_k / (0.5 * dz);    // drained face to the first node
  std::vector<double> lower(n, 0.0), diag(n, 0.0), upper(n, 0.0), rhs(n, 0.0);
  for (std::size_t i = 0; i < n; ++i) {
    diag[i] = c;
    rhs[i] = c * bed.head[i];
    if (i == 0) {
      diag[i] += g0;
      rhs[i] += g0 * h_aquifer;
    } else {
      diag[i] += g;
      lower[i] = -g;
    }
    if (i + 1 < n) {
      diag[i] += g;
      upper[i] = -g;
    }
  }
  for (std::size_t i = 1; i < n; ++i) {
    const double w = lower[i] / diag[i - 1];
    diag[i] -= w * upper[i - 1];
    rhs[i] -= w * rhs[i - 1];
  }
  std::vector<double> h(n);
  h[n - 1] = rhs[n - 1] / diag[n - 1];
  for (std::size_t i = n - 1; i-- > 0;) h[i] = (rhs[i] - upper[i] * h[i + 1]) / diag[i];
  DelayBedStep step;
  for (std::size_t i = 0; i < n; ++i)
    step.released += bed.specific_storage * dz * (bed.head[i] - h[i]);
  step.released *= 2.0;  // both halves
  bed.head = std::move(h);
  return step;
}

/// Flow (L/T per unit area, both faces, positive into the aquifer) through the drained
/// faces at the bed's current heads: 2 Kv (h_1 - h_aquifer) / (dz / 2).
inline double delay_bed_face_flow(const DelayBed& bed, double h_aquifer) {
  return 2.0 * bed.vertical_k * (bed.head[0] - h_aquifer) / (0.5 * bed.slice());
}

}  // namespace aquiledger
