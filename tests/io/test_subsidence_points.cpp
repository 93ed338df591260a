// [[subsidence_point]] (docs/model-format.md; docs/results.md, "subsidence_points.csv"): the
// reader's accepted forms and refusals with file, line and key, and the written series and
// residuals of a whole run against the conservation of water: where a well is the only
// stress of a confined cell, all it takes comes from storage, and with the specific storage
// given directly every part of that storage is counted as compaction (docs/results.md,
// `compaction`; the beds' release is their compaction, Terzaghi, 1925), so the ground has sunk
// by the pumped volume over the cell's area.
#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>

#include "csv_cells.hpp"
#include "io/results/result_recorder.hpp"
#include "io/results/result_tables.hpp"
#include "small_model.hpp"
#include "solver/simulation.hpp"
#include "support/model_builder.hpp"
#include "tests/io/reader_test_support.hpp"

using namespace reader_test;
using namespace aquiledger;

namespace {

std::filesystem::path scratch(const std::string& name) {
  return aquiledger::testing::scratch_folder("subsidence-points-" + name);
}

void write(const std::filesystem::path& file, const std::string& text) {
  std::ofstream(file) << text;
}

ReadResult read_in(const std::filesystem::path& dir, const std::string& text) {
  return read_model_text(text, dir / "model.toml");
}

/// An error naming `key` in `file` at `line` whose message holds every fragment.
bool error_at(const ReadResult& r, const std::string& file, int line, const std::string& key,
              std::initializer_list<std::string> fragments) {
  for (const auto& d : r.diagnostics) {
    if (d.severity != Severity::error || d.key != key || d.line != line) continue;
    if (std::filesystem::path(d.file).filename() != file) continue;
    bool all = true;
    for (const auto& f : fragments) all = all && d.message.find(f) != std::string::npos;
    if (all) return true;
  }
  return false;
}

std::string point(const std::string& name, double x, double y, const std::string& extra = "") {
  return "\n[[subsidence_point]]\nname = \"" + name + "\"\nx = " + std::to_string(x) +
         "\ny = " + std::to_string(y) + "\n" + extra;
}

double num(const std::string& s) { return std::strtod(s.c_str(), nullptr); }

}  // namespace

TEST_CASE("subsidence points: placed as bores, measured subsidence by time or date",
          "[reader][subsidence]") {
  const auto dir = scratch("accept");
  write(dir / "ext.csv", "time,subsidence\n0,0\n12.5,0.004\n# a comment\n30,0.011\n");
  auto r = read_in(dir, base_model() + point("Mill Lane", 25.0, 15.0, "measured = \"ext.csv\"\n") +
                            point("Ferry", 5.0, 25.0));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& p = r.model->subsidence_points;
  REQUIRE(p.size() == 2);
  CHECK(p[0].name == "Mill Lane");
  CHECK(p[0].cell == r.model->grid.locate(25.0, 15.0));
  REQUIRE(p[0].measured.size() == 3);
  CHECK(p[0].measured[1].time == 12.5);
  CHECK(p[0].measured[1].head == 0.004);
  CHECK(p[1].measured.empty());
  CHECK(r.model->observations.empty());
  // The measured file is an input (checkpoints fingerprint it).
  CHECK(std::find(r.model->input_files.begin(), r.model->input_files.end(), dir / "ext.csv") !=
        r.model->input_files.end());

  // Dates with a start date: 2021-01-11 is day 10 of a model starting 2021-01-01.
  write(dir / "dated.csv", "date,subsidence\n2021-01-11,0.002\n2021-01-21T12:00,0.003\n");
  r = read_in(
      dir, edit(base_model(), "time_unit = \"d\"", "time_unit = \"d\"\nstart_date = 2021-01-01") +
               point("Mill Lane", 25.0, 15.0, "measured = \"dated.csv\"\n"));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  REQUIRE(r.model->subsidence_points[0].measured.size() == 2);
  CHECK(r.model->subsidence_points[0].measured[0].time == 10.0);
  CHECK(r.model->subsidence_points[0].measured[1].time == 20.5);
}

TEST_CASE("subsidence points: refusals name the file, line and key", "[reader][subsidence]") {
  const auto dir = scratch("refuse");
  const std::string key = "[[subsidence_point]] \"Mill Lane\"";
  write(dir / "bad.csv", "time,subsidence\n1.0,0.001\n5.0,deep\n");
  auto r = read_in(dir, base_model() + point("Mill Lane", 25.0, 15.0, "measured = \"bad.csv\"\n"));
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(error_at(r, "bad.csv", 3, key + ".measured",
                 {"expected two numbers time,subsidence (d, m", "5.0,deep"}));

  write(dir / "dated.csv", "time,subsidence\n2021-01-11,0.002\n");
  r = read_in(dir, base_model() + point("Mill Lane", 25.0, 15.0, "measured = \"dated.csv\"\n"));
  INFO(all_messages(r));
  CHECK(error_at(r, "dated.csv", 2, key + ".measured", {"is a date", "start_date"}));

  std::string text = base_model() + point("Mill Lane", 25.0, 15.0, "measured = \"none.csv\"\n");
  r = read_in(dir, text);
  INFO(all_messages(r));
  CHECK(error_at(r, "model.toml", line_of(text, "measured = \"none"), key + ".measured",
                 {"cannot open measured-subsidence file", "time,subsidence"}));

  text = base_model() + point("Mill Lane", 55.0, 15.0);
  r = read_in(dir, text);
  INFO(all_messages(r));
  CHECK(error_at(r, "model.toml", line_of(text, "x = 55"), key + ".x", {"outside the grid"}));

  text = base_model() + point("Mill Lane", 25.0, 15.0, "depth = 40.0\n");
  r = read_in(dir, text);
  INFO(all_messages(r));
  CHECK(error_at(r, "model.toml", line_of(text, "depth"), key + ".depth", {"unknown key"}));

  text = base_model() + point("Mill Lane", 25.0, 15.0) + point("Mill Lane", 5.0, 5.0);
  r = read_in(dir, text);
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(all_messages(r).find("Mill Lane") != std::string::npos);
}

