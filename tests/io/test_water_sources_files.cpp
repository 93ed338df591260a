// The sources-of-water files: the v2 budget tables of two results folders read back and
// paired, and water_sources.csv / .json written in the documented layout.
#include <fmt/format.h>

#include <catch2/catch.hpp>
#include <cmath>
#include <fstream>
#include <numeric>

#include "io/files/csv_table.hpp"
#include "io/files/read_error.hpp"
#include "io/results/water_sources_files.hpp"
#include "small_model.hpp"

using namespace aquiledger;
using aquiledger::testing::scratch_folder;

namespace {

void write(const std::filesystem::path& p, const std::string& text) { std::ofstream(p) << text; }

/// A results folder in the version 2 long layout (results contract, "Results"): one period
/// per name, the chosen well pumping `q` (L3/T) over 10 T, balanced by storage and the river.
void write_folder(const std::filesystem::path& folder, double q, double river_in) {
  std::filesystem::create_directories(folder);
  const double storage = 10.0 * q - river_in + 40.0;  // the neighbour's 4 x 10 too
  const double released = std::max(storage, 0.0), taken = std::max(-storage, 0.0);
  const double wells = 10.0 * q + 40.0;
  // Drainage is listed but never used: it gets no line.
  write(folder / "budget_periods.csv",
        fmt::format("period,period_name,start,end,component,into_aquifer,out_of_aquifer,unit\n"
                    "1,\"spring, wet\",0,10,storage_elastic,{},{},m3\n"
                    "1,\"spring, wet\",0,10,storage_drainage,0,0,m3\n"
                    "1,\"spring, wet\",0,10,well,0,{},m3\n"
                    "1,\"spring, wet\",0,10,river,{},0,m3\n"
                    "1,\"spring, wet\",0,10,total,{},{},m3\n",
                    released, taken, wells, river_in, released + river_in, wells + taken));
  write(folder / "budget_features.csv",
        fmt::format("feature,kind,period,into_aquifer,out_of_aquifer\n"
                    "town well,well,1,0,{}\n"
                    "farm well,well,1,0,40\n"
                    "mill race,river,1,{},0\n",
                    10.0 * q, river_in));
}

}  // namespace

TEST_CASE("two results folders in the version 2 layout give the sources of water",
          "[water_sources]") {
  const auto root = scratch_folder("water_sources_folders");
  write_folder(root / "with", 50.0, 300.0);
  write_folder(root / "without", 0.0, 100.0);
  const FolderBudgets with = read_folder_budgets(root / "with", true);
  const FolderBudgets without = read_folder_budgets(root / "without", true);
  REQUIRE(with.names == std::vector<std::string>{"spring, wet"});
  CHECK(with.volume_unit == "m3");
  CHECK(with.storage == std::vector<BudgetComponent>{BudgetComponent::storage_elastic,
                                                     BudgetComponent::storage_drainage});
  CHECK(with.volumes[0][BudgetComponent::well].out == 540.0);
  std::vector<SourceFeature> features;
  std::vector<BudgetComponent> storage;
  const auto pairs = pair_folders(with, without, {"town well"}, features, storage);
  const WaterSources s = water_sources(features, storage, pairs);
  REQUIRE(s.lines.size() == 4);  // storage, farm well, mill race, imbalance
  const SourcePeriod& r = s.periods[0];
  CHECK(r.withdrawn == 500.0);
  CHECK(r.volume[0] == 300.0);  // net release 240 with the well, -60 without
  CHECK(s.lines[2].feature == "mill race");
  CHECK(r.volume[2] == 200.0);
  CHECK(std::accumulate(r.volume.begin(), r.volume.end(), 0.0) == 500.0);

  WaterSourcesContext context;
  context.chosen_wells = {"town well"};
  write_water_sources(root / "out", s, context);
  const CsvTable t = read_csv_file(root / "out" / "water_sources.csv");
  CHECK(t.header == std::vector<std::string>{
                        "period", "period_name", "start", "end", "source", "feature", "volume",
                        "rate", "share", "cumulative_volume", "cumulative_share", "pumped_volume",
                        "cumulative_pumped_volume", "volume_unit", "rate_unit"});
  REQUIRE(t.rows.size() == 4);
  CHECK(t.texts("period_name")[0] == "spring, wet");
  CHECK(t.numbers("share")[2] == 0.4);
  CHECK(t.numbers("rate")[2] == 20.0);
  CHECK(t.texts("rate_unit")[0] == "m3/d");
  const std::string json = read_text_file(root / "out" / "water_sources.json");
  CHECK(json.find("\"chosen_wells\": [\"town well\"]") != std::string::npos);
  CHECK(json.find("\"largest_cumulative_share_sum_error\": 0") != std::string::npos);
}

TEST_CASE("unreadable budget tables are named with file, line and column", "[water_sources]") {
  const auto root = scratch_folder("water_sources_bad");
  write_folder(root / "a", 1.0, 0.0);
  write(root / "a" / "budget_periods.csv",
        "period,period_name,start,end,component,into_aquifer,out_of_aquifer,unit\n"
        "1,p,0,10,river,abc,0,m3\n");
  try {
    read_folder_budgets(root / "a", false);
    FAIL("no error");
  } catch (const ReadError& e) {
    CHECK(std::string(e.what()).find("budget_periods.csv, line 2, column 'into_aquifer'") !=
          std::string::npos);
  }
  // Version 1 (wide) tables are refused with a pointer to the layout.
  write(root / "a" / "budget_periods.csv", "period,name,start,end,storage_elastic_in\n1,p,0,1,2\n");
  CHECK_THROWS_WITH(read_folder_budgets(root / "a", false), Catch::Contains("version 2"));
}
