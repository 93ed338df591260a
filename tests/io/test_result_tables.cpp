#include <catch2/catch.hpp>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <optional>
#include <sstream>

#include "io/results/result_tables.hpp"
#include "small_model.hpp"

using namespace aquiledger;
using aquiledger::testing::file_names;
using aquiledger::testing::scratch_folder;

namespace {

std::vector<std::string> lines_of(const std::filesystem::path& p) {
  std::ifstream in(p);
  std::vector<std::string> lines;
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  return lines;
}

/// Splits a CSV line on commas outside double quotes (RFC 4180), unquoting fields.
std::vector<std::string> fields_of(const std::string& line) {
  std::vector<std::string> out(1);
  bool quoted = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char ch = line[i];
    if (quoted && ch == '"' && i + 1 < line.size() && line[i + 1] == '"') {
      out.back() += '"';
      ++i;
    } else if (ch == '"') {
      quoted = !quoted;
    } else if (ch == ',' && !quoted) {
      out.emplace_back();
    } else {
      out.back() += ch;
    }
  }
  return out;
}

double number(const std::string& text) { return std::strtod(text.c_str(), nullptr); }

std::vector<std::string> lines_of_text(const std::string& text) {
  std::istringstream in(text);
  std::vector<std::string> lines;
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  return lines;
}

/// The budget tables' columns as the results contract fixes them (version 2,
/// docs/results.md), written out here rather than taken from the code under test.
const std::vector<std::string> step_columns = {
    "period", "step", "time", "dt", "component", "into_aquifer", "out_of_aquifer", "unit"};
const std::vector<std::string> period_columns = {
    "period", "period_name", "start", "end", "component", "into_aquifer", "out_of_aquifer", "unit"};

/// A budget whose values are not short decimals, so a lossy number format would show.
WaterBudget odd_budget(double scale) {
  WaterBudget b;
  for (std::size_t i = 0; i < n_budget_components; ++i) {
    b.components[i].in = scale * (i + 1) / 3.0;
    b.components[i].out = scale * std::sqrt(i + 0.5);
  }
  b.features = {{scale / 7.0, 0.0}, {0.0, scale * M_PI}};
  return b;
}

/// A layout as a confined model with compressibilities, wells and a river would have.
BudgetTableLayout split_layout() {
  return {{BudgetComponent::storage_skeleton, BudgetComponent::storage_water, BudgetComponent::well,
           BudgetComponent::river},
          "m3/d",
          "m3",
          std::nullopt};
}

}  // namespace

TEST_CASE("budget step table is long, one row per component and step with its unit", "[io][csv]") {
  const auto folder = scratch_folder("budget-steps");
  std::vector<BudgetStepRow> rows(1);
  rows[0].period = 1;
  rows[0].step = 3;
  rows[0].time = 10.0 / 3.0;
  rows[0].dt = 1.0 / 9.0;
  rows[0].rates = odd_budget(1.0e3);
  const BudgetTableLayout layout = split_layout();
  write_budget_steps_csv(folder / "budget_steps.csv", layout, rows);
  CHECK(file_names(folder) == std::vector<std::string>{"budget_steps.csv"});

  const auto lines = lines_of(folder / "budget_steps.csv");
  REQUIRE(lines.size() == 1 + 5);  // header, four components, total
  CHECK(fields_of(lines[0]) == step_columns);
  const std::vector<std::string> components = {"storage_skeleton", "storage_water", "well", "river",
                                               "total"};
  const WaterBudget& b = rows[0].rates;
  for (std::size_t k = 0; k < components.size(); ++k) {
    const auto f = fields_of(lines[1 + k]);
    REQUIRE(f.size() == 8);
    INFO(lines[1 + k]);
    // Shortest round-trip text reads back to the same double (Steele and White, 1990).
    CHECK(f[0] == "1");
    CHECK(f[1] == "3");
    CHECK(number(f[2]) == 10.0 / 3.0);
    CHECK(number(f[3]) == 1.0 / 9.0);
    CHECK(f[4] == components[k]);
    CHECK(f[7] == "m3/d");
    if (k < 4) {
      const InOut& c = b[layout.components[k]];
      CHECK(number(f[5]) == c.in);
      CHECK(number(f[6]) == c.out);
    } else {
      // total: the sum of every component of the budget (twelve positive terms agree to a
      // few ulps whatever the order of summation).
      double in = 0.0, out = 0.0;
      for (const InOut& c : b.components) in += c.in, out += c.out;
      CHECK(number(f[5]) == Approx(in).epsilon(1e-14));
      CHECK(number(f[6]) == Approx(out).epsilon(1e-14));
    }
  }
  std::filesystem::remove_all(folder);
}

