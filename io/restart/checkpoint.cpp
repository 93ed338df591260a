#include "io/restart/checkpoint.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <fstream>
#include <sstream>

#include "io/files/atomic_file.hpp"
#include "io/files/binary_stream.hpp"

namespace aquiledger {

namespace {

constexpr std::string_view magic = "AQLCKPT1";
constexpr std::uint32_t byte_order_mark = 0x01020304;

std::optional<std::string> read_bytes(const std::filesystem::path& file) {
  std::ifstream in(file, std::ios::binary);
  if (!in) return std::nullopt;
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) return std::nullopt;
  return text.str();
}

/// The format being read or written (5 or 6): version 5 had no delay-bed components.
thread_local std::uint32_t checkpoint_version_read = checkpoint_format_version;
thread_local std::uint32_t checkpoint_version_written = checkpoint_format_version;

bool in_checkpoint_version(BudgetComponent c, std::uint32_t version) {
  return version >= 6 ||
         (c != BudgetComponent::delay_bed_recoverable && c != BudgetComponent::delay_bed_permanent);
}

void put_budget(BinaryWriter& w, const WaterBudget& b) {
  for (std::size_t k = 0; k < n_budget_components; ++k)
    if (in_checkpoint_version(static_cast<BudgetComponent>(k), checkpoint_version_written))
      w.put(b.components[k].in), w.put(b.components[k].out);
  w.put_size(b.features.size());
  for (const InOut& f : b.features) w.put(f.in), w.put(f.out);
  w.put(b.well_shortfall);
}

WaterBudget get_budget(BinaryReader& r) {
  WaterBudget b;
  for (std::size_t k = 0; k < n_budget_components; ++k) {
    const auto c = static_cast<BudgetComponent>(k);
    if (!in_checkpoint_version(c, checkpoint_version_read)) continue;
    b.components[k].in = r.get<double>();
    b.components[k].out = r.get<double>();
  }
  b.features.resize(r.get_size(2 * sizeof(double)));
  for (InOut& f : b.features) f.in = r.get<double>(), f.out = r.get<double>();
  b.well_shortfall = r.get<double>();
  return b;
}

/// The cell arrays in CellFields declaration order.
template <class Fields, class F>
void for_each_field(Fields& f, F visit) {
  for (auto* v : {&f.head, &f.drawdown, &f.saturated_thickness, &f.state, &f.storage_rate,
                  &f.storage_skeleton_rate, &f.storage_water_rate, &f.storage_elastic_rate,
                  &f.storage_drainage_rate, &f.compaction, &f.flow_east, &f.flow_north,
                  &f.interbed_elastic_compaction, &f.interbed_inelastic_compaction, &f.subsidence,
                  &f.preconsolidation_head})
    visit(*v);
}

void put_run_counters(BinaryWriter& w, const RunResult& r) {
  w.put<std::int64_t>(r.steps);
  w.put<std::int64_t>(r.newton_iterations);
  w.put<std::int64_t>(r.linear_iterations);
  w.put<std::int64_t>(r.cutbacks);
  w.put<std::int64_t>(r.factorizations);
  w.put<std::int64_t>(r.factorization_reuses);
}

RunResult get_run_counters(BinaryReader& r) {
  RunResult c;
  c.steps = static_cast<int>(r.get<std::int64_t>());
  c.newton_iterations = static_cast<long>(r.get<std::int64_t>());
  c.linear_iterations = static_cast<long>(r.get<std::int64_t>());
  c.cutbacks = static_cast<int>(r.get<std::int64_t>());
  c.factorizations = static_cast<long>(r.get<std::int64_t>());
  c.factorization_reuses = static_cast<long>(r.get<std::int64_t>());
  return c;
}

/// Where an observation or subsidence row stands: its point's index (the member `point` of
/// Row), period, step and time; the same bytes in both tables.
template <class Row>
void put_output_row_place(BinaryWriter& w, const Row& row, std::size_t Row::*point) {
  w.put_size(row.*point);
  w.put_size(row.period);
  w.put<std::int32_t>(row.step);
  w.put(row.time);
}

template <class Row>
void get_output_row_place(BinaryReader& r, Row& row, std::size_t Row::*point) {
  row.*point = static_cast<std::size_t>(r.get<std::uint64_t>());
  row.period = static_cast<std::size_t>(r.get<std::uint64_t>());
  row.step = r.get<std::int32_t>();
  row.time = r.get<double>();
}

void put_recorder(BinaryWriter& w, const RecorderState& s) {
  w.put_vector(s.initial_head);
  w.put_vector(s.initial_observed);
  for_each_field(s.fields, [&](const std::vector<double>& v) { w.put_vector(v); });
  w.put_size(s.step_rows.size());
  for (const BudgetStepRow& row : s.step_rows) {
    w.put_size(row.period);
    w.put<std::int32_t>(row.step);
    w.put(row.time);
    w.put(row.dt);
    put_budget(w, row.rates);
    w.put<std::int32_t>(row.newton_iterations);
    w.put<std::int32_t>(row.cutbacks);
    for (long n : {row.cells.confined, row.cells.water_table, row.cells.dry})
      w.put<std::int64_t>(n);
  }
  w.put_size(s.period_rows.size());
  for (const BudgetPeriodRow& row : s.period_rows) {
    w.put_size(row.period);
    w.put_text(row.name);
    w.put(row.start);
    w.put(row.end);
    put_budget(w, row.volumes);
  }
  w.put_size(s.observation_rows.size());
  for (const ObservationRow& row : s.observation_rows) {
    put_output_row_place(w, row, &ObservationRow::observation);
    w.put(row.head);
    w.put(row.drawdown);
  }
  w.put_size(s.subsidence_rows.size());
  for (const SubsidenceRow& row : s.subsidence_rows) {
    put_output_row_place(w, row, &SubsidenceRow::point);
    w.put(row.subsidence);
  }
  w.put_size(s.field_entries.size());
  for (const FieldFileEntry& e : s.field_entries) w.put(e.time), w.put_text(e.file);
  w.put_size(s.current_period);
  w.put<std::uint8_t>(s.period_open ? 1 : 0);
  w.put(s.time);
  w.put<std::int32_t>(s.stats.steps);
  w.put<std::int32_t>(s.stats.max_newton_iterations);
  w.put_vector(s.stats.newton_iterations);
  w.put(s.stats.max_abs_imbalance_percent);
  w.put<std::int32_t>(s.stats.field_files);
  w.put(s.stats.output_seconds);
  w.put_size(s.head_arrays_done);
}

RecorderState get_recorder(BinaryReader& r) {
  RecorderState s;
  s.initial_head = r.get_vector<double>();
  s.initial_observed = r.get_vector<double>();
  for_each_field(s.fields, [&](std::vector<double>& v) { v = r.get_vector<double>(); });
  s.step_rows.resize(r.get_size());
  for (BudgetStepRow& row : s.step_rows) {
    row.period = static_cast<std::size_t>(r.get<std::uint64_t>());
    row.step = r.get<std::int32_t>();
    row.time = r.get<double>();
    row.dt = r.get<double>();
    row.rates = get_budget(r);
    row.newton_iterations = r.get<std::int32_t>();
    row.cutbacks = r.get<std::int32_t>();
    for (long* n : {&row.cells.confined, &row.cells.water_table, &row.cells.dry})
      *n = static_cast<long>(r.get<std::int64_t>());
  }
  s.period_rows.resize(r.get_size());
  for (BudgetPeriodRow& row : s.period_rows) {
    row.period = static_cast<std::size_t>(r.get<std::uint64_t>());
    row.name = r.get_text();
    row.start = r.get<double>();
    row.end = r.get<double>();
    row.volumes = get_budget(r);
  }
  s.observation_rows.resize(r.get_size());
  for (ObservationRow& row : s.observation_rows) {
    get_output_row_place(r, row, &ObservationRow::observation);
    row.head = r.get<double>();
    row.drawdown = r.get<double>();
  }
  s.subsidence_rows.resize(r.get_size());
  for (SubsidenceRow& row : s.subsidence_rows) {
    get_output_row_place(r, row, &SubsidenceRow::point);
    row.subsidence = r.get<double>();
  }
  s.field_entries.resize(r.get_size());
  for (FieldFileEntry& e : s.field_entries) e.time = r.get<double>(), e.file = r.get_text();
  s.current_period = static_cast<std::size_t>(r.get<std::uint64_t>());
  s.period_open = r.get<std::uint8_t>() != 0;
  s.time = r.get<double>();
  s.stats.steps = r.get<std::int32_t>();
  s.stats.max_newton_iterations = r.get<std::int32_t>();
  s.stats.newton_iterations = r.get_vector<int>();
  s.stats.max_abs_imbalance_percent = r.get<double>();
  s.stats.field_files = r.get<std::int32_t>();
  s.stats.output_seconds = r.get<double>();
  s.head_arrays_done = static_cast<std::size_t>(r.get<std::uint64_t>());
  return s;
}

}  // namespace

