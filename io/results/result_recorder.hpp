#pragma once
// Turns the solver's accepted steps into the result files: budgets, observations, fields and
// the run summary. Each table is rewritten whole (atomically) at every period end, so a run
// that stops early leaves complete files up to its last converged step.
#include <chrono>
#include <cstddef>
#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include "io/results/result_tables.hpp"
#include "io/results/vtk_fields.hpp"
#include "postproc/cell_fields.hpp"
#include "postproc/land_surface.hpp"
#include "postproc/observation_sampler.hpp"
#include "postproc/water_budget.hpp"
#include "solver/result_reduction.hpp"
#include "solver/simulation.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

struct RecorderStatistics {
  int steps = 0;
  int max_newton_iterations = 0;
  std::vector<int> newton_iterations;  ///< per accepted step
  double max_abs_imbalance_percent = 0.0;
  int field_files = 0;
  double output_seconds = 0.0;  ///< wall time spent computing and writing results
};

/// Everything the recorder has accumulated: enough to continue its tables after a restart
/// (io/restart/checkpoint.hpp stores it).
struct RecorderState {
  std::vector<double> initial_head;      ///< L, per grid cell
  std::vector<double> initial_observed;  ///< L, per observation
  CellFields fields;
  std::vector<BudgetStepRow> step_rows;
  std::vector<BudgetPeriodRow> period_rows;
  std::vector<ObservationRow> observation_rows;
  std::vector<SubsidenceRow> subsidence_rows;
  std::vector<FieldFileEntry> field_entries;
  std::size_t current_period = 0;
  bool period_open = false;
  double time = 0.0;  ///< T
  RecorderStatistics stats;
  std::size_t head_arrays_done = 0;  ///< of model.output.head_array_times
};

class ResultRecorder final : public SimulationObserver {
 public:
  /// folder: where results go (must exist and be writable).
  ResultRecorder(const Model& model, std::filesystem::path folder);
  /// One process of a distributed run: the heads it is given hold the part's rows (the
  /// window, from cell part.first_held()); budgets and observations are summed over every
  /// process through reduction, rank 0 writes the tables, each rank its piece of the fields
  /// (fields_NNNN_pRRRR.vtr), indexed by fields_NNNN.pvtr.
  ResultRecorder(const Model& model, std::filesystem::path folder, const GridPart& part,
                 ResultReduction& reduction);

  void initial_state(std::span<const double> head) override;
  void step_done(const StepInfo& info, std::span<const double> head_old,
                 std::span<const double> head_new) override;
  void period_done(std::size_t period) override;

  /// Writes every table as it stands (also after a failed run).
  void flush();
  /// Called after each step with a one-line progress text (for a terminal).
  void set_progress_callback(std::function<void(const StepInfo&)> callback) {
    progress_ = std::move(callback);
  }

  const std::vector<BudgetPeriodRow>& period_rows() const { return period_rows_; }
  const std::vector<FeatureRef>& features() const { return features_; }
  const RecorderStatistics& statistics() const { return stats_; }
  const std::filesystem::path& folder() const { return folder_; }
  /// A copy of what has been recorded so far.
  RecorderState state() const;
  /// Continues from a saved state instead of initial_state (nothing is written).
  void restore(RecorderState state);
  const SystemLayout& layout() const { return layout_; }
  /// Active cells whose head stood above the land surface at the end of the last step, with
  /// the largest excesses (none without a land surface). Collective in a distributed run.
  HeadsAboveSurface heads_above_land_surface_at_end();

 private:
  void write_fields(double time);
  /// Adds the subsidence at every subsidence point (from the fields) to the rows.
  void record_subsidence(std::size_t period, int step, double time);
  /// The fields are kept up to date: written, or sampled at subsidence points.
  bool keeps_fields() const {
    return model_.output.fields != FieldCadence::none || !model_.subsidence_points.empty();
  }
  /// aquifer_properties.vtr, or (distributed) each rank's piece and rank 0's .pvtr index.
  void write_properties();
  /// Every rank's owned rows with its piece's file name (collective).
  template <class PieceName>
  std::vector<FieldPiece> rank_pieces(PieceName&& piece_name);
  /// Writes the head arrays (io/results/head_arrays.hpp) of the heads at time; in a distributed run
  /// the heads are gathered and rank 0 writes.
  void write_head_arrays_at(double time, std::span<const double> head);
  void start_period_row(std::size_t period);
  bool writes_tables() const { return reduction_ == nullptr || reduction_->rank() == 0; }
  CellValues window(std::span<const double> head) const { return {head, part_.first_held()}; }
  void reduce(WaterBudget& budget);
  void reduce(std::vector<double>& values);
  /// Runs write; in a distributed run every process then learns whether any failed.
  template <class Write>
  void collectively(Write&& write);

  const Model& model_;
  std::filesystem::path folder_;
  SystemLayout layout_;
  std::vector<FeatureRef> features_;
  BudgetTableLayout table_layout_;
  ObservationSampler sampler_;
  ObservationSampler point_sampler_;  ///< of the subsidence points
  std::vector<double> initial_head_;
  std::vector<double> initial_observed_;
  CellFields fields_;
  std::vector<BudgetStepRow> step_rows_;
  std::vector<BudgetPeriodRow> period_rows_;
  std::vector<ObservationRow> observation_rows_;
  std::vector<SubsidenceRow> subsidence_rows_;
  std::vector<FieldFileEntry> field_entries_;
  std::size_t current_period_ = 0;
  bool period_open_ = false;
  double time_ = 0.0;
  RecorderStatistics stats_;
  std::size_t head_arrays_done_ = 0;
  std::vector<double> last_head_;  ///< L, of the last step (kept for head arrays at period ends)
  std::function<void(const StepInfo&)> progress_;
  HeadsAboveSurface above_;  ///< this process's cells, at the end of the last step
  GridPart part_;
  ResultReduction* reduction_ = nullptr;
};

}  // namespace aquiledger
