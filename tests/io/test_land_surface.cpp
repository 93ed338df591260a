// The land surface (docs/model-format.md, [aquifer].land_surface): heads above it are
// reported, before a run from the initial heads (check) and after it from the simulated
// ones, with counts and the worst cells; the fields carry the depth to water.
#include <catch2/catch.hpp>
#include <cmath>

#include "io/model_file/plausibility.hpp"
#include "io/results/result_recorder.hpp"
#include "io/results/vtk_fields.hpp"
#include "postproc/land_surface.hpp"
#include "solver/simulation.hpp"
#include "tests/io/reader_test_support.hpp"
#include "tests/io/small_model.hpp"
#include "tests/support/model_builder.hpp"

using namespace aquiledger;

TEST_CASE("land surface: uniform recharge on a closed confined aquifer floods every cell",
          "[land_surface]") {
  // With no lateral flow the continuity equation of a confined aquifer is S dh/dt = R (Bear,
  // 1979, Hydraulics of Groundwater, eq. of storage; from memory): R = 1e-4 m/d over 10 d on
  // S = Ss b = 1e-4 * 10 = 1e-3 raises every head by exactly R t / S = 1 m, from 20 m to 21 m,
  // and backward Euler is exact for a constant rate of rise. With the land surface at
  // 20.5 m every one of the 9 cells ends 0.5 m above it.
  test::AquiferSpec a;
  a.specific_storage = 1.0e-4;
  a.initial_head = 20.0;
  Model m = test::make_model(std::vector<double>(3, 10.0), std::vector<double>(3, 10.0), a);
  test::add_period(m, 10.0, 4);
  test::add_recharge(m, {1.0e-4});
  m.aquifer.land_surface.assign(9, 20.5);
  m.aquifer.land_surface[4] = 20.25;  // the centre lower: the worst cell
  m.output.fields = FieldCadence::period_end;
  const auto folder = aquiledger::testing::scratch_folder("land-surface");
  ResultRecorder recorder(m, folder);
  REQUIRE(run_simulation(m, recorder).converged);
  const HeadsAboveSurface above = recorder.heads_above_land_surface_at_end();
  CHECK(above.cells == 9);
  REQUIRE(above.worst.size() == 3);
  CHECK(above.worst[0].cell.value == 4);
  CHECK(above.worst[0].excess == Approx(0.75).epsilon(1e-9));
  CHECK(above.worst[1].excess == Approx(0.5).epsilon(1e-9));
  // The depth to water in the last field file: land surface minus head, negative above.
  const FieldMap depth = read_field_vtr(folder / field_file_name(1), "depth_to_water");
  REQUIRE(depth.values.size() == 9);
  CHECK(depth.values[4] == Approx(-0.75).epsilon(1e-9));
  CHECK(depth.values[0] == Approx(-0.5).epsilon(1e-9));
  // And the initial field: 0.5 m below the ground (0.25 m at the centre).
  const FieldMap start = read_field_vtr(folder / field_file_name(0), "depth_to_water");
  CHECK(start.values[0] == Approx(0.5).epsilon(1e-12));
  CHECK(start.values[4] == Approx(0.25).epsilon(1e-12));
}

TEST_CASE("land surface: counts and worst cells of heads above it; none without one",
          "[land_surface]") {
  test::AquiferSpec a;
  Model m = test::make_model(std::vector<double>(3, 10.0), std::vector<double>(2, 10.0), a);
  const std::vector<double> head = {5.0, 7.0, 4.0, 9.0, 1.0, 6.0};
  CHECK(heads_above_land_surface(m, GridPart::whole(m.grid), head).cells == 0);
  CHECK(depth_to_water(m, GridPart::whole(m.grid), head).empty());
  m.aquifer.land_surface = {6.0, 6.0, 6.0, 6.0, 6.0, 6.0};
  const HeadsAboveSurface above = heads_above_land_surface(m, GridPart::whole(m.grid), head, 2);
  CHECK(above.cells == 2);  // 7 and 9; 6 equals the ground and is not above it
  REQUIRE(above.worst.size() == 2);
  CHECK(above.worst[0].cell.value == 3);
  CHECK(above.worst[0].excess == 3.0);
  CHECK(above.worst[1].cell.value == 1);
  CHECK(describe_heads_above(above, m.grid, "m") ==
        "in 2 active cells (largest 3 m at row 2, column 1; 1 m at row 1, column 2)");
}

TEST_CASE("land surface: check warns of initial heads and an aquifer top above the ground",
          "[land_surface][reader]") {
  using namespace reader_test;
  // Base model: 3 x 4 cells, top 10 m, initial head 9 m.
  const std::string text =
      edit(base_model(), "specific_storage = 1.0e-5",
           "specific_storage = 1.0e-5\nland_surface = { zones = \"land_zones.txt\", values = { 1 "
           "= 12.0, 2 = 8.5 } }");
  const auto r = read(text);
  INFO(all_messages(r));
  REQUIRE(r.ok());
  CHECK(r.model->aquifer.land_surface.size() == 12);
  // tests/data/reader/land_zones.txt puts zone 2 (8.5 m) in row 2, columns 2 and 3.
  CHECK(has_warning(r, "[initial].head",
                    "initial heads stand above the land surface in 2 active cells (largest 0.5 m "
                    "at row 2, column 2; 0.5 m at row 2, column 3)"));
  CHECK(has_warning(r, "[aquifer].land_surface",
                    "the aquifer top stands above the land surface in 2 active cells"));
}

TEST_CASE("land surface: a non-finite ground elevation is refused", "[land_surface][errors]") {
  using namespace reader_test;
  const std::string text = edit(base_model(), "specific_storage = 1.0e-5",
                                "specific_storage = 1.0e-5\nland_surface = nan");
  const auto r = read(text);
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, "[aquifer].land_surface", {}, line_of(text, "land_surface")));
}
