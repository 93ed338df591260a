// Cell fields for viewers: face flows against Darcy's law, blanking of inactive cells,
// states, storage rates and compaction.
#include <catch2/catch.hpp>
#include <cmath>

#include "postproc/cell_fields.hpp"
#include "support/budget_observer.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

TEST_CASE("face flows follow Darcy's law; inactive cells are blanked", "[cell_fields]") {
  // Steady confined flow from north to south through a 1-column strip: Darcy (1856),
  // Q = K b w dh / L, uniform along the strip, toward the south (negative flow_north).
  test::AquiferSpec a;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 3.0;
  a.initial_head = 20.0;
  Model m = test::make_model({8.0, 8.0}, std::vector<double>(6, 5.0), a);
  std::vector<std::uint8_t> active(12, 1);
  active[1 * 2 + 1] = 0;  // one inactive cell in the east column
  m.grid = RectilinearGrid({8.0, 8.0}, std::vector<double>(6, 5.0), 0.0, 0.0, active);
  test::add_fixed_head(m, {m.grid.cell(0, 0)}, 22.0);
  test::add_fixed_head(m, {m.grid.cell(5, 0)}, 17.0);
  test::add_period(m, 1.0, 1, 1.0, true);
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  const SystemLayout layout = make_system_layout(m);
  CellFields f = initial_cell_fields(m, layout, m.initial.head.values());
  update_cell_fields(m, layout, true, 1.0, m.initial.head.values(), m.initial.head.values(),
                     obs.last_head, f);
  const std::size_t inactive = 1 * 2 + 1;
  CHECK(std::isnan(f.head[inactive]));
  CHECK(std::isnan(f.flow_east[inactive]));
  CHECK(std::isnan(f.compaction[inactive]));
  // Faces toward the inactive cell and across the grid edge carry nothing.
  CHECK(f.flow_east[static_cast<std::size_t>(m.grid.cell(1, 0).value)] == 0.0);
  CHECK(f.flow_north[static_cast<std::size_t>(m.grid.cell(2, 1).value)] == 0.0);
  CHECK(f.flow_east[static_cast<std::size_t>(m.grid.cell(3, 1).value)] == 0.0);
  CHECK(f.flow_north[static_cast<std::size_t>(m.grid.cell(0, 0).value)] == 0.0);
  // Total southward flow through row boundaries equals the fixed-head throughflow.
  const double inflow = obs.budgets.back()[BudgetComponent::fixed_head].in;
  for (int r = 1; r < 6; ++r) {
    double south = 0.0;
    for (int c = 0; c < 2; ++c)
      if (m.grid.is_active(m.grid.cell(r, c)))
        south -= f.flow_north[static_cast<std::size_t>(m.grid.cell(r, c).value)];
    CHECK(south == Approx(inflow).epsilon(1e-9));
  }
  CHECK(f.state[0] == 2.0);  // confined model: 2 everywhere
  CHECK(f.drawdown[static_cast<std::size_t>(m.grid.cell(0, 0).value)] == Approx(20.0 - 22.0));
}

TEST_CASE("storage rates by mechanism, states and compaction over a draining switching cell",
          "[cell_fields]") {
  // A closed cell drained uniformly: rates are the exact W(h) differences over dt;
  // compaction is the elastic release per unit area, S (h0 - top) once below the top
  // (the whole elastic part, an upper bound, since Ss is given directly).
  test::AquiferSpec a;
  a.condition = Condition::switching;
  a.top = 10.0;
  a.bottom = 0.0;
  a.specific_storage = 1e-4;
  a.specific_yield = 0.1;
  a.initial_head = 10.5;
  Model m = test::make_model({10.0}, {10.0}, a);
  test::add_recharge(m, {-0.01});
  test::add_period(m, 10.05, 3);
  test::BudgetObserver obs(m);
  const SystemLayout layout = make_system_layout(m);
  REQUIRE(run_simulation(m, obs).converged);
  CellFields f = initial_cell_fields(m, layout, m.initial.head.values());
  CHECK(f.state[0] == 2.0);
  std::vector<double> old = m.initial.head.values();
  for (std::size_t k = 0; k < obs.heads.size(); ++k) {
    update_cell_fields(m, layout, false, obs.steps[k].dt, m.initial.head.values(), old,
                       obs.heads[k], f);
    // Storage supplies exactly the withdrawal 0.01 * 100 m3/d in every step.
    CHECK(f.storage_rate[0] == Approx(1.0).epsilon(1e-6));
    CHECK(f.storage_elastic_rate[0] + f.storage_drainage_rate[0] == Approx(f.storage_rate[0]));
    old = obs.heads[k];
  }
  CHECK(f.state[0] == 1.0);  // water table at the end (h = 10 - (10.05 - 0.05) 0.01 / 0.1 = 9)
  CHECK(f.head[0] == Approx(9.0).margin(1e-6));
  CHECK(f.compaction[0] == Approx(1e-3 * 0.5).epsilon(1e-6));
  CHECK(f.saturated_thickness[0] == Approx(9.0).margin(1e-6));
}
