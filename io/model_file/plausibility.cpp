#include "io/model_file/plausibility.hpp"

#include <cmath>
#include <cstdio>
#include <limits>

#include "io/model_file/reader_context.hpp"
#include "io/model_file/unit_system.hpp"

namespace aquiledger {

std::pair<double, double> active_range(const RectilinearGrid& grid,
                                       const CellArray<double>& values) {
  double lo = std::numeric_limits<double>::infinity(), hi = -lo;
  for (int c = values.first(); c < grid.n_cells() && c < values.end(); ++c) {
    const double v = values[std::size_t(c)];
    if (!grid.is_active(CellIndex{c}) || std::isnan(v)) continue;
    lo = std::min(lo, v);
    hi = std::max(hi, v);
  }
  if (lo > hi) return {std::nan(""), std::nan("")};
  return {lo, hi};
}

namespace {

std::string format_range(double lo, double hi) {
  char text[96];
  if (lo == hi)
    std::snprintf(text, sizeof text, "%.3g", lo);
  else
    std::snprintf(text, sizeof text, "%.3g to %.3g", lo, hi);
  return text;
}

void check_range(std::vector<PlausibilityWarning>& out, const std::string& key,
                 const std::string& what, std::pair<double, double> range, double low, double high,
                 const std::string& unit) {
  if (std::isnan(range.first) || (range.first >= low && range.second <= high)) return;
  char usual[64];
  std::snprintf(usual, sizeof usual, "%.3g..%.3g", low, high);
  out.push_back({key, what + " " + format_range(range.first, range.second) + unit +
                          " lies outside the usual " + usual + unit +
                          " (common practice, from memory); check the values and units"});
}

}  // namespace

std::string describe_heads_above(const HeadsAboveSurface& above, const RectilinearGrid& grid,
                                 const std::string& length_unit) {
  std::string text = "in " + std::to_string(above.cells) + " active cell" +
                     (above.cells == 1 ? "" : "s") + " (largest ";
  for (std::size_t k = 0; k < above.worst.size(); ++k) {
    char excess[32];
    std::snprintf(excess, sizeof excess, "%.3g", above.worst[k].excess);
    text += (k == 0 ? "" : "; ") + std::string(excess) + " " + length_unit + " at " +
            describe_cell(grid.n_cols(), above.worst[k].cell.value);
  }
  return text + ")";
}

std::vector<PlausibilityWarning> plausibility_warnings(const Model& model) {
  std::vector<PlausibilityWarning> out;
  const RectilinearGrid& g = model.grid;
  const Aquifer& a = model.aquifer;
  // Over the rows this process read: every row, or a distributed rank's own band (the ranges
  // and counts of the other bands are checked by their ranks).
  const GridPart part = model.band ? *model.band : GridPart::whole(g);
  // Ranges of common practice (from memory; typical values in groundwater hydrology texts):
  // confined storativity 1e-5 to 1e-3, specific yield 0.01 to 0.35, K 1e-4 to 1e4 m/d.
  if (a.condition != Condition::water_table && !a.top.empty()) {
    CellArray<double> s(std::vector<double>(a.specific_storage.size()), a.specific_storage.first());
    for (auto c = std::size_t(s.first()); c < std::size_t(s.end()); ++c)
      s[c] = a.specific_storage[c] * (a.top[c] - a.bottom[c]);
    auto r = active_range(g, s);
    if (!(r.first == 0.0 && r.second == 0.0))
      check_range(out, "[aquifer]", "confined storativity S = Ss (top - bottom) of", r, 1.0e-5,
                  1.0e-3, "");
  }
  if (!a.specific_yield.empty())
    check_range(out, "[aquifer].specific_yield", "specific yield of",
                active_range(g, a.specific_yield), 0.01, 0.35, "");
  const double m_per_day_in_model =
      days_per_time_unit(model.time_unit) / metres_per_length_unit(model.length_unit);
  const std::string unit = " " + model.length_unit + "/" + model.time_unit;
  auto kr = active_range(g, a.kx);
  auto kyr = active_range(g, a.ky);
  if (!std::isnan(kyr.first)) kr = {std::min(kr.first, kyr.first), std::max(kr.second, kyr.second)};
  check_range(out, "[aquifer].k", "hydraulic conductivity of", kr, 1.0e-4 * m_per_day_in_model,
              1.0e4 * m_per_day_in_model, unit);
  // Heads above the ground: flooded land or, under a confining bed, flowing artesian wells
  // (a fact of the trade); a model without surface-water features there is likely wrong.
  if (!a.land_surface.empty()) {
    if (!model.initial.head.empty()) {
      const HeadsAboveSurface above =
          heads_above_land_surface(model, part, model.initial.head.cells());
      if (above.cells > 0)
        out.push_back({"[initial].head",
                       "initial heads stand above the land surface " +
                           describe_heads_above(above, g, model.length_unit) +
                           ": flooded ground or flowing artesian conditions; check the heads "
                           "and the land surface"});
    }
    if (!a.top.empty()) {
      HeadsAboveSurface high = heads_above_land_surface(model, part, a.top.cells());
      if (high.cells > 0)
        out.push_back(
            {"[aquifer].land_surface", "the aquifer top stands above the land surface " +
                                           describe_heads_above(high, g, model.length_unit) +
                                           "; check both elevations and their datum"});
    }
  }
  // Interbeds: skeletal specific storage of fine-grained beds, elastic Ske about 1e-6 to
  // 1e-4 1/m and inelastic Skv about 1e-5 to 1e-2 1/m, Skv larger than Ske (virgin
  // compression exceeds recompression); from memory, ranges of the kind tabulated for
  // aquifer-system clays in the subsidence literature (e.g. Galloway et al., 1999, USGS
  // Circular 1182), not checked against a document at hand.
  if (a.interbeds) {
    const Interbeds& ib = *a.interbeds;
    const double per_metre_in_model = metres_per_length_unit(model.length_unit);
    const std::string per = " 1/" + model.length_unit;
    check_range(out, "[interbeds].elastic_storage", "elastic skeletal specific storage of",
                active_range(g, ib.elastic_storage), 1.0e-6 * per_metre_in_model,
                1.0e-4 * per_metre_in_model, per);
    check_range(out, "[interbeds].inelastic_storage", "inelastic skeletal specific storage of",
                active_range(g, ib.inelastic_storage), 1.0e-5 * per_metre_in_model,
                1.0e-2 * per_metre_in_model, per);
    int smaller = 0;
    for (int c = part.first_owned(); c < part.end_owned(); ++c) {
      const auto i = static_cast<std::size_t>(c);
      if (g.is_active(CellIndex{c}) && ib.thickness[i] > 0.0 &&
          ib.inelastic_storage[i] < ib.elastic_storage[i])
        ++smaller;
    }
    if (smaller > 0)
      out.push_back({"[interbeds].inelastic_storage",
                     "inelastic skeletal specific storage below the elastic one in " +
                         std::to_string(smaller) +
                         " cells; fine-grained beds compact more on first loading than on "
                         "reloading (from memory: Skv is commonly tens of times Ske), so check "
                         "whether the two are swapped"});
    // Delay beds: the same ranges (the same kind of clay), over the cells that have them.
    if (ib.delay) {
      const DelayBeds& d = *ib.delay;
      std::vector<double> ske(d.elastic_storage.values()), skv(d.inelastic_storage.values());
      for (std::size_t k = 0; k < ske.size(); ++k)
        if (!(d.count.values()[k] > 0.0)) ske[k] = skv[k] = std::nan("");
      const CellArray<double> ske_cells(std::move(ske), d.elastic_storage.first());
      const CellArray<double> skv_cells(std::move(skv), d.inelastic_storage.first());
      check_range(out, "[interbeds].delay_bed_elastic_storage",
                  "elastic skeletal specific storage of", active_range(g, ske_cells),
                  1.0e-6 * per_metre_in_model, 1.0e-4 * per_metre_in_model, per);
      check_range(out, "[interbeds].delay_bed_inelastic_storage",
                  "inelastic skeletal specific storage of", active_range(g, skv_cells),
                  1.0e-5 * per_metre_in_model, 1.0e-2 * per_metre_in_model, per);
    }
  }
  // Measured heads the report cannot compare: every measured time of a bore outside the run.
  double end = 0.0;
  for (const Period& p : model.periods) end += p.length;
  char end_text[32];  // the run's end as the periods give it (1275, not 1.28e+03)
  std::snprintf(end_text, sizeof end_text, "%.10g", end);
  for (const bool bores : {true, false})
    for (const Observation& o : bores ? model.observations : model.subsidence_points) {
      if (o.measured.empty()) continue;
      bool inside = false;
      for (const MeasuredHead& m : o.measured) inside |= m.time >= 0.0 && m.time <= end;
      if (!inside)
        out.push_back({(bores ? "[[observation]] " : "[[subsidence_point]] ") + o.name,
                       "none of the " + std::to_string(o.measured.size()) +
                           (bores ? " measured heads of " : " measured subsidence values of ") +
                           o.name + " (" + o.measured_file.string() +
                           ") falls inside the run (time 0 to " + std::string(end_text) + " " +
                           model.time_unit + "), so they cannot be compared with the model; " +
                           "check their times against the periods"});
    }
  return out;
}

}  // namespace aquiledger
