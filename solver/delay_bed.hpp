#pragma once
// A delay bed: a fine-grained bed too thick to drain within a step, in which head diffuses
// vertically (Terzaghi, 1925, one-dimensional consolidation):
//   Ss dh/dt = Kv d2h/dz2,
// solved on the bed's own fine grid, implicitly (backward Euler), over the half-bed by
// symmetry: the face at z = 0 drains to the aquifer's head, the mid-plane of the bed
// (z = b/2) has no flow. Coupled to the cells of a model through solver/delay_bed_heads.hpp
// (docs/subsidence.md, "Delay beds").
#include <algorithm>
#include <cassert>
#include <cstddef>
#include <span>
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

/// The law of one delay bed, per unit plan area (docs/subsidence.md, "Delay beds"): each node
/// of the half-bed stores, relative to its preconsolidation head pc,
///   W(h) = Ske max(h - pc, 0) + Skv min(h - pc, 0)        (L per unit thickness)
/// the no-delay beds' law (solver/storage_function.hpp) applied slice by slice.
struct DelayBedLaw {
  double thickness = 0.0;          ///< L, b, equivalent thickness of one bed
  double vertical_k = 0.0;         ///< L/T, Kv
  double elastic_storage = 0.0;    ///< 1/L, Ske
  double inelastic_storage = 0.0;  ///< 1/L, Skv
  int nodes = 1;                   ///< slices of the half-bed
  double slice() const { return 0.5 * thickness / static_cast<double>(nodes); }
};

/// One step of one bed (per unit plan area, both halves). The flow into the aquifer equals
/// the water released over dt: (elastic + inelastic) / dt.
struct DelayBedStepResult {
  double elastic = 0.0;     ///< L, released from the elastic branch over the step (< 0: taken up)
  double inelastic = 0.0;   ///< L, released below pc (permanent)
  double flow = 0.0;        ///< L/T, into the aquifer, (elastic + inelastic) / dt
  double flow_slope = 0.0;  ///< 1/T, d flow / d h_aquifer, exact (condensed bed solve)
  int iterations = 0;       ///< branch (Newton) iterations; 0 when they did not settle
};

/// Solves a tridiagonal system with constant off-diagonals -g (between every pair of
/// neighbouring nodes), diagonal diag and right-hand side rhs, both overwritten; the solution
/// is left in rhs. Thomas algorithm: no pivoting, as the matrix is diagonally dominant.
inline void solve_delay_bed_tridiagonal(std::span<double> diag, std::span<double> rhs, double g) {
  const std::size_t n = diag.size();
  for (std::size_t i = 1; i < n; ++i) {
    const double w = -g / diag[i - 1];
    diag[i] -= w * -g;
    rhs[i] -= w * rhs[i - 1];
  }
  rhs[n - 1] /= diag[n - 1];
  for (std::size_t i = n - 1; i-- > 0;) rhs[i] = (rhs[i] + g * rhs[i + 1]) / diag[i];
}

