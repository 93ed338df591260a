// The distributed engine against the serial engine on the solver and boundary test models:
// run under mpirun with 1 and 2 ranks (tests/CMakeLists.txt), every rank runs the serial
// engine on the whole model and the distributed engine on its band of rows, and compares
// heads (its own rows) and every budget column (summed over the ranks) at every step.
// The reference is the serial engine, itself tested against analytical solutions
// (tests/solver); the tolerances are those of the distributed engine's acceptance criterion
// (issue "Beyond one machine"): 1e-8 in head, 1e-8 relative in every budget column.
#define CATCH_CONFIG_RUNNER
#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "postproc/water_budget.hpp"
#include "solver/cell_balance.hpp"
#include "solver/distributed/petsc_engine.hpp"
#include "solver/face_table.hpp"
#include "solver/flow_system.hpp"
#include "solver/linear_solver.hpp"
#include "solver/simulation.hpp"
#include "solver/stress_test_models.hpp"
#include "solver/system_layout.hpp"
#include "support/model_builder.hpp"

using namespace aquiledger;

namespace {

PetscRuntime* runtime = nullptr;

constexpr double head_tolerance = 1e-8;    ///< L
constexpr double budget_tolerance = 1e-8;  ///< relative

/// Heads and step budgets of a run; with a part and a reduction, the budgets are summed over
/// the ranks and the heads are the rank's window.
class Collector : public SimulationObserver {
 public:
  Collector(const Model& model, GridPart part, ResultReduction* reduction)
      : model_(model), layout_(make_system_layout(model)), part_(part), reduction_(reduction) {}
  void initial_state(std::span<const double> head) override {
    initial.assign(head.begin(), head.end());
  }
  void step_done(const StepInfo& info, std::span<const double> head_old,
                 std::span<const double> head_new) override {
    WaterBudget b = step_budget(model_, layout_, part_, info.period, info.steady, info.dt,
                                CellValues(head_old, part_.first_held()),
                                CellValues(head_new, part_.first_held()),
                                CellValues(info.preconsolidation, part_.first_held()));
    if (reduction_ != nullptr) sum_across_processes(b, *reduction_);
    budgets.push_back(b);
    steps.push_back(info);
    steps.back().preconsolidation = {};  // valid only during step_done
    heads.emplace_back(head_new.begin(), head_new.end());
  }
  void period_done(std::size_t) override {}

  std::vector<double> initial;
  std::vector<StepInfo> steps;
  std::vector<WaterBudget> budgets;
  std::vector<std::vector<double>> heads;

