#include "io/results/result_recorder.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "io/results/geotiff_fields.hpp"
#include "io/results/head_arrays.hpp"

namespace aquiledger {

namespace {

using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point start) {
  return std::chrono::duration<double>(Clock::now() - start).count();
}

WaterBudget empty_budget(std::size_t n_features) {
  WaterBudget b;
  b.features.assign(n_features, InOut{});
  return b;
}

}  // namespace

ResultRecorder::ResultRecorder(const Model& model, std::filesystem::path folder)
    : model_(model),
      folder_(std::move(folder)),
      layout_(make_system_layout(model)),
      features_(list_features(model)),
      table_layout_(budget_table_layout(model)),
      sampler_(model.grid, model.observations),
      point_sampler_(model.grid, model.subsidence_points),
      part_(GridPart::whole(model.grid)) {}

ResultRecorder::ResultRecorder(const Model& model, std::filesystem::path folder,
                               const GridPart& part, ResultReduction& reduction)
    : ResultRecorder(model, std::move(folder)) {
  part_ = part;
  reduction_ = &reduction;
}

template <class Write>
void ResultRecorder::collectively(Write&& write) {
  if (reduction_ == nullptr) return write();
  std::string error;
  try {
    write();
  } catch (const OutputError& e) {
    error = e.what();
  }
  if (reduction_->any(!error.empty())) {
    if (error.empty()) throw PeerOutputError();
    throw OutputError(error);
  }
}

void ResultRecorder::reduce(std::vector<double>& values) {
  if (reduction_ != nullptr) reduction_->sum(values);
}

void ResultRecorder::reduce(WaterBudget& b) {
  if (reduction_ != nullptr) sum_across_processes(b, *reduction_);
}

void ResultRecorder::initial_state(std::span<const double> head) {
  const auto start = Clock::now();
  initial_head_.assign(head.begin(), head.end());
  fields_ = initial_cell_fields(model_, layout_, part_, window(head));
  initial_observed_ = sampler_.sample(window(head), part_);
  reduce(initial_observed_);
  for (std::size_t k = 0; k < initial_observed_.size(); ++k)
    observation_rows_.push_back({k, 0, 0, 0.0, initial_observed_[k], 0.0});
  record_subsidence(0, 0, 0.0);
  if (model_.output.fields != FieldCadence::none) {
    write_properties();
    write_fields(0.0);
  }
  const std::vector<double>& times = model_.output.head_array_times;
  if (head_arrays_done_ < times.size() && times[head_arrays_done_] <= 0.0) {
    write_head_arrays_at(0.0, head);
    while (head_arrays_done_ < times.size() && times[head_arrays_done_] <= 0.0) ++head_arrays_done_;
  }
  flush();
  stats_.output_seconds += seconds_since(start);
}

void ResultRecorder::start_period_row(std::size_t period) {
  const Period& p = model_.periods[period];
  period_rows_.push_back({period + 1, p.name, time_, time_, empty_budget(features_.size())});
  current_period_ = period;
  period_open_ = true;
}

void ResultRecorder::step_done(const StepInfo& info, std::span<const double> head_old,
                               std::span<const double> head_new) {
  const auto start = Clock::now();
  if (!period_open_ || current_period_ != info.period) start_period_row(info.period);

  WaterBudget rates = step_budget(model_, layout_, part_, info.period, info.steady, info.dt,
                                  window(head_old), window(head_new), window(info.preconsolidation),
                                  window(info.delay_bed_elastic), window(info.delay_bed_inelastic));
  reduce(rates);
  const double imbalance = std::abs(rates.imbalance_percent());
  stats_.max_abs_imbalance_percent = std::max(stats_.max_abs_imbalance_percent, imbalance);
  const CellStateCounts counted = count_cell_states(model_, part_, window(head_new));
  std::vector<double> counts = {static_cast<double>(counted.confined),
                                static_cast<double>(counted.water_table),
                                static_cast<double>(counted.dry)};
  reduce(counts);
  stats_.steps += 1;
  stats_.newton_iterations.push_back(info.newton_iterations);
  stats_.max_newton_iterations = std::max(stats_.max_newton_iterations, info.newton_iterations);

  BudgetPeriodRow& prow = period_rows_.back();
  prow.volumes.add_scaled(rates, info.dt);
  prow.end = info.time;
  time_ = info.time;
  step_rows_.push_back(
      {info.period + 1, info.step, info.time, info.dt, std::move(rates), info.newton_iterations,
       info.cutbacks,
       CellStateCounts{std::lround(counts[0]), std::lround(counts[1]), std::lround(counts[2])}});

  // Cell fields exist only for the field files and the subsidence points; compaction
  // accumulates inside them.
  if (keeps_fields()) {
    update_cell_fields(model_, layout_, part_, info.steady, info.dt, window(initial_head_),
                       window(head_old), window(head_new), window(info.preconsolidation), fields_,
                       window(info.delay_bed_elastic), window(info.delay_bed_inelastic));
    record_subsidence(info.period + 1, info.step, info.time);
  }
  std::vector<double> observed = sampler_.sample(window(head_new), part_);
  reduce(observed);
  for (std::size_t k = 0; k < observed.size(); ++k)
    observation_rows_.push_back({k, info.period + 1, info.step, info.time, observed[k],
                                 initial_observed_[k] - observed[k]});

  if (model_.output.fields == FieldCadence::every_step) write_fields(info.time);
  // Heads at the end of the first step that reaches each chosen time (to round-off in the
  // step ends: a time equal to a period end is met by that period's last step).
  const std::vector<double>& times = model_.output.head_array_times;
  const double reach = info.time * (1.0 + 1.0e-12);
  if (head_arrays_done_ < times.size() && times[head_arrays_done_] <= reach) {
    write_head_arrays_at(info.time, head_new);
    while (head_arrays_done_ < times.size() && times[head_arrays_done_] <= reach)
      ++head_arrays_done_;
  }
  if (model_.output.head_arrays_at_period_ends) last_head_.assign(head_new.begin(), head_new.end());
  above_ = heads_above_land_surface(model_, part_, window(head_new));
  stats_.output_seconds += seconds_since(start);
  if (progress_) progress_(info);
}

