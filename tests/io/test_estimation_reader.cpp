// The estimation set-up file (docs/estimation.md): what it accepts, how it resolves zones,
// bores and features against the model, and that every error names file, line and key.
#include <catch2/catch.hpp>
#include <fstream>

#include "estimation_test_model.hpp"
#include "io/model_file/estimation_reader.hpp"
#include "postproc/estimation_setup.hpp"
#include "small_model.hpp"

using namespace aquiledger;

namespace {

/// 2 x 3 cells of 10 m; K by zones (zone 1 west column, 2 the rest); a river along the
/// south row; two bores, one with a measured file.
const std::string model_text = aquiledger::testing::zoned_aquifer_model_head("kzones.txt") +
                               R"(specific_storage = 1.0e-5

[initial]
head = 9.0

[[period]]
length = 10.0
steps = 2

[[recharge]]
name = "rain"
rate = 0.001

[[river]]
name = "Tallow creek"
cells = [[2, 1], [2, 2], [2, 3]]
stage = 8.0
bed_bottom = 7.0
bed_conductance = 50.0

[[observation]]
name = "B1"
x = 5.0
y = 15.0
measured = "b1.csv"

[[observation]]
name = "B2"
x = 25.0
y = 15.0
)";

struct Folder {
  std::filesystem::path dir = aquiledger::testing::scratch_folder("estimation-reader");
  Folder() {
    std::ofstream(dir / "model.toml") << model_text;
    std::ofstream(dir / "kzones.txt") << "1 2 2\n1 2 2\n";
    std::ofstream(dir / "b1.csv") << "time,head\n2.5,8.9\n5,8.8\n10,8.7\n";
  }
  EstimationReadResult read(const std::string& setup) const {
    return read_estimation_text(setup, dir / "setup.toml");
  }
};

const std::string good = R"([estimate]
model = "model.toml"
max_iterations = 20

[[parameter]]
name = "k west"
property = "k"
zone = 1
lower = 0.1
upper = 10.0

[[parameter]]
name = "sy"
property = "specific_yield"
form = "value"
start = 0.2
lower = 0.01
upper = 0.3
prior = 0.15
prior_weight = 4.0

[[parameter]]
name = "creek bed"
property = "river_conductance"
feature = "Tallow creek"
lower = 0.01
upper = 100.0
log = false

[[target]]
name = "B1 heads"
kind = "head"
bore = "B1"
standard_deviation = 0.05

[[target]]
name = "gradient"
kind = "head_difference"
bore = "B1"
minus = "B2"
times = [5.0, 10.0]
values = [0.01, 0.02]
weight = 100.0

[[target]]
name = "creek gain"
kind = "flow"
feature = "Tallow creek"
times = [10.0]
values = [3.5]
)";

/// The first error's text (file:line:column: error: key: message).
std::string first_error(const EstimationReadResult& r) {
  for (const Diagnostic& d : r.diagnostics)
    if (d.severity == Severity::error) return d.to_string();
  return "";
}

}  // namespace

TEST_CASE("estimation set-up: parameters and targets resolved against the model") {
  const Folder f;
  const EstimationReadResult r = f.read(good);
  INFO(first_error(r));
  REQUIRE(r.setup);
  REQUIRE(r.model);
  const EstimationSetup& s = *r.setup;
  CHECK(s.max_iterations == 20);
  CHECK(s.gradient == GradientMethod::automatic);
  REQUIRE(s.parameters.size() == 3);
  // Zone 1 is the west column: cells 0 and 3 in raster order.
  CHECK(s.parameters[0].parameter.cells == std::vector<int>{0, 3});
  CHECK(s.parameters[0].start == 1.0);
  CHECK(s.parameters[0].log);
  CHECK(s.parameters[1].parameter.form == ParameterForm::value);
  CHECK(s.parameters[1].parameter.cells.size() == 6);
  REQUIRE(s.parameters[1].prior);
  CHECK(*s.parameters[1].prior == 0.15);
  CHECK(s.parameters[2].parameter.features == std::vector<std::size_t>{0});
  CHECK_FALSE(s.parameters[2].log);
  REQUIRE(s.targets.size() == 3);
  // Heads from the bore's measured file; weight 1 / 0.05^2.
  CHECK(s.targets[0].times == std::vector<double>{2.5, 5.0, 10.0});
  CHECK(s.targets[0].values == std::vector<double>{8.9, 8.8, 8.7});
  CHECK(s.targets[0].weights[0] == Approx(400.0));
  CHECK(s.targets[1].bore == 0);
  CHECK(s.targets[1].other_bore == 1);
  CHECK(s.targets[1].weights[1] == 100.0);
  CHECK(s.targets[2].feature.kind == FeatureKind::river);
  CHECK(s.n_measurements() == 6);
}

TEST_CASE("estimation set-up: parameter values put into the model") {
  const Folder f;
  const EstimationReadResult r = f.read(good);
  REQUIRE(r.setup);
  const Model& base = *r.model;
  const Model m = model_with_parameters(base, *r.setup, {3.0, 0.05, 0.5});
  // Multiplier on zone 1 only; ky keeps the model's ratio (here 1).
  CHECK(m.aquifer.kx[0] == 6.0);
  CHECK(m.aquifer.ky[3] == 6.0);
  CHECK(m.aquifer.kx[1] == 8.0);
  CHECK(m.aquifer.specific_yield[4] == 0.05);
  CHECK(m.rivers[0].conductance.at(0, 2) == 25.0);
  CHECK(m.recharges[0].rate.at(0, 0) == 0.001);
}