TEST_CASE("subsidence points: measured values all outside the run warn", "[reader][subsidence]") {
  const auto dir = scratch("warn");
  write(dir / "late.csv", "time,subsidence\n400,0.02\n");  // the base model runs 30 d
  const auto r =
      read_in(dir, base_model() + point("Mill Lane", 25.0, 15.0, "measured = \"late.csv\"\n"));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  CHECK(has_warning(r, "[[subsidence_point]] Mill Lane", "falls inside the run"));
}

TEST_CASE("subsidence points: the series is the pumped volume over the area, with residuals",
          "[io][subsidence][end-to-end]") {
  // One confined cell (100 m x 100 m, Ss 1e-5 1/m, 10 m) with clay beds 5 m thick
  // (Ske 1e-5, Skv 4e-4 1/m, pc 1 m below the initial head); pumping takes the head through
  // pc, injection recovers part of it, pumping again. Fields are not written: the points
  // keep the fields going on their own.
  test::AquiferSpec a;
  a.specific_storage = 1e-5;
  a.top = 10.0;
  a.bottom = 0.0;
  a.initial_head = 20.0;
  Model m = test::make_model({100.0}, {100.0}, a);
  const std::vector<double> rates = {10.0, -0.3, 1.0};  // L3/T, + = withdrawal
  for (std::size_t p = 0; p < rates.size(); ++p) test::add_period(m, 10.0, 3);
  test::add_well(m, 0, 0, rates);
  test::add_interbeds(m, 5.0, 1e-5, 4e-4, 1.0);
  m.output.fields = FieldCadence::none;
  Observation pt;
  pt.name = "cell centre";
  pt.x = 50.0;
  pt.y = 50.0;
  pt.cell = *m.grid.locate(50.0, 50.0);
  // Invented readings for the residual arithmetic only; 40 lies after the run's end (30).
  pt.measured = {{5.0, 0.004}, {15.0, 0.009}, {40.0, 0.0}};
  m.subsidence_points.push_back(pt);

  const auto folder = scratch("run");
  ResultRecorder recorder(m, folder);
  REQUIRE(run_simulation(m, recorder).converged);
  recorder.flush();
  CHECK_FALSE(std::filesystem::exists(folder / "fields.pvd"));

  const auto series = testing::read_csv_cells(folder / "subsidence_points.csv");
  REQUIRE(series.size() == 1 + 1 + 9);  // header, time 0, three steps in each of 3 periods
  CHECK(series[0] == std::vector<std::string>{"point", "period", "step", "time", "subsidence"});
  CHECK(series[1] == std::vector<std::string>{"cell centre", "0", "0", "0", "0"});
  double pumped = 0.0, last_time = 0.0;  // L3
  std::vector<double> times{0.0}, sunk{0.0};
  for (std::size_t r = 2; r < series.size(); ++r) {
    const double t = num(series[r][3]);
    pumped += rates[static_cast<std::size_t>(num(series[r][1])) - 1] * (t - last_time);
    last_time = t;
    times.push_back(t);
    sunk.push_back(num(series[r][4]));
    INFO("time " << t);
    // Conservation of water: released storage = pumped volume, to the budget closure the
    // format contract demands of every step (1e-6 percent: 1e-8 relative).
    CHECK(sunk.back() == Approx(pumped / 1.0e4).epsilon(1e-8));
  }
  CHECK(sunk.back() > 0.0);

  // Residuals: simulated (linear in time between output times) minus measured, only for
  // measured times inside the run.
  const auto residuals = testing::read_csv_cells(folder / "subsidence_residuals.csv");
  REQUIRE(residuals.size() == 1 + 2);
  CHECK(residuals[0] ==
        std::vector<std::string>{"point", "time", "measured", "simulated", "residual"});
  for (std::size_t r = 1; r < residuals.size(); ++r) {
    const double t = num(residuals[r][1]);
    const auto hi =
        static_cast<std::size_t>(std::lower_bound(times.begin(), times.end(), t) - times.begin());
    const double f = (t - times[hi - 1]) / (times[hi] - times[hi - 1]);
    const double simulated = sunk[hi - 1] + f * (sunk[hi] - sunk[hi - 1]);
    CHECK(residuals[r][0] == "cell centre");
    CHECK(num(residuals[r][2]) == pt.measured[r - 1].head);
    CHECK(num(residuals[r][3]) == Approx(simulated).epsilon(1e-12));
    CHECK(num(residuals[r][4]) == Approx(simulated - pt.measured[r - 1].head).epsilon(1e-12));
  }
}
