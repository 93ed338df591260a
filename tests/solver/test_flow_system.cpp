// The assembled Jacobian against central finite differences of the residual, on a small
// switching model whose cells sit in every regime (confined, water table, both smoothing
// intervals, well-reduction zone) with every kind of stress.
#include <catch2/catch.hpp>
#include <cmath>

#include "solver/flow_system.hpp"
#include "solver/system_layout.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {

Model switching_model(Condition condition) {
  test::AquiferSpec a;
  a.condition = condition;
  a.top = 10.0;
  a.bottom = 0.0;
  Model m = test::make_model({3.0, 5.0, 4.0, 6.0, 2.0}, {4.0, 3.0, 5.0, 2.0}, a);
  const auto n = static_cast<std::size_t>(m.grid.n_cells());
  for (std::size_t i = 0; i < n; ++i) {
    m.aquifer.kx[i] = 2.0 + 0.3 * static_cast<double>(i % 7);
    m.aquifer.ky[i] = 1.0 + 0.2 * static_cast<double>(i % 5);
    m.aquifer.bottom[i] = 0.1 * static_cast<double>(i % 3);
  }
  test::add_period(m, 1.0, 1);
  // Heads across the regimes; eps = 0.01 and the reduction length 0.1 for thickness 10.
  const double pattern[] = {12.0, 9.995, 9.0, 5.0, 0.105, 0.004, 11.0, 10.3, 3.0, 7.5};
  for (std::size_t i = 0; i < n; ++i) m.initial.head[i] = m.aquifer.bottom[i] + pattern[i % 10];
  test::add_well(m, 0, 4, {30.0});   // cell with b in the reduction zone
  test::add_well(m, 2, 2, {-12.0});  // injection
  test::add_recharge(m, {0.002});
  Recharge neg;
  neg.name = "withdrawal";
  neg.cells = {m.grid.cell(0, 4), m.grid.cell(1, 0)};
  neg.rate = PeriodValues(-0.01);
  m.recharges.push_back(neg);
  test::add_fixed_head(m, {m.grid.cell(3, 0)}, 8.0);
  River river;
  river.name = "river";
  river.cells = {m.grid.cell(1, 1), m.grid.cell(1, 2), m.grid.cell(1, 3)};
  river.length = {1.0, 1.0, 1.0};
  river.stage = PeriodValues(9.5);
  river.bed_bottom = PeriodValues(8.0);
  river.conductance = PeriodValues(3.0);
  m.rivers.push_back(river);
  Drain drain;
  drain.name = "drain";
  drain.cells = {m.grid.cell(0, 0), m.grid.cell(2, 3)};
  drain.elevation = PeriodValues(9.0);
  drain.conductance = PeriodValues(2.0);
  m.drains.push_back(drain);
  ExternalHead ext;
  ext.name = "external";
  ext.cells = {m.grid.cell(3, 4)};
  ext.head = PeriodValues(11.0);
  ext.conductance = PeriodValues(1.5);
  m.external_heads.push_back(ext);
  Evapotranspiration et;
  et.name = "et";
  et.cells = {m.grid.cell(2, 0), m.grid.cell(2, 1), m.grid.cell(0, 1)};
  et.surface = PeriodValues(11.0);
  et.max_rate = PeriodValues(0.003);
  et.extinction_depth = PeriodValues(3.0);
  m.evapotranspiration.push_back(et);
  Leakage leak;
  for (int i = 0; i < m.grid.n_cells(); ++i) leak.cells.push_back(CellIndex{i});
  leak.source_head = PeriodValues(12.0);
  leak.leakance = PeriodValues(1e-3);
  m.leakage = leak;
  return m;
}