 private:
  const Model& model_;
  SystemLayout layout_;
  GridPart part_;
  ResultReduction* reduction_;
};

struct Comparison {
  double max_head_difference = 0.0;      ///< L, over every rank's own cells and every step
  double max_budget_relative = 0.0;      ///< over every column and step, above the floor
  double max_budget_relative_raw = 0.0;  ///< the same counting differences below the floor
  RunResult serial, distributed;
  std::size_t serial_steps = 0, distributed_steps = 0;
};

/// Relative agreement, except that a difference below the serial engine's own rounding floor
/// for the step counts as none (rounding_floor in cell_balance.hpp: rounding_factor times every
/// budget term and every face flow of every unknown, what rounding alone leaves): a column
/// that is zero in one run and 1e-10 of a 1e3 throughflow in the other is rounding.
void close(double a, double b, double floor, double& worst, double& worst_raw) {
  const double scale = std::max(std::abs(a), std::abs(b));
  const double raw = scale > 0.0 ? std::abs(a - b) / scale : 0.0;
  const double rel = std::abs(a - b) > floor ? raw : 0.0;
  if (rel > budget_tolerance) std::printf("    differs: %.17g / %.17g (floor %.3g)\n", a, b, floor);
  worst = std::max(worst, rel);
  worst_raw = std::max(worst_raw, raw);
}

/// L3/T: the sum of |face flow| over both sides of every face, as FlowSystem sums it (each
/// unknown's own faces).
double face_terms(const Model& model, const std::vector<double>& head) {
  const SystemLayout layout = make_system_layout(model);
  double sum = 0.0;
  for (const Face& f : make_face_table(model)) {
    const auto i = static_cast<std::size_t>(f.i.value), j = static_cast<std::size_t>(f.j.value);
    const double q = std::abs(face_flow(model, layout, f.i, f.j, f.factor, head[i], head[j]).q);
    sum += q * ((layout.unknown_of_cell[i] >= 0) + (layout.unknown_of_cell[j] >= 0));
  }
  return sum;
}

/// The serial engine runs `reference` when given (the same model with another linear solver),
/// else `model`; the distributed engine runs `model`.
Comparison compare_engines(const Model& model, const Model* reference = nullptr) {
  Comparison c;
  Collector serial(model, GridPart::whole(model.grid), nullptr);
  c.serial = run_simulation(reference != nullptr ? *reference : model, serial);
  DistributedEngine engine(model);
  const GridPart part = engine.part();
  Collector distributed(model, part, &runtime->reduction());
  c.distributed = engine.run(distributed);
  c.serial_steps = serial.steps.size();
  c.distributed_steps = distributed.steps.size();
  const std::size_t n = std::min(c.serial_steps, c.distributed_steps);
  auto head_difference = [&](const std::vector<double>& full, const std::vector<double>& window) {
    double worst = 0.0;
    for (std::int32_t i = part.first_owned(); i < part.end_owned(); ++i) {
      const double a = full[static_cast<std::size_t>(i)];
      const double b = window[static_cast<std::size_t>(i - part.first_held())];
      if (std::isnan(a) && std::isnan(b)) continue;
      worst = std::max(worst, std::isfinite(a - b) ? std::abs(a - b) : INFINITY);
    }
    return worst;
  };
  c.max_head_difference = head_difference(serial.initial, distributed.initial);
  for (std::size_t s = 0; s < n; ++s) {
    c.max_head_difference =
        std::max(c.max_head_difference, head_difference(serial.heads[s], distributed.heads[s]));
    const WaterBudget& a = serial.budgets[s];
    const WaterBudget& b = distributed.budgets[s];
    const double floor =
        rounding_factor * (a.total_in() + a.total_out() + face_terms(model, serial.heads[s]));
    double& worst = c.max_budget_relative;
    double& raw = c.max_budget_relative_raw;
    for (std::size_t k = 0; k < n_budget_components; ++k) {
      close(a.components[k].in, b.components[k].in, floor, worst, raw);
      close(a.components[k].out, b.components[k].out, floor, worst, raw);
    }
    for (std::size_t k = 0; k < a.features.size(); ++k) {
      close(a.features[k].in, b.features[k].in, floor, worst, raw);
      close(a.features[k].out, b.features[k].out, floor, worst, raw);
    }
    close(a.well_shortfall, b.well_shortfall, floor, worst, raw);
  }
  // The largest head difference over every rank.
  std::vector<double> per_rank(static_cast<std::size_t>(runtime->n_ranks()), 0.0);
  per_rank[static_cast<std::size_t>(runtime->rank())] = c.max_head_difference;
  runtime->reduction().sum(per_rank);
  c.max_head_difference = *std::max_element(per_rank.begin(), per_rank.end());
  if (runtime->rank() == 0)
    std::printf(
        "  %d rank(s): %zu steps, largest head difference %.3g, budget %.3g relative "
        "(%.3g counting differences below the rounding floor)\n",
        runtime->n_ranks(), n, c.max_head_difference, c.max_budget_relative,
        c.max_budget_relative_raw);
  return c;
}

void require_agreement(const Comparison& c) {
  REQUIRE(c.serial.converged);
  INFO(c.distributed.failure);
  CHECK(c.distributed.converged);
  CHECK(c.distributed_steps == c.serial_steps);
  CHECK(c.distributed.cutbacks == c.serial.cutbacks);
  CHECK(c.max_head_difference <= head_tolerance);
  CHECK(c.max_budget_relative <= budget_tolerance);
}

void require_agreement(const Model& model) { require_agreement(compare_engines(model)); }

/// A confined aquifer with a pumped well between two fixed-head edges, inactive corner
/// cells and an odd number of rows (uneven bands): the symmetric system, CG.
Model confined_model() {
  test::AquiferSpec a;
  a.condition = Condition::confined;
  a.k = 20.0;
  a.specific_storage = 1e-4;
  a.initial_head = 20.0;
  const std::vector<double> dx(11, 50.0);
  const std::vector<double> dy = test::geometric_spacing(40.0, 1.3, 200.0);  // 7 rows
  Model m = test::make_model(dx, dy, a);
  std::vector<std::uint8_t> mask(static_cast<std::size_t>(m.grid.n_cells()), 1);
  mask[0] = mask[10] = mask.back() = 0;
  m.grid = RectilinearGrid(dx, dy, 0.0, 0.0, mask);
  test::add_period(m, 10.0, 8, 1.2);
  test::add_period(m, 20.0, 4, 1.0);
  test::add_well(m, m.grid.n_rows() / 2, 5, {500.0, 0.0});
  test::add_fixed_head(m, test::column_cells(m, 0), 20.0);
  test::add_fixed_head(m, test::column_cells(m, 10), 19.0);
  return m;
}

}  // namespace

TEST_CASE("confined: a pumped well between fixed heads", "[distributed]") {
  require_agreement(confined_model());
}

TEST_CASE("switching: every stress, a steady period, compressibility split", "[distributed]") {
  require_agreement(stress_tests::every_stress_model());
}

TEST_CASE("interbeds: the preconsolidation heads cross and recover in both engines",
          "[distributed][interbeds]") {
  Model m = stress_tests::every_stress_model();
  test::add_interbeds(m, 6.0, 2e-5, 5e-4, 0.2);
  require_agreement(m);
  Model c = confined_model();
  test::add_interbeds(c, 4.0, 1e-5, 3e-4, 0.05);
  require_agreement(c);
}

TEST_CASE("water table: a cell pumped dry wets again under recharge", "[distributed]") {
  require_agreement(test::drying_model());
}

