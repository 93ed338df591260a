// Checkpoint files (io/restart/checkpoint.hpp): every value reads back with the same bits, and a
// damaged or truncated file is refused with CheckpointError, never read as a state.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstring>
#include <limits>

#include "io/restart/checkpoint.hpp"

namespace {

using namespace aquiledger;

bool same_bits(const std::vector<double>& a, const std::vector<double>& b) {
  return a.size() == b.size() &&
         (a.empty() || std::memcmp(a.data(), b.data(), a.size() * sizeof(double)) == 0);
}

Checkpoint sample() {
  Checkpoint c;
  c.inputs.model = 0x0123456789abcdefull;
  c.inputs.files = {{"/data/k.txt", 42u}, {"/data/zones.txt", 7u}};
  c.threads = 2;
  // Values whose bits a decimal round trip could lose or change: NaN, -0, a subnormal,
  // the largest double, 0.1.
  const std::vector<double> awkward{std::nan(""), -0.0, 4.9e-324,
                                    std::numeric_limits<double>::max(), 0.1};
  c.state.period = 1;
  c.state.step_in_period = 3;
  c.state.time = 13.021700000000001;
  c.state.head = awkward;
  c.state.linear_start = {1e-300, -2.5};
  c.state.previous_head = awkward;
  c.state.previous_dt = 0.1;
  c.state.preconsolidation = {std::nan(""), 17.25, -0.0};
  c.state.delay_bed_heads = {18.5, 18.25, 0.1};
  c.state.delay_bed_preconsolidation = {18.0, -0.0, 4.9e-324};
  c.state.so_far.steps = 15;
  c.state.so_far.newton_iterations = 61;
  c.state.so_far.cutbacks = 1;
  c.recorder.initial_head = awkward;
  c.recorder.initial_observed = {35.0, 34.5};
  c.recorder.fields.head = awkward;
  c.recorder.fields.compaction = {0.0, 1e-7, std::nan("")};
  BudgetStepRow step{1, 3, 13.0217, 4.1, {}, 6, 2, {40, 9, 1}};
  step.rates.components[2] = {1.5, 0.25};
  step.rates[BudgetComponent::delay_bed_permanent] = {0.75, 0.0};
  step.rates.features = {{1.0, 2.0}};
  c.recorder.step_rows = {step};
  c.recorder.period_rows = {{1, "pumping \"season\"", 0.0, 13.0217, step.rates}};
  c.recorder.observation_rows = {{1, 1, 3, 13.0217, 34.1, 0.4}};
  c.recorder.subsidence_rows = {{0, 0, 0, 0.0, 0.0}, {1, 1, 3, 13.0217, 0.1}};
  c.recorder.field_entries = {{0.0, "fields_0000.vtr"}, {13.0217, "fields_0001.vtr"}};
  c.recorder.current_period = 0;
  c.recorder.period_open = true;
  c.recorder.time = 13.0217;
  c.recorder.stats.steps = 3;
  c.recorder.stats.newton_iterations = {4, 3, 5};
  c.recorder.head_arrays_done = 2;
  return c;
}

}  // namespace

TEST_CASE("a checkpoint reads back bit for bit", "[io][checkpoint]") {
  const Checkpoint c = sample();
  const Checkpoint d = decode_checkpoint(encode_checkpoint(c));
  CHECK(d.inputs.model == c.inputs.model);
  CHECK(d.inputs.files == c.inputs.files);
  CHECK(d.threads == 2);
  CHECK(d.state.period == 1);
  CHECK(d.state.step_in_period == 3);
  CHECK(std::memcmp(&d.state.time, &c.state.time, sizeof(double)) == 0);
  CHECK(same_bits(d.state.head, c.state.head));
  CHECK(same_bits(d.state.linear_start, c.state.linear_start));
  CHECK(same_bits(d.state.previous_head, c.state.previous_head));
  CHECK(d.state.previous_dt == c.state.previous_dt);
  CHECK(same_bits(d.state.preconsolidation, c.state.preconsolidation));
  CHECK(same_bits(d.state.delay_bed_heads, c.state.delay_bed_heads));
  CHECK(same_bits(d.state.delay_bed_preconsolidation, c.state.delay_bed_preconsolidation));
  CHECK(d.state.so_far.steps == 15);
  CHECK(d.state.so_far.newton_iterations == 61);
  CHECK(same_bits(d.recorder.initial_head, c.recorder.initial_head));
  CHECK(same_bits(d.recorder.fields.compaction, c.recorder.fields.compaction));
  REQUIRE(d.recorder.step_rows.size() == 1);
  CHECK(d.recorder.step_rows[0].rates.components[2].in == 1.5);
  CHECK(d.recorder.step_rows[0].rates[BudgetComponent::delay_bed_permanent].in == 0.75);
  CHECK(d.recorder.step_rows[0].rates.features.size() == 1);
  CHECK(d.recorder.step_rows[0].newton_iterations == 6);
  CHECK(d.recorder.step_rows[0].cutbacks == 2);
  CHECK(d.recorder.step_rows[0].cells.confined == 40);
  CHECK(d.recorder.step_rows[0].cells.water_table == 9);
  CHECK(d.recorder.step_rows[0].cells.dry == 1);
  CHECK(d.recorder.head_arrays_done == 2);
  CHECK(d.recorder.period_rows[0].name == "pumping \"season\"");
  CHECK(d.recorder.field_entries[1].file == "fields_0001.vtr");
  REQUIRE(d.recorder.subsidence_rows.size() == 2);
  CHECK(d.recorder.subsidence_rows[1].point == 1);
  CHECK(d.recorder.subsidence_rows[1].period == 1);
  CHECK(d.recorder.subsidence_rows[1].step == 3);
  CHECK(d.recorder.subsidence_rows[1].time == 13.0217);
  CHECK(d.recorder.subsidence_rows[1].subsidence == 0.1);
  CHECK(d.recorder.period_open);
  CHECK(d.recorder.stats.newton_iterations == std::vector<int>{4, 3, 5});
  // Encoding is deterministic: the same state gives the same bytes.
  CHECK(encode_checkpoint(d) == encode_checkpoint(c));
}