InputFingerprint fingerprint_inputs(const Model& model) {
  InputFingerprint f;
  const auto model_bytes = read_bytes(model.source_file);
  if (!model_bytes)
    throw CheckpointError(
        fmt::format("cannot read the model file '{}'", model.source_file.string()));
  f.model = fnv1a(*model_bytes);
  for (const auto& file : model.input_files) {
    const auto bytes = read_bytes(file);
    if (!bytes)
      throw CheckpointError(fmt::format(
          "cannot read input file '{}' (deleted since the model was read?)", file.string()));
    f.files.emplace_back(file.string(), fnv1a(*bytes));
  }
  return f;
}

std::string encode_checkpoint(const Checkpoint& c) {
  return encode_checkpoint(c, checkpoint_format_version);
}

std::string encode_checkpoint(const Checkpoint& c, std::uint32_t version) {
  if (version != checkpoint_format_version && !(version == 5 && c.state.delay_bed_heads.empty() &&
                                                c.state.delay_bed_preconsolidation.empty()))
    throw CheckpointError(fmt::format("cannot write checkpoint format version {}", version));
  checkpoint_version_written = version;
  BinaryWriter payload;
  const StartState& s = c.state;
  payload.put_size(s.period);
  payload.put<std::int32_t>(s.step_in_period);
  payload.put(s.time);
  payload.put_vector(s.head);
  payload.put_vector(s.linear_start);
  payload.put_vector(s.previous_head);
  payload.put(s.previous_dt);
  payload.put_vector(s.preconsolidation);
  if (version >= 6) {
    payload.put_vector(s.delay_bed_heads);
    payload.put_vector(s.delay_bed_preconsolidation);
  }
  put_run_counters(payload, s.so_far);
  put_recorder(payload, c.recorder);

  BinaryWriter w;
  for (char ch : magic) w.put(ch);
  w.put(version);
  w.put(byte_order_mark);
  w.put(c.inputs.model);
  w.put_size(c.inputs.files.size());
  for (const auto& [name, hash] : c.inputs.files) w.put_text(name), w.put(hash);
  w.put<std::int32_t>(c.threads);
  w.put_size(payload.bytes().size());
  std::string bytes = w.bytes() + payload.bytes();
  BinaryWriter tail;
  tail.put(fnv1a(payload.bytes()));
  return bytes + tail.bytes();
}

