#include "io/result_recorder.hpp"

#include <cmath>

#include <fmt/format.h>

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
      sampler_(model.grid, model.observations) {}

void ResultRecorder::initial_state(std::span<const double> head) {
  const auto start = Clock::now();
  initial_head_.assign(head.begin(), head.end());
  fields_ = initial_cell_fields(model_, layout_, head);
  initial_observed_ = sampler_.sample(head);
  for (std::size_t k = 0; k < initial_observed_.size(); ++k)
    observation_rows_.push_back({k, 0, 0, 0.0, initial_observed_[k], 0.0});
  BudgetStepRow row{0, 0, 0.0, 0.0, empty_budget(features_.size())};
  step_rows_.push_back(std::move(row));
  if (model_.output.fields != FieldCadence::none) {
    write_static_vtr(folder_ / "aquifer_properties.vtr", model_);
    write_fields(0.0);
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

  WaterBudget rates =
      step_budget(model_, layout_, info.period, info.steady, info.dt, head_old, head_new);
  const double discrepancy = std::abs(rates.discrepancy_percent());
  stats_.max_abs_discrepancy_percent = std::max(stats_.max_abs_discrepancy_percent, discrepancy);
  stats_.steps += 1;
  stats_.newton_iterations.push_back(info.newton_iterations);
  stats_.max_newton_iterations = std::max(stats_.max_newton_iterations, info.newton_iterations);

  BudgetPeriodRow& prow = period_rows_.back();
  prow.volumes.add_scaled(rates, info.dt);
  prow.end = info.time;
  time_ = info.time;
  step_rows_.push_back({info.period + 1, info.step, info.time, info.dt, std::move(rates)});

  // Cell fields exist only for the field files; compaction accumulates inside them.
  if (model_.output.fields != FieldCadence::none)
    update_cell_fields(model_, layout_, info.steady, info.dt, initial_head_, head_old, head_new,
                       fields_);
  const std::vector<double> observed = sampler_.sample(head_new);
  for (std::size_t k = 0; k < observed.size(); ++k)
    observation_rows_.push_back(
        {k, info.period + 1, info.step, info.time, observed[k], initial_observed_[k] - observed[k]});

  if (model_.output.fields == FieldCadence::every_step) write_fields(info.time);
  stats_.output_seconds += seconds_since(start);
  if (progress_) progress_(info);
}

void ResultRecorder::period_done(std::size_t period) {
  const auto start = Clock::now();
  if (!period_open_ || current_period_ != period) start_period_row(period);  // zero-step guard
  period_open_ = false;
  if (model_.output.fields == FieldCadence::period_end) write_fields(time_);
  flush();
  stats_.output_seconds += seconds_since(start);
}

void ResultRecorder::write_fields(double time) {
  const std::string name = fmt::format("fields_{:04d}.vtr", field_entries_.size());
  write_fields_vtr(folder_ / name, model_, fields_, time);
  field_entries_.push_back({time, name});
  // The index names only files that are complete on disk.
  write_pvd(folder_ / "fields.pvd", field_entries_);
  stats_.field_files = static_cast<int>(field_entries_.size());
}

RecorderState ResultRecorder::state() const {
  return {initial_head_, initial_observed_, fields_,        step_rows_, period_rows_,
          observation_rows_, field_entries_, current_period_, period_open_, time_,
          stats_};
}

void ResultRecorder::restore(RecorderState s) {
  initial_head_ = std::move(s.initial_head);
  initial_observed_ = std::move(s.initial_observed);
  fields_ = std::move(s.fields);
  step_rows_ = std::move(s.step_rows);
  period_rows_ = std::move(s.period_rows);
  observation_rows_ = std::move(s.observation_rows);
  field_entries_ = std::move(s.field_entries);
  current_period_ = s.current_period;
  period_open_ = s.period_open;
  time_ = s.time;
  stats_ = std::move(s.stats);
}

void ResultRecorder::flush() {
  if (model_.output.budget) {
    write_budget_steps_csv(folder_ / "budget_steps.csv", step_rows_);
    write_budget_periods_csv(folder_ / "budget_periods.csv", period_rows_);
    write_budget_features_csv(folder_ / "budget_features.csv", features_, period_rows_);
  }
  if (!model_.observations.empty())
    write_observations_csv(folder_ / "observations.csv", model_.observations, observation_rows_);
}

}  // namespace aquiledger
