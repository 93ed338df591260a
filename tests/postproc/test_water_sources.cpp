// Sources of water to wells (Theis, 1940; Barlow and Leake, 2012, USGS Circular 1376): the
// mass-balance identity of the difference of two runs, stream depletion against Glover and
// Balmer (1954), and the storage split by mechanism against the stored-water definition.
#include <catch2/catch.hpp>
#include <cmath>
#include <numeric>

#include "postproc/water_sources.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;
using namespace aquiledger::test;

namespace {

std::size_t line_of(const WaterSources& s, const std::string& source,
                    const std::string& feature = "") {
  for (std::size_t k = 0; k < s.lines.size(); ++k)
    if (s.lines[k].source == source && s.lines[k].feature == feature) return k;
  FAIL("no line " << source << " " << feature);
  return 0;
}

}  // namespace

TEST_CASE("sources of water: rows and shares from two budgets", "[water_sources]") {
  // Two hand-made period budgets. Mass balance (each run: sum of in - out = its imbalance)
  // makes the rows sum to the chosen wells' withdrawal exactly.
  const std::vector<SourceFeature> features{{"pumping well", FeatureKind::well, true},
                                            {"old well", FeatureKind::well, false},
                                            {"creek", FeatureKind::river, false},
                                            {"marsh", FeatureKind::evapotranspiration, false},
                                            {"east edge", FeatureKind::external_head, false}};
  PeriodPair p{"dry season", 0.0, 10.0, {}, {}};
  WaterBudget& w = p.with_wells;
  WaterBudget& o = p.without_wells;
  w.features = {{0.0, 500.0}, {0.0, 80.0}, {120.0, 30.0}, {0.0, 20.0}, {60.0, 0.0}};
  o.features = {{0.0, 0.0}, {0.0, 100.0}, {40.0, 90.0}, {0.0, 50.0}, {0.0, 0.0}};
  w[BudgetComponent::well] = {0.0, 580.0};
  o[BudgetComponent::well] = {0.0, 100.0};
  w[BudgetComponent::river] = {120.0, 30.0};
  o[BudgetComponent::river] = {40.0, 90.0};
  w[BudgetComponent::evapotranspiration] = {0.0, 20.0};
  o[BudgetComponent::evapotranspiration] = {0.0, 50.0};
  w[BudgetComponent::external_head] = {60.0, 0.0};
  // Storage closes each run, leaving imbalances of +0.5 (with) and -0.25 (without).
  w[BudgetComponent::storage_elastic] = {320.0 + 80.0 + 0.5, 0.0};
  w[BudgetComponent::storage_drainage] = {50.0, 0.0};
  o[BudgetComponent::storage_elastic] = {200.0 - 0.25, 0.0};
  const std::vector<BudgetComponent> storage{BudgetComponent::storage_elastic,
                                             BudgetComponent::storage_drainage};
  const WaterSources s = water_sources(features, storage, std::span(&p, 1));
  REQUIRE(s.periods.size() == 1);
  const SourcePeriod& r = s.periods[0];
  CHECK(r.withdrawn == 500.0);
  CHECK(r.volume[line_of(s, "storage_elastic")] == Approx(200.75));
  CHECK(r.volume[line_of(s, "storage_drainage")] == 50.0);
  CHECK(r.volume[line_of(s, "river", "creek")] == 140.0);              // 80 more in, 60 less out
  CHECK(r.volume[line_of(s, "evapotranspiration", "marsh")] == 30.0);  // reduced loss
  CHECK(r.volume[line_of(s, "well", "old well")] == 20.0);             // delivered less (shortfall)
  CHECK(r.volume[line_of(s, "external_head", "east edge")] == 60.0);
  CHECK(r.volume[line_of(s, "imbalance")] == -0.75);
  // The chosen well is the withdrawal, never a line.
  for (const SourceLine& l : s.lines) CHECK(l.feature != "pumping well");
  const double total = std::accumulate(r.volume.begin(), r.volume.end(), 0.0);
  CHECK(total == Approx(r.withdrawn).epsilon(1e-15));
  CHECK(share_of(r.volume[line_of(s, "river", "creek")], r.withdrawn) == Approx(0.28));
  CHECK(std::isnan(share_of(1.0, 0.0)));
  CHECK(source_group("storage_drainage") == "storage");
  CHECK(source_group("drain") == "rivers and drains");
  CHECK(source_group("leakage") == "boundaries");
  CHECK(source_group("evapotranspiration") == "other stresses");
}

