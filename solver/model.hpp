#pragma once
// The validated model description the solver takes. It is plain data: the reader in io/
// fills it from a TOML file, tests and benchmarks build it directly.
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "mesh/grid_part.hpp"
#include "mesh/rectilinear_grid.hpp"
#include "solver/face_conductance.hpp"
#include "solver/period_values.hpp"

namespace aquiledger {

enum class Condition { confined, water_table, switching };

/// Compressibility route inputs (Jacob, 1940): Ss = rho g (alpha + n beta). Defaults: water
/// compressibility 4.6e-10 1/Pa near 15-20 degC (from memory; handbook tables give 4.4e-10 to
/// 4.8e-10 1/Pa for 0-30 degC); density of water 998.2 kg/m3 at 20 degC (from memory; CRC
/// Handbook of Chemistry and Physics, table of water density); standard gravity 9.80665 m/s2
/// (exact by definition, 3rd CGPM, 1901).
struct Compressibility {
  double skeleton = 0.0;     ///< alpha, 1/Pa (uniform value used for reporting; per cell below)
  double porosity = 0.0;     ///< n, -
  double water = 4.6e-10;    ///< beta, 1/Pa
  double density = 998.2;    ///< rho, kg/m3
  double gravity = 9.80665;  ///< g, m/s2
};

/// Specific storage (1/m) of a cell with skeleton compressibility alpha (1/Pa) and porosity
/// n (-): Ss = rho g (alpha + n beta) (Jacob, 1940).
inline double specific_storage_per_metre(const Compressibility& c, double alpha, double n) {
  return c.density * c.gravity * (alpha + n * c.water);
}

/// The share of the elastic release that comes from compressing the skeleton,
/// alpha / (alpha + n beta) (-); the water's expansion gives the rest. 0 when both are 0.
inline double skeleton_share_of_storage(const Compressibility& c, double alpha, double n) {
  const double total = alpha + n * c.water;
  return total > 0.0 ? alpha / total : 0.0;
}

/// Thick fine-grained beds that drain slowly (delay beds): in each cell `count` beds of
/// equivalent thickness `thickness`, in which head diffuses vertically (Terzaghi, 1925), each
/// solved on a grid of `nodes` equal slices of its half-thickness (solver/delay_bed.hpp).
/// Per-cell arrays as Aquifer's; a cell with count 0 has none. docs/subsidence.md.
struct DelayBeds {
  CellArray<double> count;              ///< -, number of beds (an equivalent count, >= 0)
  CellArray<double> thickness;          ///< L, equivalent thickness of one bed
  CellArray<double> vertical_k;         ///< L/T, vertical hydraulic conductivity of the beds
  CellArray<double> elastic_storage;    ///< 1/L, Ske of the beds
  CellArray<double> inelastic_storage;  ///< 1/L, Skv of the beds
  int nodes = 10;                       ///< slices of each half-bed
  /// True when grid cell i holds delay beds.
  bool in_cell(std::size_t i) const { return count[i] > 0.0 && thickness[i] > 0.0; }
};

/// Fine-grained interbeds within the aquifer that equilibrate with the cell's head within a
/// step (no delay), and optionally delay beds. Per-cell arrays as Aquifer's;
/// docs/subsidence.md.
struct Interbeds {
  CellArray<double> thickness;          ///< L, total thickness of the beds in the cell
  CellArray<double> elastic_storage;    ///< 1/L, Ske, elastic skeletal specific storage
  CellArray<double> inelastic_storage;  ///< 1/L, Skv, inelastic skeletal specific storage
  /// L, the initial preconsolidation head per cell; empty when given as an offset below the
  /// initial head instead. A value above the initial head is lowered to it (the beds have
  /// already been at that head).
  CellArray<double> preconsolidation;
  double preconsolidation_offset = 0.0;  ///< L, >= 0, used when preconsolidation is empty
  /// Delay beds, whose nodes start from the same preconsolidation head as the cell's beds.
  std::optional<DelayBeds> delay;
};

/// The initial preconsolidation head of cell i (L) given its initial head (L).
inline double initial_preconsolidation(const Interbeds& ib, std::size_t i, double initial_head) {
  const double pc = ib.preconsolidation.empty() ? initial_head - ib.preconsolidation_offset
                                                : ib.preconsolidation[i];
  return pc < initial_head ? pc : initial_head;
}

struct Aquifer {
  Condition condition = Condition::confined;
  /// Per-cell arrays in raster order (inactive cells included), indexed by grid cell: every
  /// cell of the grid, or (a distributed rank) the rows of its window only (CellArray).
  CellArray<double> top;               ///< L; NaN where absent (water_table without top)
  CellArray<double> bottom;            ///< L
  CellArray<double> kx;                ///< L/T, hydraulic conductivity along x
  CellArray<double> ky;                ///< L/T, kx * k_ratio
  CellArray<double> specific_yield;    ///< -, empty when confined
  CellArray<double> specific_storage;  ///< 1/L, total elastic storage, every route
  /// Share of the elastic storage from skeleton compression, alpha / (alpha + n beta);
  /// filled only on the compressibility route (then the budget splits skeleton and water).
  CellArray<double> skeleton_share;
  /// L; ground elevation, empty when the model gives none (reports and warnings only:
  /// heads above it mean flooding or flowing artesian conditions).
  CellArray<double> land_surface;
  std::optional<Compressibility> compressibility;  ///< set on the compressibility route
  std::optional<Interbeds> interbeds;              ///< set when the model has interbeds
  bool elastic_split() const { return !skeleton_share.empty(); }
};

struct Initial {
  bool steady = false;     ///< start from the steady state of period 1's stresses
  CellArray<double> head;  ///< L, per cell as Aquifer's arrays (empty when steady)
};

struct Period {
  std::string name;
  double length = 1.0;  ///< T
  int steps = 1;
  double growth = 1.0;  ///< ratio of consecutive step lengths
  bool steady = false;
};

/// Values of a feature are indexed by the position of the cell in `cells`.
struct Well {
  std::string name;
  double x = 0.0, y = 0.0;  ///< L
  CellIndex cell;
  PeriodValues rate;  ///< L3/T, positive = withdrawal
};

struct FixedHead {
  std::string name;
  std::vector<CellIndex> cells;
  PeriodValues head;  ///< L
};

struct Recharge {
  std::string name;
  std::vector<CellIndex> cells;  ///< mask cells, or every active cell
  PeriodValues rate;             ///< L/T over the cell area; negative = withdrawal
};

struct River {
  std::string name;
  std::vector<CellIndex> cells;
  std::vector<double> length;  ///< L of channel in each cell (1 per cell for cells/mask placement)
  PeriodValues stage;          ///< L
  PeriodValues bed_bottom;     ///< L
  PeriodValues conductance;    ///< L2/T per cell (per-length conductance times length)
};

struct Drain {
  std::string name;
  std::vector<CellIndex> cells;
  PeriodValues elevation;    ///< L
  PeriodValues conductance;  ///< L2/T per cell
};

struct ExternalHead {
  std::string name;
  std::vector<CellIndex> cells;
  PeriodValues head;         ///< L
  PeriodValues conductance;  ///< L2/T per cell
};

struct Evapotranspiration {
  std::string name;
  std::vector<CellIndex> cells;
  PeriodValues surface;           ///< L
  PeriodValues max_rate;          ///< L/T
  PeriodValues extinction_depth;  ///< L
};

struct Leakage {
  std::string name = "leakage";
  std::vector<CellIndex> cells;  ///< every active cell
  PeriodValues source_head;      ///< L
  PeriodValues leakance;         ///< 1/T (aquitard k / thickness)
};

struct MeasuredHead {
  double time = 0.0;  ///< T
  double head = 0.0;  ///< L
};

struct Observation {
  std::string name;
  double x = 0.0, y = 0.0;  ///< L
  CellIndex cell;
  std::filesystem::path measured_file;  ///< empty when none
  std::vector<MeasuredHead> measured;
};

enum class FieldCadence { every_step, period_end, none };

struct OutputSettings {
  std::filesystem::path folder = "results";  ///< absolute, or relative to the model file
  FieldCadence fields = FieldCadence::period_end;
  bool budget = true;
  /// Times (T, ascending) at which heads are written as arrays a model can start from: at
  /// the end of the first step that reaches each (0: the initial heads).
  std::vector<double> head_array_times;
  bool head_arrays_at_period_ends = false;  ///< also at the end of every period
  /// Head, drawdown and compaction also as GeoTIFF at the field output times (uniform grids).
  bool geotiff = false;
};

enum class LinearChoice { automatic, direct, pcg, bicgstab, multigrid };

struct SolverSettings {
  LinearChoice linear = LinearChoice::automatic;
  double head_tolerance = 1.0e-5;  ///< L
  double flow_tolerance = 1.0e-6;  ///< -, largest cell imbalance over total throughflow
  int max_iterations = 50;
  int max_cutbacks = 5;
  int threads = 0;  ///< 0 = all cores
  /// Saturated thickness of faces between water-table or dewatered switching cells.
  FaceThickness face_thickness = FaceThickness::mean;
  /// NewtonSettings::limit_at_withdrawal_inflection; not a model-file key (always on there),
  /// switched off only by benchmarks and tests that measure it.
  bool limit_at_withdrawal_inflection = true;
  /// NewtonSettings::stop_on_contraction_estimate; not a model-file key either (always on
  /// there), switched off only by benchmarks and tests that measure it.
  bool stop_on_contraction_estimate = true;
};

/// Zone numbers of an aquifer property given as { zones, values }, kept for reports.
struct ZoneMap {
  std::string key;        ///< the property, e.g. "k" or "specific_yield"
  std::vector<int> zone;  ///< per grid cell; 0 where no zone applies
};

struct Model {
  std::filesystem::path source_file;  ///< the model file, for messages
  std::string title;
  std::string length_unit = "m";
  std::string time_unit = "d";
  /// Calendar time of model time 0, seconds since 1970-01-01T00:00:00 (proleptic Gregorian,
  /// no time zone), when [model] gives start_date; outputs then carry dates beside times.
  std::optional<double> start_date;
  /// EPSG code of the coordinate system of x and y ([grid].epsg), when given: rasters read are
  /// checked against it and GeoTIFF outputs carry it.
  std::optional<int> epsg;
  RectilinearGrid grid;
  Aquifer aquifer;
  Initial initial;
  std::vector<Period> periods;
  std::vector<Well> wells;
  std::vector<FixedHead> fixed_heads;
  std::vector<Recharge> recharges;
  std::vector<River> rivers;
  std::vector<Drain> drains;
  std::vector<ExternalHead> external_heads;
  std::vector<Evapotranspiration> evapotranspiration;
  std::optional<Leakage> leakage;
  std::vector<Observation> observations;
  /// [[subsidence_point]]: points where the sinking of the ground is followed through the run
  /// (as an extensometer or a levelled benchmark would; docs/subsidence.md). Placed as bores
  /// are; their measured values are subsidence (L, positive = the ground has sunk since time
  /// 0), held in MeasuredHead::head.
  std::vector<Observation> subsidence_points;
  OutputSettings output;
  SolverSettings solver;
  /// Set when the reader kept one band of rows of the per-cell inputs (a distributed rank):
  /// the rank's rows (owned) and the rows its per-cell arrays hold (window: with the ghost
  /// rows). Unset: every array holds the whole grid.
  std::optional<GridPart> band;
  std::vector<ZoneMap> zone_maps;     ///< aquifer properties given by zones (reports only)
  std::vector<std::string> warnings;  ///< from the reader's plausibility checks
  /// Every other file the model was read from (array, zone and measured-head files), sorted;
  /// checkpoints fingerprint them with the model file.
  std::vector<std::filesystem::path> input_files;
};

}  // namespace aquiledger