TEST_CASE("balance tables report the hand-computed imbalance, iterations and cell states",
          "[io][csv]") {
  const auto folder = scratch_folder("balance");
  BudgetStepRow step;
  step.period = 2;
  step.step = 4;
  step.time = 400.0;
  step.dt = 10.0;
  // in = 101, out = 99: imbalance = 100 * 2 / 100 = 2 percent (hand arithmetic).
  step.rates[BudgetComponent::well] = {1.0, 99.0};
  step.rates[BudgetComponent::recharge] = {100.0, 0.0};
  step.newton_iterations = 7;
  step.cutbacks = 1;
  step.cells = {12, 30, 2};
  BudgetStepRow time_zero;  // a row with step 0 is not a step: no line for it
  write_balance_steps_csv(folder / "balance_steps.csv", {time_zero, step});
  const auto lines = lines_of(folder / "balance_steps.csv");
  REQUIRE(lines.size() == 2);
  CHECK(fields_of(lines[0]) ==
        std::vector<std::string>{"period", "step", "time", "dt", "into_aquifer", "out_of_aquifer",
                                 "imbalance_percent", "newton_iterations", "cutbacks",
                                 "confined_cells", "water_table_cells", "dry_cells"});
  const auto f = fields_of(lines[1]);
  REQUIRE(f.size() == 12);
  CHECK(number(f[4]) == 101.0);
  CHECK(number(f[5]) == 99.0);
  CHECK(number(f[6]) == Approx(2.0).epsilon(1e-15));
  CHECK(std::vector<std::string>(f.begin() + 7, f.end()) ==
        std::vector<std::string>{"7", "1", "12", "30", "2"});

  BudgetPeriodRow row;
  row.period = 2;
  row.name = "dry season, \"late\"";
  row.start = 365.0;
  row.end = 485.0;
  row.volumes = step.rates;
  write_balance_periods_csv(folder / "balance_periods.csv", {row});
  const auto p = lines_of(folder / "balance_periods.csv");
  REQUIRE(p.size() == 2);
  CHECK(fields_of(p[0]) == std::vector<std::string>{"period", "period_name", "start", "end",
                                                    "into_aquifer", "out_of_aquifer",
                                                    "imbalance_percent"});
  const auto g = fields_of(p[1]);
  REQUIRE(g.size() == 7);
  CHECK(g[1] == row.name);
  CHECK(number(g[2]) == 365.0);
  CHECK(number(g[6]) == Approx(2.0).epsilon(1e-15));
  // Both in and out zero: imbalance 0 (the contract's definition).
  row.volumes = WaterBudget{};
  CHECK(fields_of(lines_of_text(balance_periods_csv({row}))[1])[6] == "0");
  std::filesystem::remove_all(folder);
}

TEST_CASE("budget period table quotes names and writes volumes with the volume unit", "[io][csv]") {
  const auto folder = scratch_folder("budget-periods");
  BudgetPeriodRow row;
  row.period = 2;
  row.name = "dry season, \"late\"";
  row.start = 365.0;
  row.end = 485.0;
  row.volumes[BudgetComponent::well] = {1.0, 99.0};
  row.volumes[BudgetComponent::recharge] = {100.0, 0.0};
  const BudgetTableLayout layout{
      {BudgetComponent::storage_elastic, BudgetComponent::well, BudgetComponent::recharge},
      "ft3/s",
      "ft3",
      std::nullopt};
  write_budget_periods_csv(folder / "budget_periods.csv", layout, {row});
  const auto lines = lines_of(folder / "budget_periods.csv");
  REQUIRE(lines.size() == 1 + 4);
  CHECK(fields_of(lines[0]) == period_columns);
  const auto well = fields_of(lines[2]);
  CHECK(well == std::vector<std::string>{"2", row.name, "365", "485", "well", "1", "99", "ft3"});
  const auto total = fields_of(lines[4]);
  CHECK(total[4] == "total");
  CHECK(number(total[5]) == 101.0);
  CHECK(number(total[6]) == 99.0);
  std::filesystem::remove_all(folder);
}

