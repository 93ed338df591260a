// [interbeds]: accepted forms and refused values (docs/model-format.md, "[interbeds]").
#include "tests/io/reader_test_support.hpp"

using namespace reader_test;

namespace {
const std::string base = base_model();
const std::string beds = R"(
[interbeds]
thickness = 4.0
elastic_storage = 2.0e-5
inelastic_storage = 5.0e-4
preconsolidation_below_initial = 1.5
)";
void expect_rejected(const std::string& text, const std::string& key,
                     std::initializer_list<std::string> fragments, int line = 0) {
  const auto r = read(text);
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(has_error(r, key, fragments, line));
}
}  // namespace

TEST_CASE("interbeds: an offset below the initial head, or a field", "[reader][interbeds]") {
  auto r = read(base + beds);
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& ib = r.model->aquifer.interbeds;
  REQUIRE(ib.has_value());
  CHECK(ib->thickness.size() == 12);
  CHECK(ib->thickness[5] == 4.0);
  CHECK(ib->elastic_storage[0] == 2.0e-5);
  CHECK(ib->inelastic_storage[11] == 5.0e-4);
  CHECK(ib->preconsolidation.empty());
  CHECK(ib->preconsolidation_offset == 1.5);
  CHECK(initial_preconsolidation(*ib, 0, 9.0) == 7.5);

  r = read(base + edit(beds, "preconsolidation_below_initial = 1.5",
                       "preconsolidation_head = { zones = \"zones_3x4.txt\", "
                       "values = { 1 = 8.0, 2 = 12.0, 3 = 12.0 } }"));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& field = *r.model->aquifer.interbeds;
  CHECK(field.preconsolidation[0] == 8.0);
  // Above the initial head (9): the beds have already been at 9, so pc is 9.
  CHECK(initial_preconsolidation(field, 3, 9.0) == 9.0);
  CHECK(read(base).model->aquifer.interbeds.has_value() == false);
}

TEST_CASE("interbeds: refused values name the key", "[reader][interbeds]") {
  std::string text = base + edit(beds, "inelastic_storage = 5.0e-4", "inelastic_storage = -1.0");
  expect_rejected(text, "[interbeds].inelastic_storage", {"expected >= 0 1/m"});
  text = base + edit(beds, "thickness = 4.0", "thickness = 12.0");
  expect_rejected(text, "[interbeds].thickness", {"at most the aquifer's thickness"});
  text = base + edit(beds, "preconsolidation_below_initial = 1.5", "");
  expect_rejected(text, "[interbeds].preconsolidation_head", {"missing required key"});
  text = base + beds + "preconsolidation_head = 3.0\n";
  expect_rejected(text, "[interbeds].preconsolidation_below_initial", {"not both"});
  text = base + edit(beds, "preconsolidation_below_initial = 1.5",
                     "preconsolidation_below_initial = -2.0");
  expect_rejected(text, "[interbeds].preconsolidation_below_initial", {"expected >= 0 m"},
                  line_of(text, "preconsolidation_below_initial"));
  text = base + edit(beds, "elastic_storage", "elastic_storag");
  expect_rejected(text, "[interbeds].elastic_storag", {"unknown key"});
}

TEST_CASE("interbeds: implausible skeletal specific storage warns", "[reader][interbeds]") {
  // Ranges from memory (io/model_file/plausibility.cpp): Ske 1e-6..1e-4 1/m, Skv 1e-5..1e-2
  // 1/m, Skv > Ske. 2e-5 and 5e-4 lie inside: no warning.
  auto r = read(base + beds);
  CHECK_FALSE(has_warning(r, "[interbeds].elastic_storage", ""));
  CHECK_FALSE(has_warning(r, "[interbeds].inelastic_storage", ""));
  // Swapped values: Skv 2e-5 < Ske 5e-4 (and Ske above its range).
  r = read(base + edit(edit(beds, "elastic_storage = 2.0e-5", "elastic_storage = 5.0e-4"),
                       "inelastic_storage = 5.0e-4", "inelastic_storage = 2.0e-5"));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  CHECK(has_warning(r, "[interbeds].elastic_storage", "lies outside the usual"));
  CHECK(has_warning(r, "[interbeds].inelastic_storage", "below the elastic one in 12 cells"));
}