TEST_CASE("water table: initial steady state with recharge between fixed heads", "[distributed]") {
  test::AquiferSpec a;
  a.condition = Condition::water_table;
  a.top = 30.0;
  a.bottom = 0.0;
  a.k = 5.0;
  a.specific_yield = 0.2;
  Model m = test::make_model(std::vector<double>(12, 100.0), std::vector<double>(7, 100.0), a);
  m.initial.steady = true;
  m.initial.head = std::vector<double>{};
  test::add_period(m, 30.0, 6, 1.2);
  test::add_fixed_head(m, test::column_cells(m, 0), 10.0);
  test::add_fixed_head(m, test::column_cells(m, 11), 12.0);
  test::add_recharge(m, {1e-3});
  test::add_well(m, 3, 6, {300.0});
  require_agreement(m);
}

// The structured V-cycle (hypre PFMG) as the distributed engine's preconditioner, asked for
// with linear = "multigrid" (auto takes it from 1e4 unknowns, beyond these models), against
// the serial engine on its exact direct solver (LU or Cholesky at these sizes): inexact
// Newton with the V-cycle must reach the same heads and budgets to the same 1e-8.
TEST_CASE("multigrid: the structured V-cycle agrees with the serial engine's direct solves",
          "[distributed][multigrid]") {
  if (!multigrid_available()) return;
  auto with_vcycle = [](const Model& reference) {
    Model m = reference;
    m.solver.linear = LinearChoice::multigrid;
    const Comparison c = compare_engines(m, &reference);
    CHECK(c.distributed.linear_solver.find("pfmg") != std::string::npos);
    require_agreement(c);
  };
  SECTION("confined, conjugate gradients") { with_vcycle(confined_model()); }
  SECTION("switching, every stress") { with_vcycle(stress_tests::every_stress_model()); }
  SECTION("water table, a cell pumped dry wets again") { with_vcycle(test::drying_model()); }
  SECTION("interbeds") {
    Model m = stress_tests::every_stress_model();
    test::add_interbeds(m, 6.0, 2e-5, 5e-4, 0.2);
    with_vcycle(m);
  }
}

TEST_CASE("non-convergence is the same status at the same place", "[distributed]") {
  Model m = test::drying_model();
  m.periods[0].steps = 1;  // one 20-day step pumping the aquifer dry
  m.solver.max_iterations = 2;
  m.solver.max_cutbacks = 1;
  const Comparison c = compare_engines(m);
  REQUIRE_FALSE(c.serial.converged);
  CHECK_FALSE(c.distributed.converged);
  CHECK(c.distributed.failed_period == c.serial.failed_period);
  CHECK(c.distributed.failed_step == c.serial.failed_step);
  CHECK(c.distributed.failed_time == c.serial.failed_time);
  CHECK(c.distributed.cutbacks == c.serial.cutbacks);
  CHECK(c.distributed_steps == c.serial_steps);
}

int main(int argc, char** argv) {
  PetscRuntime petsc(&argc, &argv);
  runtime = &petsc;
  Catch::Session session;
  // Only rank 0 reports; every rank runs every test (the engine is collective), and a
  // failure on any rank fails the program on every rank.
  if (petsc.rank() != 0 && std::freopen("/dev/null", "w", stdout) == nullptr) return 1;
  if (const int code = session.applyCommandLine(argc, argv); code != 0) return code;
  const int failed = session.run();
  const bool any = petsc.reduction().any(failed != 0);
  return any ? 1 : 0;
}

// The row split given to PETSc: whole rows, contiguous from the northern row, sizes differing
// by at most one with the longer bands first (PETSc's DMDA default, ly[i] = N/n + (N % n > i),
// from memory of PETSc's DMSetUp_DA_2D), and each rank's engine part is its band.
TEST_CASE("the engine's row split covers the rows and is the band each rank owns",
          "[distributed]") {
  for (auto [n_rows, n_ranks] : {std::pair{7, 1}, {7, 2}, {7, 3}, {8, 4}, {5, 5}, {1000, 64}}) {
    const std::vector<RowBand> split = row_split(n_rows, n_ranks);
    REQUIRE(split.size() == std::size_t(n_ranks));
    int next = 0;
    for (std::size_t r = 0; r < split.size(); ++r) {
      CHECK(split[r].first == next);
      CHECK(split[r].count == n_rows / n_ranks + (int(r) < n_rows % n_ranks ? 1 : 0));
      next = split[r].end();
    }
    CHECK(next == n_rows);
  }
  CHECK(row_split(7, 3)[0].count == 3);  // 7 rows on 3 ranks: 3, 2, 2
  CHECK(row_split(7, 3)[2].first == 5);
  const Model m = confined_model();
  if (runtime->n_ranks() > m.grid.n_rows()) return;
  DistributedEngine engine(m);
  const RowBand mine = row_split(m.grid.n_rows(), runtime->n_ranks())[std::size_t(runtime->rank())];
  CHECK(engine.part().owned.first == mine.first);
  CHECK(engine.part().owned.count == mine.count);
}
