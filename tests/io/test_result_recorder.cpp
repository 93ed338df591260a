// End to end through the writers: a steady confined strip between two fixed-head columns is
// solved, its fields, budget tables and observations are written and read back, and the
// files are compared with Darcy's law. For uniform transmissivity T the steady head is
// linear in x between the fixed cell centres, h = h_w + (h_e - h_w) (x - x_w) / L, and the
// discharge through the strip is Q = T (h_w - h_e) / L * W (Darcy, 1856; e.g. Bear, 1979,
// Hydraulics of Groundwater, section 5.1). The cell-centred scheme with harmonic face means
// reproduces a linear head exactly, so the checks need only solver round-off: the system is
// a handful of unknowns with a direct solve, well conditioned, and 1e-9 relative leaves
// orders of magnitude of room above that round-off while catching any modelling slip.
#include <vtkCellData.h>
#include <vtkDataArray.h>
#include <vtkNew.h>
#include <vtkRectilinearGrid.h>
#include <vtkXMLRectilinearGridReader.h>

#include <catch2/catch.hpp>
#include <cstdlib>
#include <fstream>

#include "csv_cells.hpp"
#include "io/results/result_recorder.hpp"
#include "io/results/result_tables.hpp"
#include "io/results/vtk_fields.hpp"
#include "postproc/cell_fields.hpp"
#include "postproc/observation_sampler.hpp"
#include "small_model.hpp"
#include "solver/simulation.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {

/// Records what a program's driver would: fields, budget rows, observation rows.
class Recorder : public SimulationObserver {
 public:
  explicit Recorder(const Model& m)
      : model_(m), layout_(make_system_layout(m)), sampler_(m.grid, m.observations) {}
  void initial_state(std::span<const double> head) override {
    initial_.assign(head.begin(), head.end());
    fields = initial_cell_fields(model_, layout_, head);
    add_observations(0, 0, 0.0, head);
  }
  void step_done(const StepInfo& info, std::span<const double> head_old,
                 std::span<const double> head_new) override {
    update_cell_fields(model_, layout_, info.steady, info.dt, initial_, head_old, head_new, fields);
    const WaterBudget b =
        step_budget(model_, layout_, info.period, info.steady, info.dt, head_old, head_new);
    steps.push_back({info.period + 1, info.step, info.time, info.dt, b, info.newton_iterations,
                     info.cutbacks, CellStateCounts{}});
    add_observations(info.period + 1, info.step, info.time, head_new);
  }
  void period_done(std::size_t) override {}

  CellFields fields;
  std::vector<BudgetStepRow> steps;
  std::vector<ObservationRow> observations;

 private:
  void add_observations(std::size_t period, int step, double time, std::span<const double> head) {
    const auto h = sampler_.sample(head);
    const auto h0 = sampler_.sample(initial_);
    for (std::size_t k = 0; k < h.size(); ++k)
      observations.push_back({k, period, step, time, h[k], h0[k] - h[k]});
  }
  const Model& model_;
  SystemLayout layout_;
  ObservationSampler sampler_;
  std::vector<double> initial_;
};

std::size_t column(const std::vector<std::string>& header, const std::string& name) {
  const auto it = std::find(header.begin(), header.end(), name);
  REQUIRE(it != header.end());
  return static_cast<std::size_t>(it - header.begin());
}

double num(const std::string& s) { return std::strtod(s.c_str(), nullptr); }

/// The value of a column in the row of a long budget table whose component is given.
double budget_value(const std::vector<std::vector<std::string>>& table,
                    const std::string& component, const std::string& name) {
  const std::size_t which = column(table[0], "component"), at = column(table[0], name);
  for (std::size_t r = 1; r < table.size(); ++r)
    if (table[r][which] == component) return num(table[r][at]);
  FAIL("no row for component " << component);
  return 0.0;
}

