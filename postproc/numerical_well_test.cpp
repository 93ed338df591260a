#include "postproc/numerical_well_test.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <sstream>
#include <stdexcept>
#include <string_view>

#include "mesh/well_centred_grid.hpp"
#include "postproc/parameter_estimation.hpp"
#include "solver/simulation.hpp"

namespace aquiledger {
namespace {

enum class NumericalAquiferKind { confined, switching, water_table };

NumericalAquiferKind numerical_aquifer_kind(const PumpingTest& test) {
  if (!test.aquifer) return NumericalAquiferKind::confined;
  return test.aquifer->starts_confined() ? NumericalAquiferKind::switching
                                         : NumericalAquiferKind::water_table;
}

/// T since the start of pumping of the last drawdown measured after it began.
double numerical_test_length(const PumpingTest& test) {
  const double t0 = test.schedule.front().start;
  double last = 0.0;
  for (const ObservationSeries& w : test.wells)
    for (std::size_t i = 0; i < w.times.size(); ++i)
      if (w.times[i] > t0 && std::isfinite(w.drawdowns[i])) last = std::max(last, w.times[i] - t0);
  return last;
}

/// The first time (T, since the start of the test) of any well inside (from, to]; +inf if none.
double first_time_within(const PumpingTest& test, double from, double to) {
  double first = std::numeric_limits<double>::infinity();
  for (const ObservationSeries& w : test.wells)
    for (double t : w.times)
      if (t > from && t <= to) first = std::min(first, t);
  return first;
}

/// The storage that sets how far the cone spreads early on: S when the aquifer is (first)
/// confined, Sy for a water-table aquifer (p in numerical_parameter_names' order).
double spreading_storage(const std::vector<double>& p) { return p[1]; }

/// The place of `name` in numerical_parameter_names' order; names.size() when absent.
std::size_t numerical_parameter_place(const std::vector<std::string>& names,
                                      std::string_view name) {
  return static_cast<std::size_t>(std::find(names.begin(), names.end(), name) - names.begin());
}

/// -, how much faster the cone spreads beyond a zone line than on the well's side: the larger
/// ratio of the diffusivities T / S (1 without a zone line, or a slower zone beyond it).
double zone_diffusivity_ratio(const PumpingTest& test, const std::vector<double>& p) {
  const std::vector<std::string> names = numerical_parameter_names(test);
  const std::size_t z0 = numerical_parameter_place(names, "transmissivity_beyond");
  if (z0 == names.size()) return 1.0;
  return std::max(1.0, (p[z0] / p[z0 + 1]) / (p[0] / spreading_storage(p)));
}

/// sqrt(2.25 T t / S) (L): the radius where the Cooper and Jacob (1946) line reaches zero.
double radius_of_influence(double transmissivity, double storage, double time) {
  return std::sqrt(2.25 * transmissivity * time / storage);
}

/// Every grid cell in ascending order (the quarter grid has no inactive cells).
std::vector<int> every_numerical_cell(const Model& model) {
  std::vector<int> cells(static_cast<std::size_t>(model.grid.n_cells()));
  for (std::size_t i = 0; i < cells.size(); ++i) cells[i] = static_cast<int>(i);
  return cells;
}

/// A set-up with the same parameters whose targets are each well's drawdowns at `times`
/// (per well, T since pumping began).
EstimationSetup numerical_setup_at(const EstimationSetup& fit_setup, const PumpingTest& test,
                                   const std::vector<std::vector<double>>& times) {
  EstimationSetup s;
  s.parameters = fit_setup.parameters;
  for (std::size_t w = 0; w < test.wells.size(); ++w) {
    EstimationTarget t;
    t.name = test.wells[w].name;
    t.kind = TargetKind::drawdown;
    t.bore = w;
    t.times = times[w];
    t.values.assign(t.times.size(), 0.0);
    t.weights.assign(t.times.size(), 1.0);
    s.targets.push_back(std::move(t));
  }
  return s;
}

/// The storage of the pumped well's casing (Papadopulos and Cooper, 1967): the water level in
/// a casing of radius r_c (L) falls with the aquifer's head at the well, so the well's cell
/// stores pi r_c^2 more per unit head; the built cell its share (a quarter in a quarter grid).
/// Added to the cell's elastic storage (Ss times the thickness b, over the cell's area A) and, for
/// water-table and switching cells, to its specific yield, so that it acts at every head.
void add_numerical_casing_storage(Model& m, CellIndex well_cell, double share, double casing_radius,
                                  double thickness) {
  const auto c = static_cast<std::size_t>(well_cell.value);
  const double per_area =
      share * std::numbers::pi * casing_radius * casing_radius / m.grid.area(well_cell);
  if (m.aquifer.condition != Condition::water_table)
    m.aquifer.specific_storage[c] += per_area / thickness;
  if (!m.aquifer.specific_yield.empty()) m.aquifer.specific_yield[c] += per_area;
}

/// Keeps the head of the last step.
class NumericalLastHead final : public SimulationObserver {
 public:
  std::vector<double> head;
  void initial_state(std::span<const double>) override {}
  void step_done(const StepInfo&, std::span<const double>, std::span<const double> h) override {
    head.assign(h.begin(), h.end());
  }
  void period_done(std::size_t) override {}
};

/// Leakage through a confining bed of leakance K' / b' (1/T) from a source bed whose head
/// stays at `source_head` (L): an exchange leakance A (source_head - h) per cell of area A
/// (Hantush and Jacob, 1955), as one external head over every cell.
void add_numerical_leakage(Model& m, double source_head, double leakance) {
  ExternalHead e;
  e.name = "leaky confining bed";
  std::vector<double> conductance;
  for (int c = 0; c < m.grid.n_cells(); ++c) {
    e.cells.push_back(CellIndex{c});
    conductance.push_back(leakance * m.grid.area(CellIndex{c}));
  }
  e.head = PeriodValues(source_head);
  e.conductance = PeriodValues({std::move(conductance)}, {});
  m.external_heads.push_back(std::move(e));
}

/// The grid's frame: x points along the bearing of the first line's perpendicular (north when
/// there is no line), y 90 degrees anticlockwise from x. A direction at bearing b (degrees
/// clockwise from north) has the angle -(b - frame) anticlockwise from x.
double numerical_frame_bearing(const PumpingTest& test) {
  return test.lines.empty() ? 0.0 : test.lines.front().bearing;
}

/// The grid side (GridSideIndex) a line's perpendicular points to; throws for a line neither
/// parallel nor perpendicular to the first.
int numerical_line_side(const PumpingTest& test, const TestLine& line) {
  const double turns = (line.bearing - numerical_frame_bearing(test)) / 90.0;
  const double k = std::round(turns);
  if (std::abs(turns - k) > 1e-9)
    throw std::invalid_argument(
        "numerical: straight lines must be parallel or perpendicular to each other (bearings "
        "differing by a multiple of 90 degrees)");
  // Clockwise quarter turns from x: 1 is -y (south), 2 is -x (west), 3 is +y (north).
  static constexpr int side_of_turns[4] = {grid_east, grid_south, grid_west, grid_north};
  return side_of_turns[((static_cast<int>(k) % 4) + 4) % 4];
}

/// The well's position (L) in the grid frame: (distance, 0) without a bearing.
std::pair<double, double> numerical_well_position(const PumpingTest& test,
                                                  const ObservationSeries& w) {
  if (!w.bearing) {
    if (!test.lines.empty())
      throw std::invalid_argument("numerical: well \"" + w.name +
                                  "\" needs a bearing when the test has straight lines");
    return {w.distance, 0.0};
  }
  const double a = -(*w.bearing - numerical_frame_bearing(test)) * std::numbers::pi / 180.0;
  const double x = w.distance * std::cos(a), y = w.distance * std::sin(a);
  // Exactly on an axis when the bearing is (cos of a right angle is 6e-17, not 0).
  return {std::abs(x) < 1e-12 * w.distance ? 0.0 : x, std::abs(y) < 1e-12 * w.distance ? 0.0 : y};
}

/// The zone line, if any: its side and distance.
struct NumericalZoneLine {
  int side = -1;
  double distance = 0.0;
};
NumericalZoneLine numerical_zone_line(const PumpingTest& test) {
  NumericalZoneLine z;
  for (const TestLine& line : test.lines)
    if (line.kind == TestLineKind::zone) {
      if (z.side >= 0)
        throw std::invalid_argument("numerical: at most one zone line is represented");
      z = {numerical_line_side(test, line), line.distance};
    }
  return z;
}

/// True when the cell's centre lies beyond the zone line (in the second zone).
bool numerical_cell_beyond_zone(const RectilinearGrid& grid, const NumericalZoneLine& zone,
                                int cell) {
  if (zone.side < 0) return false;
  const RowCol rc = grid.row_col(CellIndex{cell});
  const double x = grid.x_center(rc.col), y = grid.y_center(rc.row);
  switch (zone.side) {
    case grid_east:
      return x > zone.distance;
    case grid_west:
      return x < -zone.distance;
    case grid_north:
      return y > zone.distance;
    default:
      return y < -zone.distance;
  }
}

/// The grid of the test: the wells' positions as centres, each line on its side, an axis
/// mirrored (a line of symmetry) where its two sides end alike and hold the same zone line.
WellCentredGrid numerical_test_grid(const PumpingTest& test, double inner, double growth,
                                    double extent) {
  WellCentredGridSpec spec;
  spec.inner = inner;
  spec.growth = growth;
  spec.extent = extent;
  for (const TestLine& line : test.lines) {
    GridSide& side = spec.sides[static_cast<std::size_t>(numerical_line_side(test, line))];
    if (line.kind == TestLineKind::zone) {
      side.faces.push_back(line.distance);
      continue;
    }
    if (side.end != GridSideEnd::far)
      throw std::invalid_argument(
          "numerical: two parallel boundaries on the same side of the pumped well");
    side.end = line.kind == TestLineKind::barrier ? GridSideEnd::barrier : GridSideEnd::recharge;
    side.end_distance = line.distance;
  }
  const auto alike = [](const GridSide& a, const GridSide& b) {
    return a.end == b.end && a.end_distance == b.end_distance && a.faces == b.faces;
  };
  spec.mirror_west = alike(spec.sides[grid_east], spec.sides[grid_west]);
  spec.mirror_south = alike(spec.sides[grid_north], spec.sides[grid_south]);
  for (const ObservationSeries& w : test.wells) {
    auto [x, y] = numerical_well_position(test, w);
    if (spec.mirror_west) x = std::abs(x);
    if (spec.mirror_south) y = std::abs(y);
    if (x != 0.0) spec.sides[x > 0.0 ? grid_east : grid_west].anchors.push_back(std::abs(x));
    if (y != 0.0) spec.sides[y > 0.0 ? grid_north : grid_south].anchors.push_back(std::abs(y));
  }
  return well_centred_grid(spec);
}

/// L, how far the grid reaches from the well on its nearest far side (+inf when every side
/// ends on a boundary).
double numerical_far_reach(const RectilinearGrid& g, const PumpingTest& test) {
  std::array<bool, 4> bounded{};
  for (const TestLine& line : test.lines)
    if (line.kind != TestLineKind::zone)
      bounded[static_cast<std::size_t>(numerical_line_side(test, line))] = true;
  const double reach[4] = {g.x_max(), g.y_max(), -g.x_min(), -g.y_min()};
  double r = std::numeric_limits<double>::infinity();
  for (int s = 0; s < 4; ++s)
    if (!bounded[static_cast<std::size_t>(s)] && reach[s] > 0.0) r = std::min(r, reach[s]);
  return r;
}

}  // namespace

/// The radius (L) whose head the well's cell holds on `geometry`'s grid. A square cell among
/// equal ones holds that of 0.198 of its width (Peaceman, 1978, from memory, found so by
/// numerical experiment); among the widths growing away from the well it is less (measured in
/// docs/pumping-tests.md, "Well-bore storage"). Measured here as Peaceman did: a steady
/// solve with the well's sink (its share of a unit rate, T = 1) and the far edges held, and
/// Thiem's (1906) s(r_eq) - s(r) = Q / (2 pi T) ln(r / r_eq) to the first cell along the
/// well's row at least 5 well's-cell widths out. The far edges, at least 2 extents of the
/// test away, add a term of order (r / extent)^2 to that difference, negligible.
double numerical_well_cell_radius(const WellCentredGrid& geometry, double inner) {
  Model m;
  m.grid = geometry.grid;
  const auto n = static_cast<std::size_t>(m.grid.n_cells());
  Aquifer& a = m.aquifer;
  a.condition = Condition::confined;
  a.top.assign(n, 0.0);
  a.bottom.assign(n, -1.0);
  a.specific_storage.assign(n, 0.0);
  a.kx.assign(n, 0.0);
  a.ky.assign(n, 0.0);
  std::vector<CellIndex> edge;
  const int rows = m.grid.n_rows(), cols = m.grid.n_cols();
  for (int row = 0; row < rows; ++row)
    for (int col = 0; col < cols; ++col) {
      const auto c = static_cast<std::size_t>(m.grid.cell(row, col).value);
      a.kx[c] = geometry.x_factor[static_cast<std::size_t>(col)];
      a.ky[c] = geometry.y_factor[static_cast<std::size_t>(row)];
      // The built edges; an edge on a line of symmetry (through the well's row or column,
      // the grid then starting at 0) stays closed.
      const bool edge_col =
          (col == 0 || col == cols - 1) && !(m.grid.x_min() == 0.0 && col == geometry.well_col);
      const bool edge_row =
          (row == 0 || row == rows - 1) && !(m.grid.y_min() == 0.0 && row == geometry.well_row);
      if (edge_col || edge_row) edge.push_back(m.grid.cell(row, col));
    }
  m.initial.head.assign(n, 0.0);
  m.periods.push_back(Period{"well's cell radius", 1.0, 1, 1.0, true});
  const CellIndex well_cell = m.grid.cell(geometry.well_row, geometry.well_col);
  m.wells.push_back(Well{"pumped well", 0.0, 0.0, well_cell,
                         PeriodValues(std::vector<std::vector<double>>{{geometry.rate_share}},
                                      std::vector<std::uint32_t>{0})});
  m.fixed_heads.push_back(FixedHead{"far edges", std::move(edge), PeriodValues(0.0)});
  m.output.fields = FieldCadence::none;
  m.output.budget = false;
  m.solver.threads = 1;
  NumericalLastHead last;
  const RunResult run = run_simulation(m, last);
  int col = geometry.well_col + 1;
  const double x_well = 0.0;  // the well lies at the origin
  while (col < cols - 1 && m.grid.x_center(col) - x_well < 5.0 * inner) ++col;
  const double r = m.grid.x_center(col) - x_well;
  if (!run.converged || last.head.empty() || col == cols - 1 || !(r > 0.0))
    throw std::logic_error("numerical: the well's cell radius could not be measured");
  const double drop =
      last.head[static_cast<std::size_t>(m.grid.cell(geometry.well_row, col).value)] -
      last.head[static_cast<std::size_t>(well_cell.value)];
  return r * std::exp(-2.0 * std::numbers::pi * drop);
}

std::vector<std::string> numerical_parameter_names(const PumpingTest& test) {
  std::vector<std::string> names;
  switch (numerical_aquifer_kind(test)) {
    case NumericalAquiferKind::confined:
      names = {"transmissivity", "storativity"};
      break;
    case NumericalAquiferKind::switching:
      names = {"transmissivity", "storativity", "specific_yield"};
      break;
    case NumericalAquiferKind::water_table:
      names = {"transmissivity", "specific_yield"};
      break;
  }
  // A zone line: T and the spreading storage beyond it (Sy of a switching aquifer is shared).
  for (const TestLine& line : test.lines)
    if (line.kind == TestLineKind::zone) {
      const std::string storage = names[1];
      names.push_back("transmissivity_beyond");
      names.push_back(storage + "_beyond");
      break;
    }
  if (test.leakance && test.leakance->fitted) names.emplace_back("leakance");
  return names;
}

bool numerical_casing_storage(const PumpingTest& test) { return test.pumped_well.casing > 0.0; }

Model numerical_test_model(const PumpingTest& test, const std::vector<double>& p,
                           double grid_transmissivity, double grid_storativity,
                           const NumericalTestSettings& settings) {
  const NumericalAquiferKind kind = numerical_aquifer_kind(test);
  if (p.size() != numerical_parameter_names(test).size())
    throw std::invalid_argument("numerical: wrong number of parameters");
  if (test.schedule.empty() || test.wells.empty())
    throw std::invalid_argument("numerical: the test needs a rate schedule and a well");
  const double t0 = test.schedule.front().start;
  const double length = numerical_test_length(test);
  if (!(length > 0.0)) throw std::invalid_argument("numerical: no drawdown after pumping began");
  double r_min = std::numeric_limits<double>::infinity(), r_max = 0.0;
  for (const ObservationSeries& w : test.wells) {
    if (!w.images.empty())
      throw std::invalid_argument("numerical: well \"" + w.name +
                                  "\" has a straight boundary (image_distance), which the "
                                  "numerical model takes as a [[boundary]] table instead");
    r_min = std::min(r_min, w.distance);
    r_max = std::max(r_max, w.distance);
  }
  const NumericalZoneLine zone = numerical_zone_line(test);
  const std::vector<std::string> names = numerical_parameter_names(test);
  const std::size_t z0 = numerical_parameter_place(names, "transmissivity_beyond");
  const double extent =
      std::max(settings.extent_factor *
                   radius_of_influence(grid_transmissivity * zone_diffusivity_ratio(test, p),
                                       grid_storativity, length),
               2.0 * r_max);
  // With the casing's storage the well's cell stands for the well: a square cell's head is
  // that of a radius 0.198 of its width (Peaceman, 1978, SPE J. 18(3), from memory), set to
  // r_w, so the casing's level follows the aquifer's head at r_w.
  double inner = numerical_casing_storage(test) ? test.pumped_well.well / 0.198
                                                : settings.inner_fraction * r_min;
  WellCentredGrid geometry = numerical_test_grid(test, inner, settings.width_growth, extent);
  if (numerical_casing_storage(test))
    for (int pass = 0; pass < 2; ++pass) {  // measured: 3.8 % then 0.5 % from r_w, then 0.05 %
      inner *= test.pumped_well.well / numerical_well_cell_radius(geometry, inner);
      geometry = numerical_test_grid(test, inner, settings.width_growth, extent);
    }

  Model m;
  m.title =
      "numerical model of " + (test.title.empty() ? std::string("a pumping test") : test.title);
  m.length_unit = test.length_unit;
  m.time_unit = test.time_unit;
  m.grid = geometry.grid;
  const auto n = static_cast<std::size_t>(m.grid.n_cells());
  Aquifer& a = m.aquifer;
  double top = 0.0, bottom = -1.0, head = 0.0;  // confined: a unit thickness, K = T, Ss = S
  if (test.aquifer) {
    top = test.aquifer->has_top ? test.aquifer->top : std::nan("");
    bottom = test.aquifer->bottom;
    head = test.aquifer->static_level;
  }
  const double thickness = test.aquifer ? test.aquifer->thickness() : 1.0;
  a.condition = kind == NumericalAquiferKind::confined    ? Condition::confined
                : kind == NumericalAquiferKind::switching ? Condition::switching
                                                          : Condition::water_table;
  a.top.assign(n, top);
  a.bottom.assign(n, bottom);
  a.kx.assign(n, 0.0);
  a.ky.assign(n, 0.0);
  a.specific_storage.assign(n, 0.0);
  if (kind != NumericalAquiferKind::confined)
    a.specific_yield.assign(n, p[numerical_parameter_place(names, "specific_yield")]);
  for (int row = 0; row < m.grid.n_rows(); ++row)
    for (int col = 0; col < m.grid.n_cols(); ++col) {
      const int cell = m.grid.cell(row, col).value;
      const auto c = static_cast<std::size_t>(cell);
      const bool beyond = numerical_cell_beyond_zone(m.grid, zone, cell);
      const double k = (beyond ? p[z0] : p[0]) / thickness;
      const double storage = beyond ? p[z0 + 1] : p[1];
      a.kx[c] = k * geometry.x_factor[static_cast<std::size_t>(col)];
      a.ky[c] = k * geometry.y_factor[static_cast<std::size_t>(row)];
      if (kind == NumericalAquiferKind::water_table)
        a.specific_yield[c] = storage;
      else
        a.specific_storage[c] = storage / thickness;
    }
  m.initial.head.assign(n, head);
  const CellIndex well_cell = m.grid.cell(geometry.well_row, geometry.well_col);
  if (numerical_casing_storage(test))
    add_numerical_casing_storage(m, well_cell, geometry.rate_share, test.pumped_well.casing,
                                 thickness);
  if (test.leakance)
    add_numerical_leakage(m, head,
                          test.leakance->fitted ? p[numerical_parameter_place(names, "leakance")]
                                                : test.leakance->value);

  // One stress period per rate step that begins before the last drawdown.
  std::vector<std::vector<double>> rates;
  std::vector<std::uint32_t> table_of_period;
  for (std::size_t i = 0; i < test.schedule.size(); ++i) {
    const double begin = test.schedule[i].start - t0;
    if (begin >= length) break;
    const double end =
        i + 1 < test.schedule.size() ? std::min(test.schedule[i + 1].start - t0, length) : length;
    if (!(end > begin)) continue;
    // The first step a fraction of the first measurement after the step's start (of the
    // step's length when none falls inside it), the others growing by step_growth.
    const double first = first_time_within(test, begin + t0, end + t0) - t0 - begin;
    const double dt1 = settings.first_step_fraction * std::min(first, end - begin);
    const double g = settings.step_growth;
    const int steps = std::clamp(
        static_cast<int>(std::ceil(std::log1p((end - begin) * (g - 1.0) / dt1) / std::log(g))), 1,
        settings.max_steps_per_period);
    m.periods.push_back(Period{"rate step " + std::to_string(i + 1), end - begin, steps, g, false});
    // The share of the rate of the well's cell (a quarter in a quarter grid).
    rates.push_back({geometry.rate_share * test.schedule[i].rate});
    table_of_period.push_back(static_cast<std::uint32_t>(rates.size() - 1));
  }
  m.wells.push_back(Well{"pumped well", 0.0, 0.0, well_cell,
                         PeriodValues(std::move(rates), std::move(table_of_period))});
  if (!geometry.fixed_cells.empty())  // recharge lines: the static level on the line
    m.fixed_heads.push_back(
        FixedHead{"recharge boundary", std::move(geometry.fixed_cells), PeriodValues(head)});
  // Each well at its position, reflected onto the built part across a line of symmetry: on
  // the axis it lies on the grid's edge, beyond the centres of the first row (column), so its
  // head is interpolated along that row only (ObservationSampler), whose centres lie where the
  // whole grid's centres on the line through the well lie; the columns and rows are built
  // with a centre at each well's coordinates (the anchors), so no interpolation error enters
  // unless two wells lie within a cell of each other.
  for (const ObservationSeries& w : test.wells) {
    auto [x, y] = numerical_well_position(test, w);
    if (m.grid.x_min() == 0.0) x = std::abs(x);
    if (m.grid.y_min() == 0.0) y = std::abs(y);
    Observation o;
    o.name = w.name;
    o.x = x;
    o.y = y;
    const std::optional<CellIndex> cell = m.grid.locate(o.x, o.y);
    const auto fixed = [&](CellIndex c) {
      for (const FixedHead& f : m.fixed_heads)
        for (CellIndex fc : f.cells)
          if (fc.value == c.value) return true;
      return false;
    };
    if (!cell || fixed(*cell))
      throw std::invalid_argument("numerical: well \"" + w.name +
                                  "\" lies on or beyond a straight boundary");
    o.cell = *cell;
    m.observations.push_back(std::move(o));
  }
  m.output.fields = FieldCadence::none;
  m.output.budget = false;
  m.solver.threads = 1;
  return m;
}

EstimationSetup numerical_test_setup(const PumpingTest& test, const Model& model,
                                     const std::vector<double>& lower_over_start,
                                     const std::vector<double>& upper_over_start) {
  EstimationSetup setup;
  const std::vector<int> cells = every_numerical_cell(model);
  const std::vector<std::string> names = numerical_parameter_names(test);
  const NumericalZoneLine zone = numerical_zone_line(test);
  const std::size_t sy = numerical_parameter_place(names, "specific_yield");
  const bool sy_shared = sy != names.size() &&
                         numerical_parameter_place(names, "specific_yield_beyond") == names.size();
  // The casing's storage is the well's, not the aquifer's: the storage multipliers leave the
  // well's cell out (its aquifer storage, S or Sy times the cell's area, then stays at the
  // model's value; docs/pumping-tests.md, "Well-bore storage").
  const int well_cell = model.wells.front().cell.value;
  for (std::size_t j = 0; j < names.size(); ++j) {
    EstimatedParameter e;
    e.parameter.name = names[j];
    e.parameter.property = names[j].starts_with("transmissivity") ? ParameterProperty::conductivity
                           : names[j].starts_with("storativity")
                               ? ParameterProperty::specific_storage
                           : names[j] == "leakance" ? ParameterProperty::external_conductance
                                                    : ParameterProperty::specific_yield;
    e.parameter.form = ParameterForm::multiplier;
    if (names[j] == "leakance") {
      e.parameter.features = {0};
    } else {
      // Beyond a zone line the *_beyond parameters, on this side the others; Sy of a switching
      // aquifer (no specific_yield_beyond) on every cell.
      const bool beyond = names[j].ends_with("_beyond");
      const bool storage = !names[j].starts_with("transmissivity");
      for (int c : cells) {
        if (storage && numerical_casing_storage(test) && c == well_cell) continue;
        if (zone.side < 0 || (j == sy && sy_shared) ||
            numerical_cell_beyond_zone(model.grid, zone, c) == beyond)
          e.parameter.cells.push_back(c);
      }
    }
    e.start = 1.0;
    e.lower = std::min(lower_over_start[j], 1.0);
    e.upper = std::max(upper_over_start[j], 1.0);
    setup.parameters.push_back(std::move(e));
  }
  const double t0 = test.schedule.front().start;
  for (std::size_t w = 0; w < test.wells.size(); ++w) {
    const ObservationSeries& well = test.wells[w];
    EstimationTarget t;
    t.name = well.name;
    t.kind = TargetKind::drawdown;
    t.bore = w;
    for (std::size_t i = 0; i < well.times.size(); ++i)
      if (well.times[i] > t0 && std::isfinite(well.drawdowns[i])) {
        t.times.push_back(well.times[i] - t0);
        t.values.push_back(well.drawdowns[i]);
        t.weights.push_back(1.0);
      }
    setup.targets.push_back(std::move(t));
  }
  setup.gradient = GradientMethod::forward;
  return setup;
}

namespace {

/// The fit's last round: the model it ran on, the estimation and the parameters the
/// multipliers apply to.
struct NumericalFitRounds {
  Model base;
  EstimationSetup setup;
  EstimationResult est;
  std::vector<double> p;  ///< the model's values (multipliers 1)
  double needed = 0.0;    ///< L, extent_factor radii of influence of the fitted values
  int n_model_runs = 0;   ///< over every round
};

/// Fits from `start`, rebuilding the grid (at most twice) when the fitted values' cone
/// reaches beyond it.
NumericalFitRounds numerical_fit_rounds(const PumpingTest& test, const std::vector<double>& start,
                                        const std::vector<double>& lower,
                                        const std::vector<double>& upper,
                                        const NumericalTestSettings& settings) {
  const std::size_t k = start.size();
  const double length = numerical_test_length(test);
  NumericalFitRounds r;
  r.p = start;
  double grid_t = start[0], grid_s = spreading_storage(start);
  for (int round = 0;; ++round) {
    r.base = numerical_test_model(test, r.p, grid_t, grid_s, settings);
    std::vector<double> lo(k), hi(k);
    for (std::size_t j = 0; j < k; ++j) lo[j] = lower[j] / r.p[j], hi[j] = upper[j] / r.p[j];
    r.setup = numerical_test_setup(test, r.base, lo, hi);
    r.setup.max_iterations = settings.max_fit_iterations;
    if (r.setup.n_measurements() <= static_cast<int>(k) + 1)
      throw std::invalid_argument("numerical: only " + std::to_string(r.setup.n_measurements()) +
                                  " usable drawdowns, more than " + std::to_string(k + 1) +
                                  " are needed");
    r.est = estimate_parameters(r.base, r.setup);
    r.n_model_runs += r.est.n_model_runs;
    std::vector<double> fitted(k);
    for (std::size_t j = 0; j < k; ++j)
      fitted[j] = r.p[j] * r.est.fit.parameters[static_cast<Eigen::Index>(j)];
    r.needed =
        settings.extent_factor * radius_of_influence(fitted[0], spreading_storage(fitted), length);
    if (r.needed > r.base.grid.x_max() && round < 2) {  // the fitted cone reaches the edge
      r.p = fitted;
      grid_t = fitted[0];
      grid_s = spreading_storage(fitted);
      continue;
    }
    return r;
  }
}

}  // namespace

NumericalTestSettings coarse_numerical_settings(const NumericalTestSettings& fine) {
  NumericalTestSettings c = fine;
  c.inner_fraction = std::max(fine.inner_fraction, 0.25);
  c.width_growth = std::max(fine.width_growth, 1.2);
  c.step_growth = std::max(fine.step_growth, 1.1);
  c.first_step_fraction = std::max(fine.first_step_fraction, 0.05);
  c.coarse_first = false;
  c.max_fit_iterations = std::min(fine.max_fit_iterations, 12);
  return c;
}

ModelFit fit_numerical_pumping_test(const PumpingTest& test, const std::vector<double>& start,
                                    const std::vector<double>& lower,
                                    const std::vector<double>& upper,
                                    const NumericalTestSettings& settings) {
  const std::vector<std::string> names = numerical_parameter_names(test);
  const std::size_t k = names.size();
  if (start.size() != k || lower.size() != k || upper.size() != k)
    throw std::invalid_argument("numerical: one start value and bounds per parameter expected");
  std::vector<double> from = start;
  int coarse_runs = 0;
  if (settings.coarse_first) {  // the coarse model's optimum is the fine fit's start
    const NumericalFitRounds c =
        numerical_fit_rounds(test, start, lower, upper, coarse_numerical_settings(settings));
    coarse_runs = c.n_model_runs;
    for (std::size_t j = 0; j < k; ++j)
      from[j] = std::clamp(c.p[j] * c.est.fit.parameters[static_cast<Eigen::Index>(j)], lower[j],
                           upper[j]);
  }
  const NumericalFitRounds fine = numerical_fit_rounds(test, from, lower, upper, settings);
  {
    const Model& base = fine.base;
    const EstimationSetup& setup = fine.setup;
    const EstimationResult& est = fine.est;
    const std::vector<double>& p = fine.p;
    const double needed = fine.needed;
    const double reached = numerical_far_reach(base.grid, test);
    ModelFit out;
    out.model = WellTestModel::numerical;
    out.parameter_names = names;
    out.fit = est.fit;
    for (std::size_t j = 0; j < k; ++j) {
      const auto i = static_cast<Eigen::Index>(j);
      out.fit.parameters[i] *= p[j];
      out.fit.lower_95[i] *= p[j];
      out.fit.upper_95[i] *= p[j];
    }
    out.n_used = setup.n_measurements();
    out.aicc = corrected_akaike_criterion(out.fit.weighted_sum_of_squares, out.n_used,
                                          static_cast<int>(k));
    out.rms_residual = std::sqrt(out.fit.weighted_sum_of_squares / out.n_used);
    // One more run for every time of every well and the charts' curve.
    const double t0 = test.schedule.front().start;
    std::vector<std::vector<double>> times(test.wells.size());
    out.curve_times.resize(test.wells.size());
    for (std::size_t w = 0; w < test.wells.size(); ++w) {
      const ObservationSeries& well = test.wells[w];
      double lo_t = std::numeric_limits<double>::infinity(), hi_t = 0.0;
      out.used.emplace_back(well.times.size(), false);
      for (std::size_t i = 0; i < well.times.size(); ++i)
        if (well.times[i] > t0) {
          times[w].push_back(well.times[i] - t0);
          lo_t = std::min(lo_t, well.times[i] - t0);
          hi_t = std::max(hi_t, well.times[i] - t0);
          out.used[w][i] = std::isfinite(well.drawdowns[i]);
        }
      if (hi_t > lo_t)
        for (int c = 0; c < 80; ++c)
          out.curve_times[w].push_back(
              t0 + std::exp(std::log(lo_t) + (std::log(hi_t) - std::log(lo_t)) * c / 79.0));
      for (double t : out.curve_times[w]) times[w].push_back(t - t0);
    }
    const SimulatedTargets all =
        simulate_targets(base, numerical_setup_at(setup, test, times), est.fit.parameters);
    Eigen::Index row = 0;
    out.fitted.resize(test.wells.size());
    out.curve.resize(test.wells.size());
    for (std::size_t w = 0; w < test.wells.size(); ++w) {
      for (double t : test.wells[w].times)
        out.fitted[w].push_back(t > t0 ? all.values[row++] : 0.0);
      for (std::size_t c = 0; c < out.curve_times[w].size(); ++c)
        out.curve[w].push_back(all.values[row++]);
    }
    std::ostringstream d;
    d.precision(4);
    int steps = 0;
    for (const Period& per : base.periods) steps += per.steps;
    const RectilinearGrid& g = base.grid;
    const RowCol well = g.row_col(*g.locate(0.0, 0.0));
    const int halves = (g.x_min() == 0.0 ? 1 : 0) + (g.y_min() == 0.0 ? 1 : 0);
    d << (halves == 2   ? "quarter"
          : halves == 1 ? "half"
                        : "whole")
      << " radial grid of " << g.n_cols() << " x " << g.n_rows() << " cells, the well's cell "
      << (g.x_min() == 0.0 ? 2.0 : 1.0) * g.dx(well.col) << " " << test.length_unit
      << " wide, widths growing by " << settings.width_growth;
    for (const TestLine& line : test.lines)
      d << (line.kind == TestLineKind::barrier    ? ", a barrier at "
            : line.kind == TestLineKind::recharge ? ", a recharge line at "
                                                  : ", a zone line at ")
        << line.distance << " " << test.length_unit << " bearing " << line.bearing;
    if (std::isfinite(reached))
      d << ", far edges at " << reached << " " << test.length_unit << " ("
        << reached / (needed / settings.extent_factor)
        << " radii of influence of the fitted values)";
    d << "; " << steps << " time steps in " << base.periods.size() << " rate step(s), growing by "
      << settings.step_growth << "; " << fine.n_model_runs << " model runs with sensitivities";
    if (coarse_runs > 0)
      d << ", after " << coarse_runs << " on a coarse model (steps growing by "
        << coarse_numerical_settings(settings).step_growth << ", cells by "
        << coarse_numerical_settings(settings).width_growth << ")";
    out.description = d.str();
    return out;
  }
}

}  // namespace aquiledger