TEST_CASE("sources of water close to rounding in a switching model with every stress",
          "[water_sources]") {
  // A thin switching aquifer with a river, a drain, evapotranspiration, recharge, an external
  // boundary and a second well that cannot deliver its rate; the chosen well pumps in the
  // second period and stops in the third.
  AquiferSpec a;
  a.condition = Condition::switching;
  a.top = 8.0;
  a.bottom = 0.0;
  a.k = 2.0;
  a.specific_storage = 1e-4;
  a.specific_yield = 0.15;
  a.initial_head = 8.5;
  Model m = make_model(std::vector<double>(9, 50.0), std::vector<double>(9, 50.0), a);
  add_period(m, 10.0, 1, 1.0, true);
  add_period(m, 30.0, 15, 1.2);
  add_period(m, 30.0, 15, 1.2);
  m.initial.steady = true;
  add_well(m, 4, 4, {0.0, 250.0, 0.0});
  add_well(m, 4, 6, {60.0});
  m.wells[1].name = "neighbour";
  add_recharge(m, {0.002});
  River river{"creek",           column_cells(m, 0), std::vector<double>(9, 50.0),
              PeriodValues(8.2), PeriodValues(6.0),  PeriodValues(40.0 * 50.0)};
  m.rivers.push_back(river);
  m.drains.push_back(Drain{"ditch", column_cells(m, 8), PeriodValues(7.5), PeriodValues(30.0)});
  m.evapotranspiration.push_back(Evapotranspiration{"reeds", column_cells(m, 1), PeriodValues(9.0),
                                                    PeriodValues(0.004), PeriodValues(2.5)});
  m.external_heads.push_back(ExternalHead{
      "south", {m.grid.cell(8, 3), m.grid.cell(8, 4)}, PeriodValues(8.3), PeriodValues(5.0)});
  m.solver.threads = 1;  // small grids: threads would only wait for each other
  const std::size_t chosen = 0;
  const WaterSourcesRun run = run_water_sources(m, std::span(&chosen, 1));
  REQUIRE(run.converged);
  const WaterSources& s = run.sources;
  REQUIRE(s.periods.size() == 3);
  // Period 1 is the shared steady start: nothing pumped, nothing changes beyond the solver's
  // flow tolerance (1e-6 of the throughflow, here at least the recharge 0.002 x 450^2 x 10).
  CHECK(s.periods[0].withdrawn == 0.0);
  const double throughflow = 0.002 * 450.0 * 450.0 * 10.0;
  for (double v : s.periods[0].volume) CHECK(std::abs(v) <= m.solver.flow_tolerance * throughflow);
  // Period 2: the planned 250 x 30, delivered in full (the cell stays wet).
  CHECK(s.periods[1].withdrawn == Approx(run.planned[1]).epsilon(1e-12));
  for (const SourcePeriod& r : s.periods) {
    // Mass balance: the rows sum to the withdrawal to rounding; the imbalance row is at the
    // level the contract promises for converged steps (1e-6 percent of throughflow).
    const double total = std::accumulate(r.volume.begin(), r.volume.end(), 0.0);
    double scale = std::abs(r.withdrawn);
    for (double v : r.volume) scale += std::abs(v);
    CHECK(std::abs(total - r.withdrawn) <= 1e-13 * scale);
    CHECK(std::abs(r.volume[line_of(s, "imbalance")]) <= 1e-8 * scale);
  }
  const SourcePeriod& pumping = s.periods[1];
  // Lower heads take water from storage by both mechanisms, induce river seepage, cut the
  // drain's outflow and the reeds' evapotranspiration: each a positive row (Theis, 1940:
  // capture is increased inflow or decreased outflow; Barlow and Leake, 2012). Lower heads
  // can only cut the neighbour's delivery, never raise it.
  for (auto [source, feature] : {std::pair{"storage_elastic", ""},
                                 {"storage_drainage", ""},
                                 {"river", "creek"},
                                 {"drain", "ditch"},
                                 {"evapotranspiration", "reeds"}})
    CHECK(pumping.volume[line_of(s, source, feature)] > 0.0);
  CHECK(pumping.volume[line_of(s, "well", "neighbour")] >= 0.0);
  // After pumping stops the aquifer refills: storage takes water back in the third period,
  // while capture goes on (Barlow and Leake, 2012: depletion continues after pumping stops).
  const SourcePeriod& recovery = s.periods[2];
  CHECK(recovery.withdrawn == 0.0);
  CHECK(recovery.volume[line_of(s, "storage_elastic")] +
            recovery.volume[line_of(s, "storage_drainage")] <
        0.0);
  CHECK(recovery.volume[line_of(s, "river", "creek")] > 0.0);
  const double cumulative =
      std::accumulate(recovery.cumulative.begin(), recovery.cumulative.end(), 0.0);
  CHECK(std::abs(cumulative - recovery.cumulative_withdrawn) <=
        1e-12 * recovery.cumulative_withdrawn);
}