bool has_component(const std::vector<std::vector<std::string>>& table,
                   const std::string& component) {
  const std::size_t which = column(table[0], "component");
  for (std::size_t r = 1; r < table.size(); ++r)
    if (table[r][which] == component) return true;
  return false;
}

}  // namespace

TEST_CASE("written fields, budget and observations of a steady strip obey Darcy's law",
          "[io][end-to-end]") {
  test::AquiferSpec a;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 5.0;  // T = 50 m2/d
  a.initial_head = 18.0;
  const std::vector<double> dx = {10.0, 20.0, 15.0, 25.0, 10.0, 20.0};
  const std::vector<double> dy = {30.0, 12.0, 18.0};
  Model m = test::make_model(dx, dy, a);
  test::add_period(m, 1.0, 1, 1.0, true);
  test::add_fixed_head(m, test::column_cells(m, 0), 20.0);
  test::add_fixed_head(m, test::column_cells(m, 5), 15.0);
  const double xw = m.grid.x_center(0), xe = m.grid.x_center(5), L = xe - xw;
  const double T = 50.0, W = 60.0;
  const double gradient = (20.0 - 15.0) / L;
  auto exact = [&](double x) { return 20.0 - gradient * (x - xw); };
  const double Q = T * gradient * W;  // m3/d through the strip
  Observation o1, o2;
  o1.name = "interior";
  o1.x = 37.0;
  o1.y = 33.0;
  o2.name = "north edge";
  o2.x = 61.0;
  o2.y = 58.0;  // beyond the northern row centre (45): along x only
  m.observations = {o1, o2};

  Recorder rec(m);
  const RunResult result = run_simulation(m, rec);
  REQUIRE(result.converged);

  const auto folder = aquiledger::testing::scratch_folder("end-to-end");
  write_fields_vtr(folder / field_file_name(1), m, rec.fields, 1.0);
  write_budget_steps_csv(folder / "budget_steps.csv", budget_table_layout(m), rec.steps);
  write_observations_csv(folder / "observations.csv", m.observations, rec.observations);

  vtkNew<vtkXMLRectilinearGridReader> reader;
  reader->SetFileName((folder / field_file_name(1)).c_str());
  reader->Update();
  vtkRectilinearGrid* g = reader->GetOutput();
  vtkDataArray* head = g->GetCellData()->GetArray("head");
  vtkDataArray* east = g->GetCellData()->GetArray("flow_east");
  vtkDataArray* north = g->GetCellData()->GetArray("flow_north");
  REQUIRE(head != nullptr);
  REQUIRE(east != nullptr);
  REQUIRE(north != nullptr);
  const int nr = m.grid.n_rows(), nc = m.grid.n_cols();
  for (int j = 0; j < nr; ++j) {
    const int row = nr - 1 - j;  // VTK j grows northward
    for (int i = 0; i < nc; ++i) {
      INFO("row " << row << " col " << i);
      const vtkIdType id = j * nc + i;
      CHECK(head->GetComponent(id, 0) == Approx(exact(m.grid.x_center(i))).epsilon(1e-9));
      // Across the east face: T i dy of the row; none across the grid's east edge.
      const double expected_east = i + 1 < nc ? T * gradient * m.grid.dy(row) : 0.0;
      CHECK(east->GetComponent(id, 0) == Approx(expected_east).epsilon(1e-9).margin(1e-9 * Q));
      CHECK(north->GetComponent(id, 0) == Approx(0.0).margin(1e-9 * Q));
    }
  }

  // One step, components storage_elastic, fixed_head, and total (the model has no wells).
  const auto budget = testing::read_csv_cells(folder / "budget_steps.csv");
  REQUIRE(budget.size() == 1 + 3);
  CHECK(budget_value(budget, "fixed_head", "into_aquifer") == Approx(Q).epsilon(1e-9));
  CHECK(budget_value(budget, "fixed_head", "out_of_aquifer") == Approx(Q).epsilon(1e-9));
  CHECK(budget_value(budget, "total", "into_aquifer") == Approx(Q).epsilon(1e-9));
  CHECK(budget_value(budget, "storage_elastic", "into_aquifer") == 0.0);  // steady
  CHECK_FALSE(has_component(budget, "well"));
  CHECK(budget[1][column(budget[0], "unit")] == "m3/d");

  const auto obs = testing::read_csv_cells(folder / "observations.csv");
  REQUIRE(obs.size() == 1 + 2 * 2);  // header, two observations at time 0 and after the step
  const std::size_t h = column(obs[0], "head"), dd = column(obs[0], "drawdown");
  CHECK(obs[3][0] == "interior");
  CHECK(num(obs[3][h]) == Approx(exact(37.0)).epsilon(1e-9));
  CHECK(num(obs[3][dd]) == Approx(18.0 - exact(37.0)).epsilon(1e-9));
  CHECK(obs[4][0] == "north edge");
  CHECK(num(obs[4][h]) == Approx(exact(61.0)).epsilon(1e-9));
  std::filesystem::remove_all(folder);
}