/// Largest entry-wise difference between -dR/dh assembled and by central differences,
/// relative to the largest entry of the matrix.
double jacobian_error(const Model& m, bool steady) {
  const SystemLayout layout = make_system_layout(m);
  FlowSystem sys(m, layout);
  std::vector<double> head_old = m.initial.head.values();
  for (std::size_t i = 0; i < head_old.size(); ++i) head_old[i] += 0.37;  // storage in every regime
  sys.set_step(0, steady, 0.25, head_old);
  std::vector<double> head = m.initial.head.values();
  head[static_cast<std::size_t>(m.grid.cell(3, 0).value)] = 8.0;
  if (m.aquifer.interbeds) {
    // Interbeds: every other cell below its preconsolidation head (inelastic), the others
    // above it (elastic), 0.2 from the kink either way.
    std::vector<double> pc(head.size());
    for (std::size_t i = 0; i < pc.size(); ++i) pc[i] = head[i] + (i % 2 == 0 ? 0.2 : -0.2);
    sys.set_preconsolidation(pc);
  }
  // Delay beds: nodes spread 0.6 above to 0.6 below the cell's start head, with
  // preconsolidation heads that put some nodes of every bed on each branch.
  DelayBedHeads beds(m, GridPart::whole(m.grid));
  if (beds.active()) {
    beds.start(head_old);
    std::vector<double> nodes = beds.node_heads(), pcs = beds.node_preconsolidation();
    const std::size_t n = beds.nodes();
    for (std::size_t k = 0; k < nodes.size(); ++k) {
      const double x = static_cast<double>(k % n) / static_cast<double>(n) - 0.5;
      nodes[k] += 1.2 * x;
      pcs[k] = nodes[k] + (k % 3 == 0 ? 0.3 : -0.25) - 0.1 * x;
    }
    REQUIRE(beds.resume(nodes, pcs));
    sys.set_delay_beds(&beds);
  }
  sys.assemble(head);
  const Eigen::MatrixXd a(sys.matrix());
  const double scale = a.cwiseAbs().maxCoeff();
  double worst = 0.0;
  const double h = 1e-7;
  for (int u = 0; u < sys.n_unknowns(); ++u) {
    const auto i =
        static_cast<std::size_t>(layout.cell_of_unknown[static_cast<std::size_t>(u)].value);
    const double h0 = head[i];
    head[i] = h0 + h;
    sys.assemble(head);
    const Eigen::VectorXd rp = sys.residual();
    head[i] = h0 - h;
    sys.assemble(head);
    const Eigen::VectorXd rm = sys.residual();
    head[i] = h0;
    const Eigen::VectorXd column = -(rp - rm) / (2 * h);
    worst = std::max(worst, (column - a.col(u)).cwiseAbs().maxCoeff());
  }
  return worst / scale;
}

}  // namespace

TEST_CASE("exact Jacobian matches finite differences of the residual", "[flow_system]") {
  // Central differences with h = 1e-7 on functions that are smooth at every evaluated head
  // (kinks kept > 1e-4 away) carry truncation ~ h^2 and rounding ~ 1e-16 R / h ~ 1e-8.
  // Both face-thickness schemes; the heads put faces at wet, drying (thin against thick, in
  // the blend of the mean scheme) and dry states.
  for (Condition c : {Condition::switching, Condition::water_table, Condition::confined})
    for (FaceThickness f : {FaceThickness::mean, FaceThickness::upstream}) {
      Model m = switching_model(c);
      m.solver.face_thickness = f;
      CHECK(jacobian_error(m, false) < 1e-6);
      CHECK(jacobian_error(m, true) < 1e-6);
      // No-delay interbeds on top (Ske b = 1e-4, Skv b = 2e-3).
      test::add_interbeds(m, 10.0, 1e-5, 2e-4, 0.0);
      CHECK(jacobian_error(m, false) < 1e-6);
      // Delay beds on top: two beds of 2 m, Kv 1e-3, Ske 1e-5, Skv 3e-4, 8 slices a half;
      // their flow enters the row through the condensed derivative of the bed solve.
      test::add_delay_beds(m, 2.0, 2.0, 1e-3, 1e-5, 3e-4, 8);
      CHECK(jacobian_error(m, false) < 1e-6);
      CHECK(jacobian_error(m, true) < 1e-6);  // steady: the beds take no part
    }
}

TEST_CASE("confined Jacobian is symmetric", "[flow_system]") {
  // Without upstream weighting the face terms are symmetric and stresses touch the diagonal.
  const Model m = switching_model(Condition::confined);
  const SystemLayout layout = make_system_layout(m);
  FlowSystem sys(m, layout);
  sys.set_step(0, false, 0.5, m.initial.head.values());
  sys.assemble(m.initial.head.values());
  const Eigen::MatrixXd a(sys.matrix());
  CHECK((a - a.transpose()).cwiseAbs().maxCoeff() == 0.0);
  CHECK(sys.symmetric());
}
