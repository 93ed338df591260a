// The fitted model written back (docs/estimation.md, "The fitted model"): read again, it is
// the model the estimation ran with the fitted values (model_with_parameters), cell by cell
// and feature by feature, to rounding; zones stay zones, relative paths still find their
// files, and a value form that cannot be scaled is refused with its key.
#include <catch2/catch.hpp>
#include <fstream>

#include "estimation_test_model.hpp"
#include "io/model_file/estimation_reader.hpp"
#include "io/model_file/fitted_model_writer.hpp"
#include "io/model_file/model_reader.hpp"
#include "small_model.hpp"

using namespace aquiledger;

namespace {

/// 2 x 3 cells; K by zones from a file in a subfolder, Ss from an array file (varies by
/// cell), Sy one number; recharge per period, a river by bed_conductance, a drain by zones;
/// a bore with a measured file.
const std::string fitted_writer_model =
    "[model]\ntitle = \"Fitted writer test\"\n" +
    aquiledger::testing::zoned_aquifer_model_head("data/kzones.txt") +
    R"(specific_storage = { file = "data/ss.txt" }
[initial]
head = 9.0
[[period]]
length = 10.0
steps = 2
[[period]]
length = 10.0
steps = 2
[[recharge]]
name = "rain"
rate = [0.001, 0.0005]
[[river]]
name = "Tallow creek"
cells = [[2, 1], [2, 2]]
stage = 8.0
bed_bottom = 7.0
bed_conductance = 50
[[drain]]
name = "ditch"
cells = [[1, 3]]
elevation = 8.5
conductance = { zones = "data/kzones.txt", values = { 1 = 3.0, 2 = 5.0 } }
[[observation]]
name = "B1"
x = 5.0
y = 15.0
measured = "b1.csv"
)";

const char* fitted_writer_setup = R"([estimate]
model = "model.toml"
[[parameter]]
name = "k west"
property = "k"
zone = 1
form = "value"
start = 2.0
lower = 0.1
upper = 10.0
[[parameter]]
name = "ss"
property = "specific_storage"
lower = 0.1
upper = 10.0
[[parameter]]
name = "sy"
property = "specific_yield"
lower = 0.1
upper = 2.0
[[parameter]]
name = "rain"
property = "recharge"
lower = 0.1
upper = 10.0
[[parameter]]
name = "creek"
property = "river_conductance"
lower = 0.01
upper = 100.0
[[parameter]]
name = "ditch"
property = "drain_conductance"
lower = 0.01
upper = 100.0
[[target]]
name = "B1 heads"
kind = "head"
bore = "B1"
)";

struct FittedFolder {
  std::filesystem::path dir = aquiledger::testing::scratch_folder("fitted-model");
  explicit FittedFolder(const std::string& model = fitted_writer_model) {
    std::filesystem::create_directories(dir / "data");
    std::ofstream(dir / "model.toml") << model;
    std::ofstream(dir / "data" / "kzones.txt") << "1 2 2\n1 2 2\n";
    std::ofstream(dir / "data" / "ss.txt") << "1e-5 2e-5 3e-5\n4e-5 5e-5 6e-5\n";
    std::ofstream(dir / "b1.csv")
        << "time,head\n2.5,8.9\n5,8.8\n7.5,8.75\n10,8.7\n12.5,8.7\n15,8.6\n"
           "17.5,8.6\n20,8.6\n";
    std::ofstream(dir / "setup.toml") << fitted_writer_setup;
  }
};

void check_same_tables(const PeriodValues& a, const PeriodValues& b) {
  REQUIRE(a.tables().size() == b.tables().size());
  CHECK(a.table_of_period() == b.table_of_period());
  for (std::size_t t = 0; t < a.tables().size(); ++t) {
    REQUIRE(a.tables()[t].size() == b.tables()[t].size());
    for (std::size_t c = 0; c < a.tables()[t].size(); ++c)
      CHECK(a.tables()[t][c] == Approx(b.tables()[t][c]).epsilon(1e-15));
  }
}

}  // namespace

