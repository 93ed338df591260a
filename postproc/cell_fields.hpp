#pragma once
#include <span>
#include <vector>

#include "solver/model.hpp"
#include "solver/system_layout.hpp"

namespace aquiledger {

/// The cell arrays written for viewers, per grid cell in raster order, NaN where inactive
/// (of the whole grid, or of the cells a GridPart owns).
struct CellFields {
  std::vector<double> head;                   ///< L
  std::vector<double> drawdown;               ///< L, initial head minus head
  std::vector<double> saturated_thickness;    ///< L
  std::vector<double> state;                  ///< 0 dry, 1 water table, 2 confined
  std::vector<double> storage_rate;           ///< L3/T, positive = released from storage
  std::vector<double> storage_skeleton_rate;  ///< L3/T
  std::vector<double> storage_water_rate;     ///< L3/T
  std::vector<double> storage_elastic_rate;   ///< L3/T, used when no compressibilities given
  std::vector<double> storage_drainage_rate;  ///< L3/T
  std::vector<double> compaction;             ///< L, cumulative since the start
  std::vector<double> flow_east;              ///< L3/T across the east face, positive east
  std::vector<double> flow_north;             ///< L3/T across the north face, positive north
  std::vector<double> depth_to_water;         ///< L, land surface minus head; empty without one
  /// With [interbeds] only (empty otherwise; docs/subsidence.md):
  std::vector<double> interbed_elastic_compaction;    ///< L, cumulative, recoverable
  std::vector<double> interbed_inelastic_compaction;  ///< L, cumulative, permanent
  std::vector<double> subsidence;                     ///< L, compaction plus both interbed parts
  std::vector<double> preconsolidation_head;          ///< L, the lowest head the beds have known
};

/// How many active cells are in each state (the `state` field's classes) at one time.
struct CellStateCounts {
  long confined = 0;
  long water_table = 0;
  long dry = 0;
};

/// The state of an active cell at head h (L): 0 dry (h at or below the bottom), 1 water
/// table, 2 confined (a confined model is confined everywhere; a switching cell is confined
/// once h reaches the top).
int cell_state(const Model& model, CellIndex c, double h);

/// Counts the states of the active cells a part owns (head holds them).
CellStateCounts count_cell_states(const Model& model, const GridPart& part, CellValues head);

/// Starts the fields at time 0 from the initial head (zero rates, zero compaction).
CellFields initial_cell_fields(const Model& model, const SystemLayout& layout,
                               std::span<const double> initial_head);

/// Updates the fields for an accepted step; compaction accumulates.
void update_cell_fields(const Model& model, const SystemLayout& layout, bool steady, double dt,
                        std::span<const double> initial_head, std::span<const double> head_old,
                        std::span<const double> head_new, CellFields& fields,
                        std::span<const double> preconsolidation = {},
                        std::span<const double> delay_elastic = {},
                        std::span<const double> delay_inelastic = {});

/// As above for the cells a part owns (the heads must hold them and their neighbours).
CellFields initial_cell_fields(const Model& model, const SystemLayout& layout, const GridPart& part,
                               CellValues initial_head);
/// preconsolidation: the interbeds' preconsolidation heads at the step start
/// (StepInfo::preconsolidation; empty without interbeds). delay_elastic, delay_inelastic: the
/// delay beds' release over the step (StepInfo::delay_bed_elastic and _inelastic, L per unit
/// area), added to the interbeds' elastic and inelastic compaction and the storage rate.
void update_cell_fields(const Model& model, const SystemLayout& layout, const GridPart& part,
                        bool steady, double dt, CellValues initial_head, CellValues head_old,
                        CellValues head_new, CellValues preconsolidation, CellFields& fields,
                        CellValues delay_elastic = std::span<const double>(),
                        CellValues delay_inelastic = std::span<const double>());

}  // namespace aquiledger