void ResultRecorder::period_done(std::size_t period) {
  const auto start = Clock::now();
  if (!period_open_ || current_period_ != period) start_period_row(period);  // zero-step guard
  period_open_ = false;
  if (model_.output.fields == FieldCadence::period_end) write_fields(time_);
  if (model_.output.head_arrays_at_period_ends && !last_head_.empty())
    write_head_arrays_at(time_, last_head_);
  flush();
  stats_.output_seconds += seconds_since(start);
}

void ResultRecorder::record_subsidence(std::size_t period, int step, double time) {
  if (model_.subsidence_points.empty()) return;
  // Without interbeds the ground sinks by the aquifer's own compaction alone.
  const std::vector<double>& sunk =
      fields_.subsidence.empty() ? fields_.compaction : fields_.subsidence;
  std::vector<double> values = point_sampler_.sample(CellValues{sunk, part_.first_owned()}, part_);
  reduce(values);
  for (std::size_t k = 0; k < values.size(); ++k)
    subsidence_rows_.push_back({k, period, step, time, values[k]});
}

template <class PieceName>
std::vector<FieldPiece> ResultRecorder::rank_pieces(PieceName&& piece_name) {
  // Each rank's rows, known on every rank from the row counts.
  std::vector<double> rows(static_cast<std::size_t>(2 * reduction_->n_ranks()), 0.0);
  rows[static_cast<std::size_t>(2 * reduction_->rank())] = part_.owned.first;
  rows[static_cast<std::size_t>(2 * reduction_->rank() + 1)] = part_.owned.count;
  reduction_->sum(rows);
  std::vector<FieldPiece> pieces;
  for (int r = 0; r < reduction_->n_ranks(); ++r)
    pieces.push_back({RowBand{static_cast<int>(rows[static_cast<std::size_t>(2 * r)]),
                              static_cast<int>(rows[static_cast<std::size_t>(2 * r + 1)])},
                      piece_name(r)});
  return pieces;
}

void ResultRecorder::write_properties() {
  if (reduction_ == nullptr) return write_static_vtr(folder_ / "aquifer_properties.vtr", model_);
  // A distributed rank holds its own rows of the properties: a piece each and rank 0's index,
  // as for the field files.
  auto piece_name = [](int rank) { return fmt::format("aquifer_properties_p{:04d}.vtr", rank); };
  collectively(
      [&] { write_static_vtr(folder_ / piece_name(reduction_->rank()), model_, part_.owned); });
  const std::vector<FieldPiece> pieces = rank_pieces(piece_name);
  collectively([&] {
    if (writes_tables()) write_static_pvtr(folder_ / "aquifer_properties.pvtr", model_, pieces);
  });
}

void ResultRecorder::write_fields(double time) {
  if (reduction_ == nullptr) {
    const std::string name = fmt::format("fields_{:04d}.vtr", field_entries_.size());
    write_fields_vtr(folder_ / name, model_, fields_, time);
    if (model_.output.geotiff) {
      const std::string n = fmt::format("{:04d}.tif", field_entries_.size());
      const std::string at =
          fmt::format(" ({}) at time {} {}", model_.length_unit, time, model_.time_unit);
      write_geotiff(folder_ / ("head_" + n), model_, fields_.head, "head" + at);
      write_geotiff(folder_ / ("drawdown_" + n), model_, fields_.drawdown, "drawdown" + at);
      write_geotiff(folder_ / ("compaction_" + n), model_, fields_.compaction, "compaction" + at);
    }
    field_entries_.push_back({time, name});
    // The index names only files that are complete on disk.
    write_pvd(folder_ / "fields.pvd", field_entries_);
    stats_.field_files = static_cast<int>(field_entries_.size());
    return;
  }
  // Every piece is on disk before the rank 0 writes the index of the set and the collection.
  const std::size_t n = field_entries_.size();
  auto piece_name = [n](int rank) { return fmt::format("fields_{:04d}_p{:04d}.vtr", n, rank); };
  collectively([&] {
    write_fields_vtr(folder_ / piece_name(reduction_->rank()), model_, fields_, time, part_.owned);
  });
  const std::vector<FieldPiece> pieces = rank_pieces(piece_name);
  const std::string name = fmt::format("fields_{:04d}.pvtr", n);
  field_entries_.push_back({time, name});
  collectively([&] {
    if (!writes_tables()) return;
    write_pvtr(folder_ / name, model_, pieces);
    write_pvd(folder_ / "fields.pvd", field_entries_);
  });
  stats_.field_files = static_cast<int>(field_entries_.size());
}