// One-sided budget: steady recharge R over a strip closed on three sides leaves only through
// the fixed-head column, so the fixed_head row's out_of_aquifer equals R times the area and
// its into_aquifer is zero (conservation of mass in a steady state; no storage term).
// Tolerance: the steady Newton solve stops at flow_tolerance 1e-6 of the throughflow, well
// below 1e-5 relative.
TEST_CASE("written budget of recharge draining to a fixed head balances one-sidedly",
          "[io][end-to-end]") {
  test::AquiferSpec a;
  a.condition = Condition::water_table;
  a.top = 30.0;
  a.bottom = 0.0;
  a.k = 2.0;
  a.initial_head = 20.0;
  Model m = test::make_model({50.0, 50.0, 50.0, 50.0}, {40.0, 40.0}, a);
  test::add_period(m, 1.0, 1, 1.0, true);
  test::add_fixed_head(m, test::column_cells(m, 0), 20.0);
  test::add_recharge(m, {0.001});  // m/d
  Recorder rec(m);
  REQUIRE(run_simulation(m, rec).converged);
  const auto folder = aquiledger::testing::scratch_folder("end-to-end-recharge");
  write_budget_steps_csv(folder / "budget_steps.csv", budget_table_layout(m), rec.steps);
  const auto budget = testing::read_csv_cells(folder / "budget_steps.csv");
  // Recharge reaches the 6 cells that are not fixed (6 x 2000 m2): 12 m3/d; the fixed
  // cells receive none (fixed cells take no stress, physics decisions).
  const double recharge = 0.001 * 6 * 50.0 * 40.0;
  CHECK(budget_value(budget, "recharge", "into_aquifer") == Approx(recharge).epsilon(1e-12));
  CHECK(budget_value(budget, "fixed_head", "out_of_aquifer") == Approx(recharge).epsilon(1e-5));
  CHECK(budget_value(budget, "fixed_head", "into_aquifer") == Approx(0.0).margin(1e-5 * recharge));
  std::filesystem::remove_all(folder);
}