TEST_CASE("a truncated or altered checkpoint is refused", "[io][checkpoint]") {
  const std::string bytes = encode_checkpoint(sample());
  for (std::size_t n = 0; n < bytes.size(); n += 7) {
    INFO("first " << n << " bytes");
    CHECK_THROWS_AS(decode_checkpoint(std::string_view(bytes).substr(0, n)), CheckpointError);
  }
  std::string altered = bytes;
  altered[bytes.size() / 2] ^= 0x01;  // one bit in the state
  CHECK_THROWS_AS(decode_checkpoint(altered), CheckpointError);
  CHECK_THROWS_WITH(decode_checkpoint("something else entirely"),
                    Catch::Contains("not an aquiledger checkpoint"));
}

TEST_CASE("a checkpoint of changed input files is named", "[io][checkpoint]") {
  const InputFingerprint saved = sample().inputs;
  CHECK_FALSE(checkpoint_mismatch(saved, saved, "m.toml"));
  InputFingerprint model_changed = saved;
  model_changed.model ^= 1;
  CHECK(checkpoint_mismatch(saved, model_changed, "m.toml")->find("model file 'm.toml' changed") !=
        std::string::npos);
  InputFingerprint file_changed = saved;
  file_changed.files[1].second ^= 1;
  CHECK(checkpoint_mismatch(saved, file_changed, "m.toml")->find("'/data/zones.txt' changed") !=
        std::string::npos);
}

TEST_CASE("a checkpoint of an older format version is refused, saying so", "[io][checkpoint]") {
  // Version 3 had no preconsolidation heads: its state cannot continue a run with interbeds.
  std::string bytes = encode_checkpoint(sample());
  const std::uint32_t old = 3;
  std::memcpy(bytes.data() + 8, &old, sizeof old);  // after the 8-byte magic
  CHECK_THROWS_WITH(decode_checkpoint(bytes), Catch::Contains("format version 3") &&
                                                  Catch::Contains("older checkpoint cannot be "
                                                                  "resumed"));
}

TEST_CASE("a checkpoint of format 5 (before delay beds) is still read", "[io][checkpoint]") {
  // Format 5 had neither the delay beds' node state nor their two budget components; a run
  // without delay beds resumes from it as before (docs/subsidence.md, "State and restarts").
  Checkpoint c = sample();
  c.state.delay_bed_heads.clear();
  c.state.delay_bed_preconsolidation.clear();
  c.recorder.step_rows[0].rates[BudgetComponent::delay_bed_permanent] = {};
  c.recorder.period_rows[0].volumes = c.recorder.step_rows[0].rates;
  const std::string old = encode_checkpoint(c, 5);
  std::uint32_t version = 0;
  std::memcpy(&version, old.data() + 8, sizeof version);
  CHECK(version == 5);
  // Two components (16 bytes each) in each of two budgets, and two empty vectors, fewer.
  CHECK(encode_checkpoint(c).size() == old.size() + 2 * 32 + 2 * 8);
  const Checkpoint d = decode_checkpoint(old);
  CHECK(same_bits(d.state.preconsolidation, c.state.preconsolidation));
  CHECK(d.state.delay_bed_heads.empty());
  CHECK(d.recorder.step_rows[0].rates.components[2].in == 1.5);
  CHECK(d.recorder.period_rows[0].volumes.components[2].out == 0.25);
  // Read back, it encodes as the current format with the same content.
  CHECK(encode_checkpoint(d) == encode_checkpoint(c));
  // A state with delay beds cannot be written in format 5.
  CHECK_THROWS_AS(encode_checkpoint(sample(), 5), CheckpointError);
}
