#include <catch2/catch.hpp>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <sstream>

#include "io/result_tables.hpp"
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

/// The component stems in the order the format contract lists them (model-format.md,
/// "Results"), written out here rather than taken from the code under test.
const std::vector<std::string> contract_components = {"storage_skeleton",
                                                      "storage_water",
                                                      "storage_drainage",
                                                      "storage_elastic",
                                                      "fixed_head",
                                                      "wells",
                                                      "recharge",
                                                      "river",
                                                      "drain",
                                                      "external_head",
                                                      "evapotranspiration",
                                                      "leakage"};

std::vector<std::string> expected_header(std::vector<std::string> lead) {
  for (const auto& c : contract_components) {
    lead.push_back(c + "_in");
    lead.push_back(c + "_out");
  }
  lead.insert(lead.end(), {"total_in", "total_out", "discrepancy_percent"});
  return lead;
}

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

}  // namespace

TEST_CASE("budget step table has the contract's columns and round-trips every number",
          "[io][csv]") {
  const auto folder = scratch_folder("budget-steps");
  std::vector<BudgetStepRow> rows(2);
  rows[0] = {0, 0, 0.0, 0.0, WaterBudget{}};
  rows[1] = {1, 3, 10.0 / 3.0, 1.0 / 9.0, odd_budget(1.0e3)};
  write_budget_steps_csv(folder / "budget_steps.csv", rows);
  CHECK(file_names(folder) == std::vector<std::string>{"budget_steps.csv"});

  const auto lines = lines_of(folder / "budget_steps.csv");
  REQUIRE(lines.size() == 3);
  CHECK(fields_of(lines[0]) == expected_header({"period", "step", "time", "dt"}));

  // Time-0 row: period 0, step 0, all zeros; discrepancy 0 when in and out are 0 (contract).
  const auto zero = fields_of(lines[1]);
  CHECK(zero[0] == "0");
  CHECK(zero[1] == "0");
  CHECK(number(zero.back()) == 0.0);

  // Shortest round-trip text reads back to the same double (Steele and White, 1990).
  const auto f = fields_of(lines[2]);
  REQUIRE(f.size() == 4 + 24 + 3);
  CHECK(f[0] == "1");
  CHECK(f[1] == "3");
  CHECK(number(f[2]) == 10.0 / 3.0);
  CHECK(number(f[3]) == 1.0 / 9.0);
  double in = 0.0, out = 0.0;
  for (std::size_t i = 0; i < n_budget_components; ++i) {
    CHECK(number(f[4 + 2 * i]) == rows[1].rates.components[i].in);
    CHECK(number(f[5 + 2 * i]) == rows[1].rates.components[i].out);
    in += rows[1].rates.components[i].in;
    out += rows[1].rates.components[i].out;
  }
  // Totals: sums of twelve positive terms agree to a few ulps whatever the order.
  CHECK(number(f[28]) == Approx(in).epsilon(1e-14));
  CHECK(number(f[29]) == Approx(out).epsilon(1e-14));
  // discrepancy_percent = 100 (in - out) / ((in + out) / 2), the contract's definition.
  CHECK(number(f[30]) == Approx(100.0 * (in - out) / (0.5 * (in + out))).epsilon(1e-12));
  std::filesystem::remove_all(folder);
}

TEST_CASE("budget period table quotes names and reports the hand-computed discrepancy",
          "[io][csv]") {
  const auto folder = scratch_folder("budget-periods");
  BudgetPeriodRow row;
  row.period = 2;
  row.name = "dry season, \"late\"";
  row.start = 365.0;
  row.end = 485.0;
  // in = 101, out = 99: discrepancy = 100 * 2 / 100 = 2 percent (hand arithmetic).
  row.volumes[BudgetComponent::wells] = {1.0, 99.0};
  row.volumes[BudgetComponent::recharge] = {100.0, 0.0};
  write_budget_periods_csv(folder / "budget_periods.csv", {row});
  const auto lines = lines_of(folder / "budget_periods.csv");
  REQUIRE(lines.size() == 2);
  CHECK(fields_of(lines[0]) == expected_header({"period", "name", "start", "end"}));
  const auto f = fields_of(lines[1]);
  REQUIRE(f.size() == 31);
  CHECK(f[1] == row.name);
  CHECK(number(f[2]) == 365.0);
  CHECK(number(f[28]) == 101.0);
  CHECK(number(f[29]) == 99.0);
  CHECK(number(f[30]) == Approx(2.0).epsilon(1e-15));
  std::filesystem::remove_all(folder);
}

TEST_CASE("feature table has one row per feature per period", "[io][csv]") {
  const auto folder = scratch_folder("budget-features");
  const std::vector<FeatureRef> features = {{"well 3, north", FeatureKind::well, 0},
                                            {"terrace creek", FeatureKind::river, 0}};
  std::vector<BudgetPeriodRow> rows(2);
  rows[0].period = 1;
  rows[0].volumes = odd_budget(1.0);
  rows[1].period = 2;
  rows[1].volumes = odd_budget(2.0);
  write_budget_features_csv(folder / "budget_features.csv", features, rows);
  const auto lines = lines_of(folder / "budget_features.csv");
  REQUIRE(lines.size() == 5);
  CHECK(lines[0] == "feature,kind,period,in,out");
  const auto a = fields_of(lines[1]);
  CHECK(a == std::vector<std::string>{"well 3, north", "well", "1", a[3], "0"});
  CHECK(number(a[3]) == 1.0 / 7.0);
  const auto d = fields_of(lines[4]);
  CHECK(d[0] == "terrace creek");
  CHECK(d[1] == "river");
  CHECK(d[2] == "2");
  CHECK(number(d[4]) == 2.0 * M_PI);

  rows[1].volumes.features.pop_back();  // a budget that does not match the feature list
  CHECK_THROWS_AS(write_budget_features_csv(folder / "x.csv", features, rows),
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