Checkpoint decode_checkpoint(std::string_view bytes) {
  try {
    BinaryReader r(bytes);
    for (char ch : magic)
      if (r.get<char>() != ch) throw CheckpointError("not an aquiledger checkpoint file");
    const auto version = r.get<std::uint32_t>();
    if (version != checkpoint_format_version && version != 5)
      throw CheckpointError(
          fmt::format("checkpoint format version {}; this program reads versions 5 to {} only "
                      "(an older checkpoint cannot be resumed: run the model again from its start)",
                      version, checkpoint_format_version));
    checkpoint_version_read = version;
    if (r.get<std::uint32_t>() != byte_order_mark)
      throw CheckpointError("checkpoint written on a machine of another byte order");
    Checkpoint c;
    c.inputs.model = r.get<std::uint64_t>();
    c.inputs.files.resize(r.get_size(16));
    for (auto& [name, hash] : c.inputs.files) name = r.get_text(), hash = r.get<std::uint64_t>();
    c.threads = r.get<std::int32_t>();
    const std::size_t n = r.get_size();
    const std::string_view payload = r.rest().substr(0, n);
    BinaryReader tail(r.rest().substr(n));
    if (tail.get<std::uint64_t>() != fnv1a(payload) || !tail.at_end())
      throw CheckpointError("checkpoint file is damaged (its fingerprint does not match)");
    BinaryReader p(payload);
    c.state.period = static_cast<std::size_t>(p.get<std::uint64_t>());
    c.state.step_in_period = p.get<std::int32_t>();
    c.state.time = p.get<double>();
    c.state.head = p.get_vector<double>();
    c.state.linear_start = p.get_vector<double>();
    c.state.previous_head = p.get_vector<double>();
    c.state.previous_dt = p.get<double>();
    c.state.preconsolidation = p.get_vector<double>();
    if (version >= 6) {
      c.state.delay_bed_heads = p.get_vector<double>();
      c.state.delay_bed_preconsolidation = p.get_vector<double>();
    }
    c.state.so_far = get_run_counters(p);
    c.recorder = get_recorder(p);
    if (!p.at_end()) throw CheckpointError("checkpoint file has unexpected trailing data");
    return c;
  } catch (const FormatError& e) {
    throw CheckpointError(std::string("checkpoint file is damaged: ") + e.what());
  }
}

