// Budget accounting: labels and arithmetic of the contract, storage split by mechanism on the
// compressibility route, fixed heads and features.
#include <catch2/catch.hpp>
#include <cmath>
#include <iterator>

#include "postproc/water_budget.hpp"
#include "support/budget_observer.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

TEST_CASE("component labels and arithmetic follow the model format", "[budget]") {
  // Component names listed in the model format contract ("Results", version 2), and the
  // interbeds' two (docs/results.md) after the storage ones.
  const char* stems[] = {"storage_skeleton",
                         "storage_water",
                         "storage_drainage",
                         "storage_elastic",
                         "interbed_recoverable",
                         "interbed_permanent",
                         "delay_bed_recoverable",
                         "delay_bed_permanent",
                         "fixed_head",
                         "well",
                         "recharge",
                         "river",
                         "drain",
                         "external_head",
                         "evapotranspiration",
                         "leakage"};
  static_assert(std::size(stems) == n_budget_components);
  for (std::size_t k = 0; k < n_budget_components; ++k)
    CHECK(component_label(static_cast<BudgetComponent>(k)) == stems[k]);
  WaterBudget b;
  CHECK(b.imbalance_percent() == 0.0);  // contract: 0 when in and out are both 0
  b[BudgetComponent::well] = {0.0, 99.0};
  b[BudgetComponent::storage_elastic] = {101.0, 0.0};
  // 100 (in - out) / ((in + out) / 2) (contract).
  CHECK(b.imbalance_percent() == Approx(100.0 * 2.0 / 100.0));
  WaterBudget sum;
  sum.add_scaled(b, 2.0);
  sum.add_scaled(b, 0.5);
  CHECK(sum.total_in() == Approx(2.5 * 101.0));
  CHECK(sum.total_out() == Approx(2.5 * 99.0));
}

TEST_CASE("compressibility route splits released elastic water alpha : n beta", "[budget]") {
  // Jacob (1940): Ss = rho g (alpha + n beta); the skeleton releases the share
  // alpha / (alpha + n beta), the water the rest. Water compressibility 4.6e-10 1/Pa,
  // rho 998.2 kg/m3, g 9.80665 m/s2 (the model format's defaults).
  Compressibility comp;
  comp.skeleton = 5e-9;
  comp.porosity = 0.25;
  const double ss = comp.density * comp.gravity * (comp.skeleton + comp.porosity * comp.water);
  test::AquiferSpec a;
  a.top = 20.0;
  a.bottom = 0.0;
  a.specific_storage = ss;
  a.initial_head = 40.0;
  Model m = test::make_model({50.0, 50.0}, {50.0, 50.0}, a);
  m.aquifer.compressibility = comp;
  m.aquifer.skeleton_share.assign(4, comp.skeleton / (comp.skeleton + comp.porosity * comp.water));
  test::add_recharge(m, {-1e-3});
  test::add_period(m, 10.0, 4, 1.5);
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  const WaterBudget& v = obs.cumulative;
  // Uniform withdrawal from a closed confined aquifer: all of it comes from elastic storage.
  const double withdrawn = 1e-3 * 10000.0 * 10.0;
  CHECK(v[BudgetComponent::recharge].out == Approx(withdrawn).epsilon(1e-12));
  CHECK(v[BudgetComponent::storage_skeleton].in + v[BudgetComponent::storage_water].in ==
        Approx(withdrawn).epsilon(1e-6));
  CHECK(v[BudgetComponent::storage_skeleton].in / v[BudgetComponent::storage_water].in ==
        Approx(comp.skeleton / (comp.porosity * comp.water)).epsilon(1e-9));
  CHECK(v[BudgetComponent::storage_elastic].in == 0.0);  // contract: zero on this route
  CHECK(v[BudgetComponent::storage_drainage].in == 0.0);
}

TEST_CASE("fixed-head budget is the net flow of each fixed cell; features per entry", "[budget]") {
  // Steady one-dimensional confined flow between two fixed heads: Darcy (1856),
  // Q = T w (h1 - h2) / L, enters at one fixed cell and leaves at the other.
  test::AquiferSpec a;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 2.0;
  a.initial_head = 15.0;
  Model m = test::make_model(std::vector<double>(11, 10.0), {25.0}, a);
  test::add_fixed_head(m, {m.grid.cell(0, 0)}, 16.0);
  test::add_fixed_head(m, {m.grid.cell(0, 10)}, 12.0);
  test::add_well(m, 0, 5, {0.0});
  test::add_period(m, 1.0, 1, 1.0, true);
  test::BudgetObserver obs(m);
  REQUIRE(run_simulation(m, obs).converged);
  const double q = 2.0 * 10.0 * 25.0 * 4.0 / 100.0;
  const WaterBudget& b = obs.budgets.back();
  CHECK(b[BudgetComponent::fixed_head].in == Approx(q).epsilon(1e-9));
  CHECK(b[BudgetComponent::fixed_head].out == Approx(q).epsilon(1e-9));
  const auto features = list_features(m);
  REQUIRE(b.features.size() == features.size());
  CHECK(features[1].kind == FeatureKind::fixed_head);
  CHECK(b.features[1].in == Approx(q).epsilon(1e-9));
  CHECK(b.features[1].out == 0.0);
  CHECK(b.features[2].out == Approx(q).epsilon(1e-9));
}
