// River stage and bed bottom given at the vertices of a polyline channel
// (docs/model-format.md, "[[river]]"): each cell takes the mean, along the channel inside it,
// of the values interpolated linearly between vertices. Checked against the same means worked
// out by hand and against the trapezoid rule, which integrates a piecewise-linear profile
// exactly.
#include "tests/io/reader_test_support.hpp"

using namespace reader_test;

namespace {
/// The base model (3 x 4 cells of 10 m, x 0..40, y 0..30) with one river along `polyline`.
std::string river(const std::string& polyline, const std::string& stage,
                  const std::string& bottom = "1.0") {
  return base_model() + "\n[[river]]\nname = \"brook\"\npolyline = " + polyline +
         "\nstage = " + stage + "\nbed_bottom = " + bottom + "\nbed_conductance = 2.0\n";
}
}  // namespace

TEST_CASE("river vertices: a straight channel takes the stage at each cell's midpoint",
          "[reader][river]") {
  const auto r = read(river("[[0.0, 15.0], [40.0, 15.0]]", "{ vertices = [10.0, 6.0] }"));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const aquiledger::River& rv = r.model->rivers.at(0);
  REQUIRE(rv.cells.size() == 4);
  // Linear from 10 at x = 0 to 6 at x = 40: the means over 0..10, ..., 30..40 are the values
  // at x = 5, 15, 25, 35 (worked by hand).
  const double expected[] = {9.5, 8.5, 7.5, 6.5};
  for (std::size_t c = 0; c < 4; ++c)
    CHECK(rv.stage.at(0, c) == Approx(expected[c]).epsilon(1e-14));
}

TEST_CASE("river vertices: a bent channel; the means integrate the profile exactly",
          "[reader][river]") {
  // (0, 15) -> (25, 15) -> (25, 5); stage 10, 8, 6 at the vertices; bed bottom per period.
  const auto r =
      read(river("[[0.0, 15.0], [25.0, 15.0], [25.0, 5.0]]", "{ vertices = [10.0, 8.0, 6.0] }",
                 "[{ vertices = [1.0, 1.0, 1.0] }, { vertices = [2.0, 0.0, -2.0] }]"));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const aquiledger::River& rv = r.model->rivers.at(0);
  // Cells crossed: row 2 columns 1, 2, 3 (x 0..25 at y 15), then row 3 column 3 (y 10..5).
  REQUIRE(rv.cells.size() == 4);
  // Row 2, column 3 holds x 20..25 of the first leg (mean 10 - 2 * 0.9 = 8.2) and y 15..10 of
  // the second (8 - 2 * 0.25 = 7.5), 5 m each: 7.85 (by hand).
  CHECK(rv.cells[2].value == 1 * 4 + 2);
  CHECK(rv.stage.at(0, 2) == Approx(7.85).epsilon(1e-14));
  CHECK(rv.stage.at(0, 3) == Approx(6.5).epsilon(1e-14));
  // The trapezoid rule: 25 (10 + 8) / 2 + 10 (8 + 6) / 2 = 295 along the 35 m channel.
  double integral = 0.0, length = 0.0;
  for (std::size_t c = 0; c < rv.cells.size(); ++c) {
    integral += rv.stage.at(0, c) * rv.length[c];
    length += rv.length[c];
  }
  CHECK(length == Approx(35.0).epsilon(1e-14));
  CHECK(integral == Approx(295.0).epsilon(1e-14));
  CHECK(rv.bed_bottom.at(0, 0) == 1.0);
  // Period 2: 0 at the bend, -2 at the end: the last cell (t = 0.5..1 of the second leg) takes
  // the value at t = 0.75, -1.5 (by hand).
  CHECK(rv.bed_bottom.at(1, 3) == Approx(-1.5).epsilon(1e-14));
}

TEST_CASE("bad river vertices 01: one value too few", "[reader][river][errors]") {
  const std::string text =
      river("[[0.0, 15.0], [25.0, 15.0], [25.0, 5.0]]", "{ vertices = [10.0, 8.0] }");
  const auto r = read(text);
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, "[[river]] \"brook\".stage.vertices",
                  {"expected an array of 3 numbers, one per vertex"}, line_of(text, "stage")));
}
TEST_CASE("bad river vertices 02: values at vertices without a polyline",
          "[reader][river][errors]") {
  const std::string text = base_model() +
                           "\n[[river]]\nname = \"brook\"\ncells = [[2, 1], [2, 2]]\nstage = { "
                           "vertices = [10.0, 8.0] }\nbed_bottom = 1.0\nbed_conductance = 2.0\n";
  const auto r = read(text);
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, "[[river]] \"brook\".stage.vertices", {"need a feature placed by polyline"},
                  line_of(text, "stage")));
}
TEST_CASE("bad river vertices 03: a vertex value that is not a number", "[reader][river][errors]") {
  const std::string text = river("[[0.0, 15.0], [40.0, 15.0]]", "{ vertices = [10.0, \"high\"] }");
  const auto r = read(text);
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, "[[river]] \"brook\".stage.vertices[2]", {"\"high\"", "an elevation"},
                  line_of(text, "stage")));
}