TEST_CASE("a model's budget layout lists storage always and only the stresses it has",
          "[io][csv]") {
  Model m = aquiledger::testing::small_model();
  m.aquifer.condition = Condition::confined;
  m.aquifer.skeleton_share = std::vector<double>{};
  m.wells.clear(), m.fixed_heads.clear(), m.recharges.clear(), m.rivers.clear();
  m.drains.clear(), m.external_heads.clear(), m.evapotranspiration.clear();
  m.leakage.reset();
  m.length_unit = "ft";
  m.time_unit = "s";
  BudgetTableLayout l = budget_table_layout(m);
  CHECK(l.components == std::vector<BudgetComponent>{BudgetComponent::storage_elastic});
  CHECK(l.rate_unit == "ft3/s");
  CHECK(l.volume_unit == "ft3");

  m.aquifer.condition = Condition::switching;
  m.aquifer.skeleton_share.assign(static_cast<std::size_t>(m.grid.n_cells()), 0.5);
  m.wells.push_back(Well{});
  m.rivers.push_back(River{});
  l = budget_table_layout(m);
  CHECK(l.components == std::vector<BudgetComponent>{
                            BudgetComponent::storage_skeleton, BudgetComponent::storage_water,
                            BudgetComponent::storage_drainage, BudgetComponent::well,
                            BudgetComponent::river});
  // The names in the tables are the results contract's (docs/results.md).
  std::vector<std::string> names;
  for (BudgetComponent c : l.components) names.emplace_back(component_label(c));
  CHECK(names == std::vector<std::string>{"storage_skeleton", "storage_water", "storage_drainage",
                                          "well", "river"});
}

TEST_CASE("feature table has one row per feature per period", "[io][csv]") {
  const auto folder = scratch_folder("budget-features");
  const std::vector<FeatureRef> features = {{"well 3, north", FeatureKind::well, 0},
                                            {"terrace creek", FeatureKind::river, 0}};
  std::vector<BudgetPeriodRow> rows(2);
  rows[0].period = 1;
  rows[0].name = "spring";
  rows[0].volumes = odd_budget(1.0);
  rows[1].period = 2;
  rows[1].name = "summer";
  rows[1].volumes = odd_budget(2.0);
  write_budget_features_csv(folder / "budget_features.csv", features, rows, "m3");
  const auto lines = lines_of(folder / "budget_features.csv");
  REQUIRE(lines.size() == 5);
  CHECK(lines[0] == "period,period_name,feature,kind,into_aquifer,out_of_aquifer,unit");
  const auto a = fields_of(lines[1]);
  CHECK(a == std::vector<std::string>{"1", "spring", "well 3, north", "well", a[4], "0", "m3"});
  CHECK(number(a[4]) == 1.0 / 7.0);
  const auto d = fields_of(lines[4]);
  CHECK(d[1] == "summer");
  CHECK(d[2] == "terrace creek");
  CHECK(d[3] == "river");
  CHECK(number(d[5]) == 2.0 * M_PI);

  rows[1].volumes.features.pop_back();  // a budget that does not match the feature list
  CHECK_THROWS_AS(write_budget_features_csv(folder / "x.csv", features, rows, "m3"),
                  std::invalid_argument);
  std::filesystem::remove_all(folder);
}

TEST_CASE("observation table is long format with the observation's name", "[io][csv]") {
  const auto folder = scratch_folder("observations");
  std::vector<Observation> obs(2);
  obs[0].name = "bore A";
  obs[1].name = "bore B";
  const std::vector<ObservationRow> rows = {{0, 0, 0, 0.0, 38.0, 0.0},
                                            {1, 0, 0, 0.0, 37.5, 0.0},
                                            {0, 1, 1, 0.5, 38.0 - 1.0 / 3.0, 1.0 / 3.0}};
  write_observations_csv(folder / "observations.csv", obs, rows);
  const auto lines = lines_of(folder / "observations.csv");
  REQUIRE(lines.size() == 4);
  CHECK(lines[0] == "observation,period,step,time,head,drawdown");
  CHECK(lines[2] == "bore B,0,0,0,37.5,0");
  const auto f = fields_of(lines[3]);
  CHECK(f[0] == "bore A");
  CHECK(number(f[4]) == 38.0 - 1.0 / 3.0);
  CHECK(number(f[5]) == 1.0 / 3.0);
  std::filesystem::remove_all(folder);
}