void write_checkpoint(const std::filesystem::path& folder, const Checkpoint& checkpoint) {
  write_file_atomically(folder / checkpoint_file_name, encode_checkpoint(checkpoint));
}

Checkpoint read_checkpoint(const std::filesystem::path& folder) {
  const std::filesystem::path file = folder / checkpoint_file_name;
  const auto bytes = read_bytes(file);
  if (!bytes)
    throw CheckpointError(
        fmt::format("no checkpoint '{}' to resume from (run with "
                    "--checkpoint-every N first)",
                    file.string()));
  try {
    return decode_checkpoint(*bytes);
  } catch (const CheckpointError& e) {
    throw CheckpointError(fmt::format("'{}': {}", file.string(), e.what()));
  }
}

namespace {
constexpr std::string_view set_magic = "AQLCKSET";
constexpr std::string_view part_magic = "AQLCKPRT";

/// Checks a magic string; false (nothing thrown) when it does not match.
bool has_magic(BinaryReader& r, std::string_view expected) {
  for (char ch : expected)
    if (r.get<char>() != ch) return false;
  return true;
}
}  // namespace

std::string checkpoint_part_name(std::uint64_t generation, int rank) {
  return fmt::format("checkpoint_s{}_r{:04d}.aqck", generation % 2, rank);
}

void write_checkpoint_part(const std::filesystem::path& folder, const CheckpointSet& set, int rank,
                           const Checkpoint& checkpoint) {
  BinaryWriter w;
  for (char ch : part_magic) w.put(ch);
  w.put<std::int32_t>(rank);
  w.put<std::int32_t>(set.n_ranks);
  w.put(set.generation);
  write_file_atomically(folder / checkpoint_part_name(set.generation, rank),
                        w.bytes() + encode_checkpoint(checkpoint));
}