/// Advances one bed over dt (T) with the aquifer's head h_aquifer (L) on its drained faces
/// (held over the step, backward Euler), from node heads head_old (L) with preconsolidation
/// heads pc (L, fixed over the step, as for no-delay beds); writes the end heads to head_new.
/// The bed's equations are piecewise linear in its heads (one kink per node at pc); Newton's
/// method on them, from head_old, ends when an update leaves every node on the branch it was
/// linearised on, where the solution is exact. For such monotone (M-matrix) systems with
/// concave components Newton's iterates are monotone after the first and end in finitely
/// many steps (Ortega and Rheinboldt, 1970, sec. 13.3; from memory). The slope of the flow
/// into the aquifer is the condensed (Schur-complement) derivative of the converged solve:
/// with J the bed's Jacobian and g0 the face conductance, d h / d h_aquifer = g0 J^-1 e_0, so
/// d flow / d h_aquifer = 2 g0 (g0 (J^-1)_00 - 1) (both halves).
inline DelayBedStepResult solve_delay_bed_step(const DelayBedLaw& law,
                                               std::span<const double> head_old,
                                               std::span<const double> pc, double h_aquifer,
                                               double dt, std::span<double> head_new) {
  const std::size_t n = head_old.size();
  assert(n >= 1 && dt > 0.0 && pc.size() == n && head_new.size() == n);
  const double dz = law.slice();
  const double c_e = law.elastic_storage * dz / dt;    // 1/T: storage of a slice, elastic
  const double c_v = law.inelastic_storage * dz / dt;  // and inelastic
  const double g = law.vertical_k / dz;                // conductance between node centres
  const double g0 = law.vertical_k / (0.5 * dz);       // drained face to the first node
  thread_local std::vector<double> diag, rhs;
  thread_local std::vector<unsigned char> branch;
  diag.resize(n);
  rhs.resize(n);
  branch.resize(n);
  std::copy(head_old.begin(), head_old.end(), head_new.begin());
  auto storage_change = [&](std::size_t j, double h) {  // dz/dt (W(h) - W(h_old)), 1/T * L
    return c_e * (std::max(h - pc[j], 0.0) - std::max(head_old[j] - pc[j], 0.0)) +
           c_v * (std::min(h - pc[j], 0.0) - std::min(head_old[j] - pc[j], 0.0));
  };
  auto fill_jacobian = [&]() {
    for (std::size_t j = 0; j < n; ++j)
      diag[j] = (branch[j] ? c_e : c_v) + (j == 0 ? g0 : g) + (j + 1 < n ? g : 0.0);
  };
  DelayBedStepResult r;
  constexpr int max_branch_iterations = 100;  // our bound; n + 1 would do for monotone iterates
  for (int it = 1; it <= max_branch_iterations; ++it) {
    for (std::size_t j = 0; j < n; ++j) {
      const double h = head_new[j];
      branch[j] = h >= pc[j] ? 1 : 0;
      const double left = j == 0 ? g0 * (h_aquifer - h) : g * (head_new[j - 1] - h);
      const double right = j + 1 < n ? g * (head_new[j + 1] - h) : 0.0;
      rhs[j] = -(storage_change(j, h) - left - right);  // -F
    }
    fill_jacobian();
    solve_delay_bed_tridiagonal(diag, rhs, g);
    bool same = true;
    for (std::size_t j = 0; j < n; ++j) {
      head_new[j] += rhs[j];
      same = same && ((head_new[j] >= pc[j] ? 1 : 0) == branch[j]);
    }
    if (same) {
      r.iterations = it;
      break;
    }
  }
  for (std::size_t j = 0; j < n; ++j) {
    r.elastic += law.elastic_storage * dz *
                 (std::max(head_old[j] - pc[j], 0.0) - std::max(head_new[j] - pc[j], 0.0));
    r.inelastic += law.inelastic_storage * dz *
                   (std::min(head_old[j] - pc[j], 0.0) - std::min(head_new[j] - pc[j], 0.0));
  }
  r.elastic *= 2.0;  // both halves
  r.inelastic *= 2.0;
  r.flow = (r.elastic + r.inelastic) / dt;
  // (J^-1)_00 on the final branches.
  fill_jacobian();
  std::fill(rhs.begin(), rhs.end(), 0.0);
  rhs[0] = 1.0;
  solve_delay_bed_tridiagonal(diag, rhs, g);
  r.flow_slope = 2.0 * g0 * (g0 * rhs[0] - 1.0);
  return r;
}

/// Advances the bed over dt (T) with the aquifer's head h_aquifer (L) on its drained face
/// (held over the step, implicit in time): solve_delay_bed_step with one specific storage
/// on both branches. Returns the water released, both halves, which equals
/// 2 Ss dz sum(h_old - h_new) exactly (up to rounding): the bed's own balance.
inline DelayBedStep advance_delay_bed(DelayBed& bed, double h_aquifer, double dt) {
  const std::size_t n = bed.head.size();
  assert(n >= 1 && dt > 0.0);
  const DelayBedLaw law{bed.thickness, bed.vertical_k, bed.specific_storage, bed.specific_storage,
                        static_cast<int>(n)};
  const std::vector<double> pc(n, 0.0);  // either branch: the storage is the same
  std::vector<double> h(n);
  const DelayBedStepResult r = solve_delay_bed_step(law, bed.head, pc, h_aquifer, dt, h);
  bed.head = std::move(h);
  return {r.elastic + r.inelastic};
}

/// Flow (L/T per unit area, both faces, positive into the aquifer) through the drained
/// faces at the bed's current heads: 2 Kv (h_1 - h_aquifer) / (dz / 2).
inline double delay_bed_face_flow(const DelayBed& bed, double h_aquifer) {
  return 2.0 * bed.vertical_k * (bed.head[0] - h_aquifer) / (0.5 * bed.slice());
}

}  // namespace aquiledger
