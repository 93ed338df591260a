#include "io/reports/check_report.hpp"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>
#include <string>

#include "io/files/calendar.hpp"
#include "io/model_file/period_value_reader.hpp"
#include "io/model_file/plausibility.hpp"
#include "solver/time_steps.hpp"

namespace aquiledger {

namespace {

class Report {
 public:
  void heading(const std::string& title) {
    if (!text_.empty()) text_ += "\n";
    text_ += title + "\n";
  }
  /// "  label ......: value" with labels aligned.
  void item(const std::string& label, const std::string& value) {
    std::string padded = "  " + label;
    if (padded.size() < 40) padded.resize(40, ' ');
    text_ += padded + " " + value + "\n";
  }
  void line(const std::string& s) { text_ += "  " + s + "\n"; }
  std::string take() { return std::move(text_); }

 private:
  std::string text_;
};

std::string g3(double v) {
  char b[64];
  std::snprintf(b, sizeof b, "%.5g", v);
  if (std::abs(v) >= 1.0e5 && std::abs(v) < 1.0e9) std::snprintf(b, sizeof b, "%.0f", v);
  return b;
}

std::string range_text(std::pair<double, double> r, const std::string& unit) {
  if (std::isnan(r.first)) return "-";
  std::string s = r.first == r.second ? g3(r.first) : g3(r.first) + " .. " + g3(r.second);
  return unit.empty() ? s : s + " " + unit;
}

const char* condition_name(Condition c) {
  return c == Condition::confined      ? "confined"
         : c == Condition::water_table ? "water_table"
                                       : "switching";
}

void grid_part(Report& r, const Model& m) {
  const RectilinearGrid& g = m.grid;
  const std::string L = m.length_unit;
  std::vector<double> dx(g.column_widths().begin(), g.column_widths().end());
  std::vector<double> dy(g.row_heights().begin(), g.row_heights().end());
  auto span_range = [](const std::vector<double>& v) {
    return std::pair{*std::min_element(v.begin(), v.end()), *std::max_element(v.begin(), v.end())};
  };
  r.heading("Grid");
  r.item("rows x columns", std::to_string(g.n_rows()) + " x " + std::to_string(g.n_cols()) + " = " +
                               std::to_string(g.n_cells()) + " cells, " +
                               std::to_string(g.n_active()) + " active");
  r.item("x (west to east)", g3(g.x_min()) + " .. " + g3(g.x_max()) + " " + L);
  r.item("y (south to north)", g3(g.y_min()) + " .. " + g3(g.y_max()) + " " + L);
  r.item("column widths dx", range_text(span_range(dx), L));
  r.item("row heights dy", range_text(span_range(dy), L));
}

void aquifer_part(Report& r, const Model& m) {
  const RectilinearGrid& g = m.grid;
  const Aquifer& a = m.aquifer;
  const std::string L = m.length_unit, T = m.time_unit;
  r.heading("Aquifer (" + std::string(condition_name(a.condition)) +
            ", ranges over the active cells)");
  r.item("top", a.condition == Condition::water_table && std::isnan(active_range(g, a.top).first)
                    ? "- (not needed)"
                    : range_text(active_range(g, a.top), L));
  r.item("bottom", range_text(active_range(g, a.bottom), L));
  r.item("Kx", range_text(active_range(g, a.kx), L + "/" + T));
  r.item("Ky", range_text(active_range(g, a.ky), L + "/" + T));
  const std::size_t n = a.kx.size();
  const bool has_top = !std::isnan(active_range(g, a.top).first);
  if (has_top) {
    std::vector<double> t(n), s(n);
    for (std::size_t c = 0; c < n; ++c) {
      t[c] = a.kx[c] * (a.top[c] - a.bottom[c]);
      s[c] = a.specific_storage[c] * (a.top[c] - a.bottom[c]);
    }
    r.item("T = Kx (top - bottom)", range_text(active_range(g, t), L + "2/" + T));
    if (a.condition != Condition::water_table) {
      r.item("Ss", range_text(active_range(g, a.specific_storage), "1/" + L));
      r.item("S = Ss (top - bottom)", range_text(active_range(g, s), ""));
    }
  }
  if (!a.specific_yield.empty()) r.item("Sy", range_text(active_range(g, a.specific_yield), ""));
  if (!a.land_surface.empty())
    r.item("land surface", range_text(active_range(g, a.land_surface), L));
  if (a.compressibility) {
    const Compressibility& c = *a.compressibility;
    r.item("storage route", "compressibility, Ss = rho g (alpha + n beta) (Jacob, 1940)");
    r.item("  alpha, n, beta",
           g3(c.skeleton) + " 1/Pa, " + g3(c.porosity) + ", " + g3(c.water) + " 1/Pa (means)");
    r.item("  rho, g", g3(c.density) + " kg/m3, " + g3(c.gravity) + " m/s2");
    auto share = active_range(g, a.skeleton_share);
    r.item("  skeleton : water",
           range_text({100.0 * share.first, 100.0 * share.second}, "%") + " : " +
               range_text({100.0 * (1.0 - share.second), 100.0 * (1.0 - share.first)}, "%"));
  } else if (a.condition != Condition::water_table) {
    r.item("storage route", "specific storage given (budget component storage_elastic)");
  }
  if (a.interbeds) {
    const Interbeds& ib = *a.interbeds;
    const std::string per = "1/" + m.length_unit;
    r.item("interbeds (no delay)",
           "thickness " + range_text(active_range(g, ib.thickness), m.length_unit) +
               "; budget components interbed_recoverable, interbed_permanent");
    r.item("  Ske, Skv", range_text(active_range(g, ib.elastic_storage), per) + "; " +
                             range_text(active_range(g, ib.inelastic_storage), per));
    r.item("  preconsolidation head",
           ib.preconsolidation.empty()
               ? g3(ib.preconsolidation_offset) + " " + m.length_unit + " below the initial head"
               : range_text(active_range(g, ib.preconsolidation), m.length_unit));
    if (ib.delay) {
      const DelayBeds& d = *ib.delay;
      r.item("delay beds", "number " + range_text(active_range(g, d.count), "") + "; thickness " +
                               range_text(active_range(g, d.thickness), m.length_unit) + "; " +
                               std::to_string(d.nodes) + " slices per half-bed" +
                               "; budget components delay_bed_recoverable, delay_bed_permanent");
      r.item("  Kv", range_text(active_range(g, d.vertical_k), m.length_unit + "/" + m.time_unit));
      r.item("  Ske, Skv", range_text(active_range(g, d.elastic_storage), per) + "; " +
                               range_text(active_range(g, d.inelastic_storage), per));
    }
  }
}

/// Ranges of each zoned property, zone by zone (active cells only).
void zone_part(Report& r, const Model& m) {
  const RectilinearGrid& g = m.grid;
  const Aquifer& a = m.aquifer;
  for (const ZoneMap& zm : m.zone_maps) {
    const CellArray<double>* values = zm.key == "k"                ? &a.kx
                                      : zm.key == "specific_yield" ? &a.specific_yield
                                                                   : &a.specific_storage;
    if (values->empty()) continue;
    std::map<int, std::vector<std::size_t>> cells;
    for (std::size_t c = 0; c < zm.zone.size(); ++c)
      if (g.is_active(CellIndex{static_cast<std::int32_t>(c)})) cells[zm.zone[c]].push_back(c);
    const std::string L = m.length_unit, T = m.time_unit;
    for (const auto& [zone, list] : cells) {
      auto range = [&](auto value_of) {
        std::pair<double, double> mm{INFINITY, -INFINITY};
        for (std::size_t c : list)
          mm = {std::min(mm.first, value_of(c)), std::max(mm.second, value_of(c))};
        return mm;
      };
      std::string text = std::to_string(list.size()) + " cells; ";
      if (zm.key == "k") {
        text += "Kx " + range_text(range([&](std::size_t c) { return a.kx[c]; }), L + "/" + T);
        if (!std::isnan(a.top[list.front()]))
          text +=
              ", T " +
              range_text(range([&](std::size_t c) { return a.kx[c] * (a.top[c] - a.bottom[c]); }),
                         L + "2/" + T);
      } else if (zm.key == "specific_yield") {
        text += "Sy " + range_text(range([&](std::size_t c) { return a.specific_yield[c]; }), "");
      } else {
        text += "Ss " +
                range_text(range([&](std::size_t c) { return a.specific_storage[c]; }), "1/" + L);
        if (!std::isnan(a.top[list.front()]))
          text += ", S " + range_text(range([&](std::size_t c) {
                                        return a.specific_storage[c] * (a.top[c] - a.bottom[c]);
                                      }),
                                      "");
      }
      r.item("  " + zm.key + " zone " + std::to_string(zone), text);
    }
  }
}

void period_part(Report& r, const Model& m) {
  const std::string T = m.time_unit;
  r.heading("Periods");
  r.item("initial state",
         m.initial.steady
             ? "steady state of period 1's stresses"
             : "head " + range_text(active_range(m.grid, m.initial.head), m.length_unit));
  char b[256];
  std::snprintf(b, sizeof b, "%-3s %-24s %-9s %10s %6s %7s %11s %11s", "#", "name", "kind",
                "length", "steps", "growth", "first dt", "last dt");
  r.line(b);
  double time = 0.0;
  for (std::size_t i = 0; i < m.periods.size(); ++i) {
    const Period& p = m.periods[i];
    time += p.length;
    std::snprintf(b, sizeof b, "%-3zu %-24s %-9s %10s %6d %7s %11s %11s", i + 1,
                  p.name.substr(0, 24).c_str(), p.steady ? "steady" : "transient",
                  g3(p.length).c_str(), p.steps, g3(p.growth).c_str(),
                  g3(first_step_length(p)).c_str(), g3(last_step_length(p)).c_str());
    r.line(b);
  }
  r.item("total time", g3(time) + " " + T);
}

std::string cell_text(const RectilinearGrid& g, CellIndex c) {
  const RowCol rc = g.row_col(c);
  return "row " + std::to_string(rc.row + 1) + ", column " + std::to_string(rc.col + 1);
}

/// "rows 3-17, columns 1-4": the rows and columns a feature's cells span (1-based).
std::string span_text(const RectilinearGrid& g, const std::vector<CellIndex>& cells) {
  if (cells.empty()) return "no cells";
  int r0 = g.n_rows(), r1 = -1, c0 = g.n_cols(), c1 = -1;
  for (CellIndex c : cells) {
    const RowCol rc = g.row_col(c);
    r0 = std::min(r0, rc.row), r1 = std::max(r1, rc.row);
    c0 = std::min(c0, rc.col), c1 = std::max(c1, rc.col);
  }
  auto range = [](const char* what, int a, int b) {
    return a == b ? std::string(what) + " " + std::to_string(a + 1)
                  : std::string(what) + "s " + std::to_string(a + 1) + "-" + std::to_string(b + 1);
  };
  return range("row", r0, r1) + ", " + range("column", c0, c1);
}

void feature_part(Report& r, const Model& m) {
  const std::string L = m.length_unit, T = m.time_unit;
  r.heading("Features");
  auto cells_only = [](std::size_t n) { return std::to_string(n) + (n == 1 ? " cell" : " cells"); };
  auto cells = [&](const std::vector<CellIndex>& list) {
    return cells_only(list.size()) + " (" + span_text(m.grid, list) + ")";
  };
  for (const Well& w : m.wells)
    r.item("well \"" + w.name + "\"",
           cell_text(m.grid, w.cell) + "; rate " + range_text(value_range(w.rate), L + "3/" + T));
  for (const FixedHead& f : m.fixed_heads)
    r.item("fixed_head \"" + f.name + "\"",
           cells(f.cells) + "; head " + range_text(value_range(f.head), L));
  for (const Recharge& f : m.recharges)
    r.item("recharge \"" + f.name + "\"",
           cells(f.cells) + "; rate " + range_text(value_range(f.rate), L + "/" + T));
  for (const River& f : m.rivers) {
    double total = 0.0;
    for (double l : f.length) total += l;
    r.item("river \"" + f.name + "\"", cells(f.cells) + "; channel " + g3(total) + " " + L +
                                           "; stage " + range_text(value_range(f.stage), L));
  }
  for (const Drain& f : m.drains)
    r.item("drain \"" + f.name + "\"",
           cells(f.cells) + "; elevation " + range_text(value_range(f.elevation), L));
  for (const ExternalHead& f : m.external_heads)
    r.item("external_head \"" + f.name + "\"",
           cells(f.cells) + "; head " + range_text(value_range(f.head), L));
  for (const Evapotranspiration& f : m.evapotranspiration)
    r.item("evapotranspiration \"" + f.name + "\"",
           cells(f.cells) + "; max rate " + range_text(value_range(f.max_rate), L + "/" + T));
  if (m.leakage)
    r.item("leakage", cells(m.leakage->cells) + "; leakance " +
                          range_text(value_range(m.leakage->leakance), "1/" + T) +
                          "; source head " + range_text(value_range(m.leakage->source_head), L));
  for (const Observation& o : m.observations)
    r.item("observation \"" + o.name + "\"",
           cell_text(m.grid, o.cell) +
               (o.measured.empty() ? ""
                                   : "; " + std::to_string(o.measured.size()) + " measured heads"));
  for (const Observation& o : m.subsidence_points)
    r.item("subsidence point \"" + o.name + "\"",
           cell_text(m.grid, o.cell) +
               (o.measured.empty()
                    ? ""
                    : "; " + std::to_string(o.measured.size()) + " measured subsidence values"));
}

void settings_part(Report& r, const Model& m) {
  r.heading("Output and solver");
  const char* fields = m.output.fields == FieldCadence::every_step ? "every_step"
                       : m.output.fields == FieldCadence::none     ? "none"
                                                                   : "period_end";
  r.item("output folder", m.output.folder.string());
  r.item("fields, budget", std::string(fields) + ", " + (m.output.budget ? "yes" : "no"));
  if (!m.output.head_array_times.empty() || m.output.head_arrays_at_period_ends) {
    std::string times;
    for (double t : m.output.head_array_times) times += (times.empty() ? "t = " : ", ") + g3(t);
    if (!times.empty()) times += " " + m.time_unit;
    const std::string ends = m.output.head_arrays_at_period_ends ? "every period end" : "";
    r.item("head arrays", ends + (!ends.empty() && !times.empty() ? "; " : "") + times);
  }
  const char* linear[] = {"auto", "direct", "pcg", "bicgstab", "multigrid"};
  r.item("linear solver", linear[static_cast<int>(m.solver.linear)]);
  if (m.aquifer.condition != Condition::confined)
    r.item("face thickness",
           m.solver.face_thickness == FaceThickness::upstream ? "upstream" : "mean");
  r.item("tolerances", "head " + g3(m.solver.head_tolerance) + " " + m.length_unit + ", flow " +
                           g3(m.solver.flow_tolerance));
  r.item("iterations, cutbacks",
         std::to_string(m.solver.max_iterations) + ", " + std::to_string(m.solver.max_cutbacks));
}

}  // namespace

std::string format_check_report(const Model& m) {
  Report r;
  r.heading("Model \"" + m.title + "\" (" + m.source_file.string() + ")");
  r.item("units", "length " + m.length_unit + ", time " + m.time_unit);
  if (auto clock = model_clock(m)) {
    double end = 0.0;
    for (const Period& p : m.periods) end += p.length;
    r.item("calendar", "time 0 = " + clock->date_of(0.0) + ", the run ends " + clock->date_of(end));
  }
  grid_part(r, m);
  aquifer_part(r, m);
  zone_part(r, m);
  period_part(r, m);
  feature_part(r, m);
  settings_part(r, m);
  r.heading(m.warnings.empty()
                ? "No warnings"
                : "Warnings (" + std::to_string(m.warnings.size()) + ", none stops a run)");
  for (const std::string& w : m.warnings) r.line("- " + w);
  return r.take();
}

}  // namespace aquiledger