namespace {
const std::string delay = R"(delay_beds = 2
delay_bed_thickness = 1.5
delay_bed_vertical_k = 1.0e-4
delay_bed_elastic_storage = 3.0e-5
delay_bed_inelastic_storage = 8.0e-4
)";
}  // namespace

TEST_CASE("interbeds: delay beds, as scalars or fields", "[reader][interbeds]") {
  auto r = read(base + beds + delay);
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& d = r.model->aquifer.interbeds->delay;
  REQUIRE(d.has_value());
  CHECK(d->count[3] == 2.0);
  CHECK(d->thickness[0] == 1.5);
  CHECK(d->vertical_k[11] == 1.0e-4);
  CHECK(d->elastic_storage[5] == 3.0e-5);
  CHECK(d->inelastic_storage[5] == 8.0e-4);
  CHECK(d->nodes == 10);  // the default
  CHECK(d->in_cell(3));

  // By zones, with cells free of delay beds, and 25 slices of each half-bed.
  r = read(base + beds +
           edit(delay, "delay_beds = 2",
                "delay_beds = { zones = \"zones_3x4.txt\", values = { 1 = 0, 2 = 1, 3 = 3 } }") +
           "delay_bed_nodes = 25\n");
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& z = *r.model->aquifer.interbeds->delay;
  CHECK(z.nodes == 25);
  CHECK(z.count[0] == 0.0);
  CHECK_FALSE(z.in_cell(0));
  CHECK(read(base + beds).model->aquifer.interbeds->delay.has_value() == false);
}

TEST_CASE("interbeds: refused delay-bed values name the key", "[reader][interbeds]") {
  std::string text = base + beds + edit(delay, "delay_bed_vertical_k = 1.0e-4", "");
  expect_rejected(text, "[interbeds].delay_bed_vertical_k", {"missing required key"});
  text = base + beds + edit(delay, "delay_beds = 2", "delay_beds = -1");
  expect_rejected(text, "[interbeds].delay_beds", {"expected >= 0"});
  text = base + beds + edit(delay, "delay_bed_thickness = 1.5", "delay_bed_thickness = 0.0");
  expect_rejected(text, "[interbeds].delay_bed_thickness", {"expected > 0 m where delay_beds > 0"},
                  line_of(text, "delay_bed_thickness"));
  text = base + beds +
         edit(delay, "delay_bed_inelastic_storage = 8.0e-4", "delay_bed_inelastic_storage = 0");
  expect_rejected(text, "[interbeds].delay_bed_inelastic_storage", {"expected > 0 1/m"});
  // 2 beds of 4 m and 4 m of no-delay beds exceed the aquifer's 10 m (base model).
  text = base + beds + edit(delay, "delay_bed_thickness = 1.5", "delay_bed_thickness = 4.0");
  expect_rejected(text, "[interbeds].delay_bed_thickness", {"at most the aquifer's thickness"});
  text = base + beds + delay + "delay_bed_nodes = 0\n";
  expect_rejected(text, "[interbeds].delay_bed_nodes", {"expected 1 .. 1000"},
                  line_of(text, "delay_bed_nodes"));
  text = base + beds + edit(delay, "delay_beds = 2\n", "");
  expect_rejected(text, "[interbeds].delay_bed_thickness", {"needs delay_beds"});
}

TEST_CASE("interbeds: implausible delay-bed storage warns", "[reader][interbeds]") {
  // The no-delay beds' ranges (from memory, io/model_file/plausibility.cpp): Ske 1e-6..1e-4
  // 1/m, Skv 1e-5..1e-2 1/m. 3e-5 and 8e-4 lie inside; Ske 5e-3 does not.
  auto r = read(base + beds + delay);
  CHECK_FALSE(has_warning(r, "[interbeds].delay_bed_elastic_storage", ""));
  CHECK_FALSE(has_warning(r, "[interbeds].delay_bed_inelastic_storage", ""));
  r = read(base + beds +
           edit(delay, "delay_bed_elastic_storage = 3.0e-5", "delay_bed_elastic_storage = 5.0e-3"));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  CHECK(has_warning(r, "[interbeds].delay_bed_elastic_storage", "lies outside the usual"));
}