// The program's recorder, end to end: a switching aquifer pumped until cells near the well
// turn water-table. Every table is read back by the names of the results contract
// (version 2, docs/results.md); the cell counts of balance_steps.csv must equal
// the classes of the `state` array of the field file written at the same time, and the
// component rows of each step must add up to its `total` row and to the balance table.
TEST_CASE("the recorder's files read back by the contract's names and agree with each other",
          "[io][end-to-end]") {
  test::AquiferSpec a;
  a.condition = Condition::switching;
  a.top = 10.0;
  a.bottom = 0.0;
  a.k = 2.0;
  a.initial_head = 10.5;  // just above the top: confined at the start
  Model m = test::make_model(std::vector<double>(7, 50.0), std::vector<double>(7, 50.0), a);
  test::add_period(m, 20.0, 4, 1.0, false);
  test::add_well(m, 3, 3, {200.0});
  test::add_fixed_head(m, test::column_cells(m, 0), 10.5);
  m.output.fields = FieldCadence::every_step;

  const auto folder = aquiledger::testing::scratch_folder("recorder-files");
  ResultRecorder recorder(m, folder);
  REQUIRE(run_simulation(m, recorder).converged);
  recorder.flush();

  const auto steps = testing::read_csv_cells(folder / "budget_steps.csv");
  const auto balance = testing::read_csv_cells(folder / "balance_steps.csv");
  const auto periods = testing::read_csv_cells(folder / "budget_periods.csv");
  const auto balance_p = testing::read_csv_cells(folder / "balance_periods.csv");
  const auto features = testing::read_csv_cells(folder / "budget_features.csv");
  REQUIRE(balance.size() == 1 + 4);
  REQUIRE(balance_p.size() == 1 + 1);
  // storage_elastic (no compressibilities), storage_drainage, fixed_head, well, total.
  const std::vector<std::string> components = {"storage_elastic", "storage_drainage", "fixed_head",
                                               "well", "total"};
  REQUIRE(steps.size() == 1 + 4 * components.size());
  REQUIRE(periods.size() == 1 + components.size());
  CHECK(features[0] == std::vector<std::string>{"period", "period_name", "feature", "kind",
                                                "into_aquifer", "out_of_aquifer", "unit"});
  const std::size_t comp = column(steps[0], "component"), in = column(steps[0], "into_aquifer"),
                    out = column(steps[0], "out_of_aquifer"), unit = column(steps[0], "unit");
  bool converted = false;
  for (std::size_t s = 0; s < 4; ++s) {
    INFO("step " << s + 1);
    double sum_in = 0.0, sum_out = 0.0;
    for (std::size_t k = 0; k < components.size(); ++k) {
      const auto& row = steps[1 + s * components.size() + k];
      CHECK(row[comp] == components[k]);
      CHECK(row[unit] == "m3/d");
      if (k + 1 < components.size()) {
        sum_in += num(row[in]);
        sum_out += num(row[out]);
      } else {
        // Sums of a handful of positive terms: equal to a few ulps in any order.
        CHECK(num(row[in]) == Approx(sum_in).epsilon(1e-14));
        CHECK(num(row[out]) == Approx(sum_out).epsilon(1e-14));
        CHECK(num(balance[1 + s][column(balance[0], "into_aquifer")]) == num(row[in]));
        CHECK(num(balance[1 + s][column(balance[0], "out_of_aquifer")]) == num(row[out]));
      }
    }
    // The counts against the state array of the field file of the same step (field file
    // s + 1; file 0 is time 0).
    const FieldMap state = read_field_vtr(folder / field_file_name(s + 1), "state");
    long counted[3] = {0, 0, 0};
    for (double v : state.values) {
      REQUIRE((v == 0.0 || v == 1.0 || v == 2.0));  // every cell is active here
      counted[static_cast<int>(v)] += 1;
    }
    CHECK(num(balance[1 + s][column(balance[0], "dry_cells")]) == counted[0]);
    CHECK(num(balance[1 + s][column(balance[0], "water_table_cells")]) == counted[1]);
    CHECK(num(balance[1 + s][column(balance[0], "confined_cells")]) == counted[2]);
    CHECK(counted[0] + counted[1] + counted[2] == m.grid.n_active());
    converted |= counted[1] > 0;
    CHECK(num(balance[1 + s][column(balance[0], "newton_iterations")]) >= 1);
  }
  // 200 m3/d from a 10 m thick aquifer with T = 20 m2/d lowers the well cell by metres
  // (Thiem's log drawdown, Q / (2 pi T) ln(R / r) ~ 1.6 m per ln unit), far more than the
  // 0.5 m above the top: at least that cell converts.
  CHECK(converted);
  CHECK(periods[1][column(periods[0], "unit")] == "m3");
  CHECK(num(balance_p[1][column(balance_p[0], "end")]) == Approx(20.0));
  std::filesystem::remove_all(folder);
}