TEST_CASE("estimation set-up: the gradient method") {
  const Folder f;
  for (auto [word, method] : {std::pair{"forward", GradientMethod::forward},
                              std::pair{"adjoint", GradientMethod::adjoint},
                              std::pair{"auto", GradientMethod::automatic}}) {
    std::string text = good;
    text.replace(text.find("max_iterations = 20"), 19,
                 std::string("max_iterations = 20\ngradient = \"") + word + "\"");
    const EstimationReadResult r = f.read(text);
    INFO(first_error(r));
    REQUIRE(r.setup);
    CHECK(r.setup->gradient == method);
    CHECK(std::string(gradient_method_label(method)) == word);
  }
}

TEST_CASE("estimation set-up: errors name file, line and key") {
  const Folder f;
  struct Case {
    std::string from, to, key, words;
  };
  const std::vector<Case> cases = {
      {"zone = 1", "zone = 7", "[[parameter]] \"k west\".zone", "no active cell has zone 7"},
      {"property = \"k\"", "property = \"kk\"", "[[parameter]] \"k west\".property",
       "did you mean \"k\""},
      {"lower = 0.1", "lower = 2.0", "[[parameter]] \"k west\".lower", "lower <= start"},
      {"feature = \"Tallow creek\"\nlower", "feature = \"Tallow crk\"\nlower",
       "[[parameter]] \"creek bed\".feature", "no such feature"},
      {"bore = \"B1\"\nstandard", "bore = \"B9\"\nstandard", "[[target]] \"B1 heads\".bore",
       "no [[observation]] named \"B9\""},
      {"values = [3.5]", "values = [3.5, 4.0]", "[[target]] \"creek gain\".values",
       "as many values as times"},
      {"times = [10.0]", "times = [11.0]", "[[target]] \"creek gain\".times", "within the run"},
      {"weight = 100.0", "weight = 100.0\nstandard_deviation = 0.1",
       "[[target]] \"gradient\".weight", "not both"},
      {"prior_weight = 4.0", "", "[[parameter]] \"sy\".prior_weight", "needs prior_weight"},
      {"max_iterations = 20", "max_iterations = 20\ngradient = \"backward\"", "[estimate].gradient",
       "expected \"auto\", \"forward\" or \"adjoint\""},
  };
  for (const Case& c : cases) {
    std::string text = good;
    const auto pos = text.find(c.from);
    REQUIRE(pos != std::string::npos);
    text.replace(pos, c.from.size(), c.to);
    const EstimationReadResult r = f.read(text);
    INFO(c.to);
    CHECK_FALSE(r.setup);
    const std::string e = first_error(r);
    INFO(e);
    CHECK(e.find("setup.toml:") != std::string::npos);
    CHECK(e.find(c.key) != std::string::npos);
    CHECK(e.find(c.words) != std::string::npos);
    // The line of the offending key (when it has one): within the text.
    bool has_line = false;
    for (const Diagnostic& d : r.diagnostics) has_line |= d.line > 0;
    CHECK(has_line);
  }
}

TEST_CASE("estimation set-up: a refused start is the only error of its parameter") {
  // "inf" and "nan" are TOML floats but not numbers here (toml_access.hpp, number_of); the
  // first error must stay the only one on the key, in either form of the parameter.
  const Folder f;
  for (const std::string word : {"inf", "nan", "\"0.2\""}) {
    for (const std::string& from :
         {std::string("start = 0.2"), std::string("name = \"k west\"\nproperty = \"k\"")}) {
      std::string text = good;
      const std::string to = from == "start = 0.2" ? "start = " + word : from + "\nstart = " + word;
      text.replace(text.find(from), from.size(), to);
      const EstimationReadResult r = f.read(text);
      INFO(to);
      CHECK_FALSE(r.setup);
      std::string errors;
      int n_errors = 0;
      for (const Diagnostic& d : r.diagnostics)
        if (d.severity == Severity::error) {
          errors += d.to_string() + "\n";
          ++n_errors;
        }
      INFO(errors);
      CHECK(n_errors == 1);
      CHECK(errors.find(".start: expected a number") != std::string::npos);
    }
  }
}

TEST_CASE("estimation set-up: overlapping parameters and a missing model are refused") {
  const Folder f;
  std::string text = good + R"(
[[parameter]]
name = "k all"
property = "k"
lower = 0.1
upper = 10.0
)";
  EstimationReadResult r = f.read(text);
  CHECK_FALSE(r.setup);
  CHECK(first_error(r).find("overlap those of parameter \"k west\"") != std::string::npos);

  std::string missing = good;
  missing.replace(missing.find("model.toml"), 10, "nowhere.toml");
  r = f.read(missing);
  CHECK_FALSE(r.setup);
  CHECK_FALSE(r.model);
  CHECK(first_error(r).find("nowhere.toml") != std::string::npos);
}