TEST_CASE("storage split between elastic release and drainage in a switching aquifer",
          "[water_sources]") {
  // No boundary but the no-flow edges: all the water comes from storage. The stored volume
  // per unit area is Sy (h - bottom) below the top and Sy (top - bottom) + S (h - top) above
  // it (Theis, 1940; model format contract, "switching"), so with the heads only falling,
  // elastic = sum area S (h0 - max(h1, top)) and drainage = sum area Sy max(top - h1, 0).
  AquiferSpec a;
  a.condition = Condition::switching;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 5.0;
  a.specific_storage = 1e-4;  // S = 1e-3
  a.specific_yield = 0.1;
  a.initial_head = 10.6;
  Model m = make_model(geometric_spacing(10.0, 1.2, 600.0), geometric_spacing(10.0, 1.2, 600.0), a);
  add_period(m, 5.0, 20, 1.15);
  const int c = m.grid.n_rows() / 2;
  add_well(m, c, c, {400.0});
  m.solver.threads = 1;  // small grids: threads would only wait for each other
  const std::size_t chosen = 0;
  const WaterSourcesRun run = run_water_sources(m, std::span(&chosen, 1));
  REQUIRE(run.converged);
  double elastic = 0.0, drainage = 0.0;
  int converted = 0;
  for (int i = 0; i < m.grid.n_cells(); ++i) {
    const auto k = static_cast<std::size_t>(i);
    const double area = m.grid.area(CellIndex{i});
    const double h0 = run.initial[k], h1 = run.head_with[k];
    REQUIRE(h1 <= h0 + 1e-12);
    elastic += area * a.specific_storage * (a.top - a.bottom) * (h0 - std::max(h1, a.top));
    drainage += area * a.specific_yield * std::max(a.top - h1, 0.0);
    converted += h1 < a.top;
  }
  const WaterSources& s = run.sources;
  const SourcePeriod& r = s.periods[0];
  INFO("converted cells " << converted << " elastic " << elastic << " drainage " << drainage);
  REQUIRE(converted > 0);
  CHECK(r.volume[line_of(s, "storage_elastic")] == Approx(elastic).epsilon(1e-9));
  CHECK(r.volume[line_of(s, "storage_drainage")] == Approx(drainage).epsilon(1e-9));
  CHECK(elastic + drainage == Approx(r.withdrawn).epsilon(1e-9));
  // Both mechanisms matter here: the cone has converted the cells near the well.
  CHECK(drainage / r.withdrawn > 0.05);
  CHECK(elastic / r.withdrawn > 0.05);
}

TEST_CASE("elastic storage split into skeleton and water in the ratio alpha : n beta",
          "[water_sources]") {
  // Jacob (1940): Ss = rho g (alpha + n beta); the skeleton gives alpha / (alpha + n beta)
  // of every elastic release.
  AquiferSpec a;
  a.initial_head = 30.0;
  Model m = make_model(geometric_spacing(10.0, 1.3, 800.0), geometric_spacing(10.0, 1.3, 800.0), a);
  // 1/Pa, -, 1/Pa (beta: the model format contract's default for water)
  const double alpha = 1e-9, n = 0.3, beta = 4.6e-10;
  m.aquifer.specific_storage.assign(m.aquifer.specific_storage.size(),
                                    998.2 * 9.80665 * (alpha + n * beta));
  m.aquifer.skeleton_share.assign(m.aquifer.specific_storage.size(), alpha / (alpha + n * beta));
  add_period(m, 2.0, 10, 1.2);
  const int c = m.grid.n_rows() / 2;
  add_well(m, c, c, {100.0});
  m.solver.threads = 1;  // small grids: threads would only wait for each other
  const std::size_t chosen = 0;
  const WaterSourcesRun run = run_water_sources(m, std::span(&chosen, 1));
  REQUIRE(run.converged);
  const WaterSources& s = run.sources;
  const SourcePeriod& r = s.periods[0];
  const double skeleton = r.volume[line_of(s, "storage_skeleton")];
  const double water = r.volume[line_of(s, "storage_water")];
  CHECK(skeleton / water == Approx(alpha / (n * beta)).epsilon(1e-12));
  CHECK(skeleton + water == Approx(r.withdrawn).epsilon(1e-9));
}