void write_checkpoint_set(const std::filesystem::path& folder, const CheckpointSet& set) {
  BinaryWriter w;
  for (char ch : set_magic) w.put(ch);
  w.put<std::int32_t>(set.n_ranks);
  w.put(set.generation);
  w.put(fnv1a(w.bytes()));
  write_file_atomically(folder / checkpoint_set_file_name, w.bytes());
}

CheckpointSet read_checkpoint_set(const std::filesystem::path& folder) {
  const std::filesystem::path file = folder / checkpoint_set_file_name;
  const auto bytes = read_bytes(file);
  if (!bytes)
    throw CheckpointError(
        fmt::format("no checkpoint '{}' of a distributed run to resume from "
                    "(run with --checkpoint-every N first)",
                    file.string()));
  try {
    BinaryReader r(*bytes);
    if (!has_magic(r, set_magic))
      throw CheckpointError("not the index of an aquiledger checkpoint set");
    CheckpointSet set;
    set.n_ranks = r.get<std::int32_t>();
    set.generation = r.get<std::uint64_t>();
    const std::string_view body = std::string_view(*bytes).substr(0, set_magic.size() + 12);
    if (r.get<std::uint64_t>() != fnv1a(body) || !r.at_end() || set.n_ranks < 1)
      throw CheckpointError("damaged (its fingerprint does not match)");
    return set;
  } catch (const FormatError& e) {
    throw CheckpointError(fmt::format("'{}': damaged: {}", file.string(), e.what()));
  } catch (const CheckpointError& e) {
    throw CheckpointError(fmt::format("'{}': {}", file.string(), e.what()));
  }
}

Checkpoint read_checkpoint_part(const std::filesystem::path& folder, const CheckpointSet& set,
                                int rank) {
  const std::filesystem::path file = folder / checkpoint_part_name(set.generation, rank);
  const auto bytes = read_bytes(file);
  if (!bytes)
    throw CheckpointError(
        fmt::format("the part '{}' of the checkpoint set is missing", file.string()));
  try {
    BinaryReader r(*bytes);
    if (!has_magic(r, part_magic)) throw CheckpointError("not a part of a checkpoint set");
    const int part_rank = r.get<std::int32_t>();
    const int part_ranks = r.get<std::int32_t>();
    const auto generation = r.get<std::uint64_t>();
    if (part_rank != rank || part_ranks != set.n_ranks || generation != set.generation)
      throw CheckpointError(fmt::format(
          "it holds rank {} of {} from checkpoint {}, the index names rank {} of {} from "
          "checkpoint {}",
          part_rank, part_ranks, generation, rank, set.n_ranks, set.generation));
    return decode_checkpoint(r.rest());
  } catch (const FormatError& e) {
    throw CheckpointError(fmt::format("'{}': damaged: {}", file.string(), e.what()));
  } catch (const CheckpointError& e) {
    throw CheckpointError(fmt::format("'{}': {}", file.string(), e.what()));
  }
}

std::optional<std::string> checkpoint_mismatch(const InputFingerprint& saved,
                                               const InputFingerprint& now,
                                               const std::filesystem::path& model_file) {
  if (saved.model != now.model)
    return fmt::format("the model file '{}' changed since the checkpoint was written",
                       model_file.string());
  for (const auto& [name, hash] : now.files) {
    auto it = std::find_if(saved.files.begin(), saved.files.end(),
                           [&](const auto& f) { return f.first == name; });
    if (it == saved.files.end())
      return fmt::format("input file '{}' was not part of the checkpointed run", name);
    if (it->second != hash)
      return fmt::format("input file '{}' changed since the checkpoint was written", name);
  }
  if (saved.files.size() != now.files.size())
    return std::string("the model reads other files than the checkpointed run did");
  return std::nullopt;
}

}  // namespace aquiledger
