// The loops over stress features: which cells carry stresses, the per-feature in/out split
// and the per-cell derivatives handed to Newton.
#include <catch2/catch.hpp>
#include <cmath>
#include <string>
#include <vector>

#include "solver/stress_flows.hpp"
#include "solver/system_layout.hpp"
#include "stress_test_models.hpp"

using namespace aquiledger;
using namespace aquiledger::stress_tests;

namespace {

constexpr double area = 100.0 * 100.0;  ///< L2, cell area of the test row

/// One row of four 100 m cells, switching, top 0, bottom -10; the east cell is fixed.
/// Every kind of stress is present.
Model row_with_every_stress() {
  UniformAquifer a;
  a.condition = Condition::switching;
  Model m = uniform_model(1, 4, 100.0, 100.0, a);
  m.wells.push_back(Well{"supply", 50.0, 50.0, CellIndex{0}, PeriodValues(300.0)});
  m.wells.push_back(Well{"injector", 250.0, 50.0, CellIndex{2}, PeriodValues(-40.0)});
  m.fixed_heads.push_back(FixedHead{"lake", {CellIndex{3}}, PeriodValues(0.0)});
  m.recharges.push_back(Recharge{"rain", all_cells(m), PeriodValues(1e-3)});
  m.rivers.push_back(River{"creek",
                           {CellIndex{1}, CellIndex{2}, CellIndex{3}},
                           {1.0, 1.0, 1.0},
                           PeriodValues(3.0),
                           PeriodValues(-1.0),
                           PeriodValues(15.0)});
  m.drains.push_back(Drain{"tiles", {CellIndex{2}}, PeriodValues(4.0), PeriodValues(50.0)});
  m.external_heads.push_back(
      ExternalHead{"regional", {CellIndex{0}}, PeriodValues(2.0), PeriodValues(20.0)});
  m.evapotranspiration.push_back(Evapotranspiration{"riparian",
                                                    {CellIndex{1}, CellIndex{2}},
                                                    PeriodValues(2.0),
                                                    PeriodValues(3e-3),
                                                    PeriodValues(3.0)});
  m.leakage = Leakage{"leakage", all_cells(m), PeriodValues(0.5), PeriodValues(2e-5)};
  return m;
}

}  // namespace

TEST_CASE("features are listed in the fixed order with their labels", "[stress_flows]") {
  const Model m = row_with_every_stress();
  const std::vector<FeatureRef> f = list_features(m);
  REQUIRE(f.size() == 9);
  const std::vector<std::string> labels{"well",   "well",  "fixed_head",    "recharge",
                                        "river",  "drain", "external_head", "evapotranspiration",
                                        "leakage"};
  for (std::size_t k = 0; k < f.size(); ++k) CHECK(feature_kind_label(f[k].kind) == labels[k]);
  CHECK(f[1].name == "injector");
  CHECK(f[1].index == 1);
}