void ResultRecorder::write_head_arrays_at(double time, std::span<const double> head) {
  if (reduction_ == nullptr) {
    write_head_arrays(folder_, model_, head, time);
    return;
  }
  // Each rank adds its owned rows into a whole-grid array (zero elsewhere); inactive cells
  // are blanked by the writer, so their NaN is kept out of the sum.
  std::vector<double> whole(static_cast<std::size_t>(model_.grid.n_cells()), 0.0);
  const CellValues mine = window(head);
  for (std::int32_t i = part_.first_owned(); i < part_.end_owned(); ++i)
    if (model_.grid.is_active(CellIndex{i}))
      whole[static_cast<std::size_t>(i)] = mine[static_cast<std::size_t>(i)];
  reduction_->sum(whole);
  collectively([&] {
    if (writes_tables()) write_head_arrays(folder_, model_, whole, time);
  });
}

RecorderState ResultRecorder::state() const {
  return {initial_head_,
          initial_observed_,
          fields_,
          step_rows_,
          period_rows_,
          observation_rows_,
          subsidence_rows_,
          field_entries_,
          current_period_,
          period_open_,
          time_,
          stats_,
          head_arrays_done_};
}

void ResultRecorder::restore(RecorderState s) {
  initial_head_ = std::move(s.initial_head);
  initial_observed_ = std::move(s.initial_observed);
  fields_ = std::move(s.fields);
  step_rows_ = std::move(s.step_rows);
  period_rows_ = std::move(s.period_rows);
  observation_rows_ = std::move(s.observation_rows);
  subsidence_rows_ = std::move(s.subsidence_rows);
  field_entries_ = std::move(s.field_entries);
  current_period_ = s.current_period;
  period_open_ = s.period_open;
  time_ = s.time;
  stats_ = std::move(s.stats);
  head_arrays_done_ = s.head_arrays_done;
}

HeadsAboveSurface ResultRecorder::heads_above_land_surface_at_end() {
  if (reduction_ == nullptr) return above_;
  // Every process's count and its largest excesses, each in its own slots of a sum.
  constexpr std::size_t slots = 3;
  const auto rank = static_cast<std::size_t>(reduction_->rank());
  std::vector<double> packed(1 + 2 * slots * static_cast<std::size_t>(reduction_->n_ranks()), 0.0);
  packed[0] = static_cast<double>(above_.cells);
  for (std::size_t k = 0; k < above_.worst.size() && k < slots; ++k) {
    packed[1 + 2 * (rank * slots + k)] = above_.worst[k].cell.value + 1.0;  // 0: empty slot
    packed[2 + 2 * (rank * slots + k)] = above_.worst[k].excess;
  }
  reduce(packed);
  HeadsAboveSurface all;
  all.cells = std::lround(packed[0]);
  for (std::size_t j = 1; j + 1 < packed.size(); j += 2)
    if (packed[j] > 0.0)
      all.worst.push_back({CellIndex{static_cast<std::int32_t>(packed[j]) - 1}, packed[j + 1]});
  std::sort(all.worst.begin(), all.worst.end(),
            [](const auto& a, const auto& b) { return a.excess > b.excess; });
  if (all.worst.size() > slots) all.worst.resize(slots);
  return all;
}

void ResultRecorder::flush() {
  collectively([&] {
    if (!writes_tables()) return;
    if (model_.output.budget) {
      write_budget_steps_csv(folder_ / "budget_steps.csv", table_layout_, step_rows_);
      write_budget_periods_csv(folder_ / "budget_periods.csv", table_layout_, period_rows_);
      write_balance_steps_csv(folder_ / "balance_steps.csv", step_rows_, table_layout_.clock);
      write_balance_periods_csv(folder_ / "balance_periods.csv", period_rows_, table_layout_.clock);
      write_budget_features_csv(folder_ / "budget_features.csv", features_, period_rows_,
                                table_layout_.volume_unit, table_layout_.clock);
    }
    if (!model_.observations.empty())
      write_observations_csv(folder_ / "observations.csv", model_.observations, observation_rows_,
                             table_layout_.clock);
    if (!model_.subsidence_points.empty())
      write_subsidence_csvs(folder_, model_.subsidence_points, subsidence_rows_,
                            table_layout_.clock);
  });
}

}  // namespace aquiledger