TEST_CASE("fitted model: read back, it is the estimation's model with the fitted values") {
  const FittedFolder f;
  const EstimationReadResult r = read_estimation_file(f.dir / "setup.toml");
  std::string messages;
  for (const Diagnostic& d : r.diagnostics) messages += d.to_string() + "\n";
  INFO(messages);
  REQUIRE(r.setup);
  REQUIRE(r.model);
  CHECK(r.model_file == f.dir / "model.toml");
  const std::vector<double> values = {3.5, 1.7, 0.6, 1.3, 0.4, 2.5};
  const std::filesystem::path out = f.dir / "fit";
  std::filesystem::create_directories(out);
  const std::vector<FittedModelFile> files =
      fitted_model_files(r.model_file, *r.model, *r.setup, values, out, {"test header"});
  write_fitted_model(out, files);
  REQUIRE(files.back().name == "fitted_model.toml");
  const std::string text = files.back().contents;
  CHECK(text.rfind("# test header\n", 0) == 0);

  const ReadResult back = read_model_file(out / "fitted_model.toml");
  std::string back_messages;
  for (const Diagnostic& d : back.diagnostics) back_messages += d.to_string() + "\n";
  INFO(back_messages);
  REQUIRE(back.model);
  const Model expected = model_with_parameters(*r.model, *r.setup, values);
  const Model& m = *back.model;
  CHECK(m.title == "Fitted writer test (fitted)");
  for (std::size_t c = 0; c < 6; ++c) {
    CHECK(m.aquifer.kx[c] == Approx(expected.aquifer.kx[c]).epsilon(1e-15));
    CHECK(m.aquifer.ky[c] == Approx(expected.aquifer.ky[c]).epsilon(1e-15));
    CHECK(m.aquifer.specific_storage[c] ==
          Approx(expected.aquifer.specific_storage[c]).epsilon(1e-15));
    CHECK(m.aquifer.specific_yield[c] == Approx(expected.aquifer.specific_yield[c]).epsilon(1e-15));
  }
  CHECK(m.aquifer.kx[0] == 3.5);  // the fitted value itself, not a multiplier
  check_same_tables(m.recharges[0].rate, expected.recharges[0].rate);
  check_same_tables(m.rivers[0].conductance, expected.rivers[0].conductance);
  check_same_tables(m.drains[0].conductance, expected.drains[0].conductance);
  // The relative paths of the model still find its files from the new folder.
  REQUIRE(m.observations.size() == 1);
  CHECK(m.observations[0].measured.size() == 8);
  CHECK(text.find("'../data/kzones.txt'") != std::string::npos);

  // K stays given by zones (the fitted zone value replaced); Sy, uniform, one number; Ss,
  // which varies by cell, an array file.
  CHECK(text.find("1 = 3.5") != std::string::npos);
  CHECK(text.find("specific_yield = 0.12") != std::string::npos);
  REQUIRE(files.size() == 2);
  CHECK(files[0].name == "fitted_specific_storage.txt");
  CHECK(text.find("specific_storage = { file = 'fitted_specific_storage.txt' }") !=
        std::string::npos);
  // Its own results go beside it.
  CHECK(text.find("folder = 'results'") != std::string::npos);
}

TEST_CASE("fitted model: a conductance given by a file is refused, naming the key") {
  std::string model = fitted_writer_model;
  const std::string zones =
      "conductance = { zones = \"data/kzones.txt\", values = { 1 = 3.0, 2 = 5.0 } }";
  model.replace(model.find(zones), zones.size(), "conductance = { file = \"data/ss.txt\" }");
  const FittedFolder f(model);
  const EstimationReadResult r = read_estimation_file(f.dir / "setup.toml");
  REQUIRE(r.setup);
  const std::vector<double> values = {3.5, 1.7, 0.6, 1.3, 0.4, 2.5};
  CHECK_THROWS_WITH(fitted_model_files(r.model_file, *r.model, *r.setup, values, f.dir / "fit", {}),
                    Catch::Contains("[[drain]] 1.conductance") && Catch::Contains("by 2.5"));
}