TEST_CASE("per-feature flows follow each law cell by cell and skip fixed cells", "[stress_flows]") {
  const Model m = row_with_every_stress();
  const SystemLayout layout = make_system_layout(m);
  // Heads: west cell nearly dry (b = 0.5 reduction lengths), then 1, 5; the fixed cell 0.
  const double b_well = 0.5 * layout.reduction_length[0];
  const std::vector<double> head{-10.0 + b_well, 1.0, 5.0, 0.0};
  std::vector<FeatureFlow> flows(list_features(m).size(), FeatureFlow{-1.0, -1.0, -1.0});
  stress_flows_by_feature(m, layout, 0, head, flows);

  // Fixed-head rows are left for the budget to fill.
  CHECK(flows[2].in == -1.0);
  // Reduced withdrawal: phi = smoothstep(1/2) = 1/2 (cubic 3x^2 - 2x^3, project decision);
  // delivered + shortfall = requested.
  CHECK(flows[0].out == Approx(150.0).epsilon(1e-12));
  CHECK(flows[0].shortfall == Approx(150.0).epsilon(1e-12));
  CHECK(flows[0].in == 0.0);
  CHECK(flows[1].in == Approx(40.0).epsilon(1e-15));  // injection, never reduced
  // Recharge only on the three unfixed cells: rate x area each.
  CHECK(flows[3].in == Approx(3 * 1e-3 * area).epsilon(1e-14));
  // River C (stage - h) per cell, split: cell 1 losing 15 x 2, cell 2 gaining 15 x 2.
  CHECK(flows[4].in == Approx(30.0).epsilon(1e-14));
  CHECK(flows[4].out == Approx(30.0).epsilon(1e-14));
  CHECK(flows[5].out == Approx(50.0 * (5.0 - 4.0)).epsilon(1e-14));
  CHECK(flows[6].in == Approx(20.0 * (2.0 - head[0])).epsilon(1e-14));
  // ET: cell 1 at depth 1 of 3 (two thirds of the rate), cell 2 above the surface (full).
  CHECK(flows[7].out == Approx(area * 3e-3 * (2.0 / 3.0 + 1.0)).epsilon(1e-12));
  // Leakage: cell 0 below the top takes L (H - top); cells 1, 2 lose L (h - H).
  CHECK(flows[8].in == Approx(area * 2e-5 * 0.5).epsilon(1e-12));
  CHECK(flows[8].out == Approx(area * 2e-5 * (0.5 + 4.5)).epsilon(1e-12));

  // The per-cell sums handed to Newton carry the same net flow; nothing in the fixed cell.
  std::vector<double> q(4, 0.0), dq(4, 0.0);
  add_stress_flows(m, layout, 0, head, q, dq);
  double net_features = 0.0;
  for (std::size_t k = 0; k < flows.size(); ++k)
    if (k != 2) net_features += flows[k].in - flows[k].out;
  CHECK(q[0] + q[1] + q[2] + q[3] == Approx(net_features).epsilon(1e-13));
  CHECK(q[3] == 0.0);
  CHECK(dq[3] == 0.0);
}

TEST_CASE("per-cell stress derivatives match finite differences", "[stress_flows]") {
  const Model m = row_with_every_stress();
  const SystemLayout layout = make_system_layout(m);
  // Heads inside smoothing and reduction intervals as well as plain ones.
  for (const std::vector<double>& base :
       {std::vector<double>{-10.0 + 0.3 * layout.reduction_length[0], 1.0, 5.0, 0.0},
        std::vector<double>{-10.0 + 0.5 * layout.smoothing_length[0],
                            -1.0 + 0.4 * layout.smoothing_length[1],
                            4.0 + 0.6 * layout.smoothing_length[2], 0.0},
        std::vector<double>{0.0 + 0.3 * layout.smoothing_length[0], -0.7,
                            2.0 + 0.5 * layout.smoothing_length[2], 0.0}}) {
    std::vector<double> q(4, 0.0), dq(4, 0.0);
    add_stress_flows(m, layout, 0, base, q, dq);
    for (std::size_t i = 0; i < 3; ++i) {
      // Centred difference, step 1e-6 of the smoothing length: truncation ~ s^2 |q'''|, far
      // below the tolerance (see test_stress_kernels.cpp).
      const double s = 1e-6 * layout.smoothing_length[i];
      std::vector<double> hp = base, hm = base, qp(4, 0.0), qm(4, 0.0), scratch(4, 0.0);
      hp[i] += s;
      hm[i] -= s;
      add_stress_flows(m, layout, 0, hp, qp, scratch);
      add_stress_flows(m, layout, 0, hm, qm, scratch);
      const double fd = (qp[i] - qm[i]) / (2.0 * s);
      INFO("cell " << i << " analytic " << dq[i] << " finite difference " << fd);
      CHECK(std::abs(dq[i] - fd) <= 1e-6 * (std::abs(dq[i]) + 100.0));
    }
  }
}
