#include "io/reports/results_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <optional>

#include "io/files/csv_table.hpp"
#include "io/files/output_error.hpp"
#include "io/model_file/model_reader.hpp"
#include "io/reports/html_report.hpp"
#include "io/reports/subsidence_report.hpp"
#include "io/reports/vega_charts.hpp"
#include "io/reports/water_sources_report.hpp"
#include "io/results/vtk_fields.hpp"
#include "postproc/calibration_statistics.hpp"
#include "postproc/water_budget.hpp"

namespace aquiledger {

std::string json_text_value(const std::string& json, const std::string& key) {
  const std::string quoted = "\"" + key + "\"";
  std::size_t p = json.find(quoted);
  if (p == std::string::npos) return "";
  p = json.find(':', p + quoted.size());
  if (p == std::string::npos) return "";
  p = json.find_first_not_of(" \t\r\n", p + 1);
  if (p == std::string::npos || json[p] != '"') return "";
  std::string out;
  for (++p; p < json.size() && json[p] != '"'; ++p) {
    if (json[p] == '\\' && p + 1 < json.size()) {
      const char e = json[++p];
      out += e == 'n' ? '\n' : e == 't' ? '\t' : e;
    } else {
      out += json[p];
    }
  }
  return out;
}

void parse_maps_at(const std::string& text, ResultsReportOptions& options) {
  if (text == "all") {
    options.maps_at_all = true;
    return;
  }
  std::vector<double> times;
  std::size_t from = 0;
  while (true) {
    const std::size_t comma = text.find(',', from);
    const std::string item =
        text.substr(from, comma == std::string::npos ? std::string::npos : comma - from);
    std::size_t used = 0;
    double t = std::nan("");
    try {
      t = std::stod(item, &used);
    } catch (const std::exception&) {
      used = 0;
    }
    if (item.empty() || used != item.size() || !std::isfinite(t) || t < 0.0)
      throw ReportOptionError(fmt::format(
          "--maps-at: '{}' is not an output time; give \"all\" or times from the start of the "
          "run separated by commas, e.g. --maps-at 30,365",
          item));
    times.push_back(t);
    if (comma == std::string::npos) break;
    from = comma + 1;
  }
  options.maps_at = times;
}

namespace {

struct Units {
  std::string length = "m";
  std::string time = "d";
};

/// Rows of a long budget table (budget_periods.csv, budget_steps.csv) of one component:
/// net values into the aquifer (into_aquifer - out_of_aquifer) with the rows' times.
struct ComponentSeries {
  std::vector<double> into, out_of;
  std::vector<std::size_t> rows;  ///< row numbers in the table
};

std::map<std::string, ComponentSeries> by_component(const CsvTable& table) {
  const std::vector<std::string> component = table.texts("component");
  const std::vector<double> into = table.numbers("into_aquifer");
  const std::vector<double> out_of = table.numbers("out_of_aquifer");
  std::map<std::string, ComponentSeries> series;
  for (std::size_t i = 0; i < component.size() && i < into.size() && i < out_of.size(); ++i) {
    ComponentSeries& s = series[component[i]];
    s.into.push_back(into[i]);
    s.out_of.push_back(out_of[i]);
    s.rows.push_back(i);
  }
  return series;
}

/// A budget component in plain words (the contract's names stay in the files).
std::string plain_component(const std::string& c) {
  static const std::map<std::string, std::string> words = {
      {"storage_skeleton", "storage: skeleton compression"},
      {"storage_water", "storage: water expansion"},
      {"storage_elastic", "storage: elastic release"},
      {"storage_drainage", "storage: draining pores"},
      {"interbed_recoverable", "storage: interbeds, elastic"},
      {"interbed_permanent", "storage: interbeds, permanent"},
      {"delay_bed_recoverable", "storage: delay beds, elastic"},
      {"delay_bed_permanent", "storage: delay beds, permanent"},
      {"fixed_head", "fixed-head boundary"},
      {"well", "wells"},
      {"recharge", "recharge"},
      {"river", "rivers"},
      {"drain", "drains"},
      {"external_head", "external-head boundary"},
      {"evapotranspiration", "evapotranspiration"},
      {"leakage", "leakage through the aquitard"},
      {"total", "total"}};
  const auto found = words.find(c);
  return found == words.end() ? c : found->second;
}

/// A number for a table, read by people: from 1000 up a whole number with thousands
/// separators (14,261,234), below that 4 significant digits; never an exponent above 1000.
std::string table_number(double v) {
  if (!std::isfinite(v)) return "not defined";
  if (std::abs(v) < 1000.0) return fmt::format("{:.4g}", v);
  const std::string digits = fmt::format("{:.0f}", std::abs(v));
  std::string grouped;
  for (std::size_t i = 0; i < digits.size(); ++i) {
    if (i > 0 && (digits.size() - i) % 3 == 0) grouped += ',';
    grouped += digits[i];
  }
  return (v < 0.0 ? "-" : "") + grouped;
}

/// The periods in order: name, start, end, length, steady or transient.
void add_periods(HtmlReport& page, const CsvTable& periods, const Model* model, const Units& u) {
  const std::vector<std::string> names = periods.texts("period_name");
  const std::vector<double> index = periods.numbers("period"), start = periods.numbers("start"),
                            end = periods.numbers("end");
  page.add_heading("Stress periods");
  std::vector<std::vector<std::string>> rows;
  double last = -1.0;
  for (std::size_t i = 0; i < names.size() && i < start.size() && i < end.size(); ++i) {
    if (index[i] == last) continue;
    last = index[i];
    const auto k = static_cast<std::size_t>(index[i]) - 1;
    std::string kind = "not known (no model)";
    if (model && k < model->periods.size())
      kind = model->periods[k].steady ? "steady" : "transient";
    rows.push_back({fmt::format("{:g}", index[i]), names[i], table_number(start[i]),
                    table_number(end[i]), table_number(end[i] - start[i]), kind});
  }
  page.add_table({"period", "name", fmt::format("start ({})", u.time),
                  fmt::format("end ({})", u.time), fmt::format("length ({})", u.time), "kind"},
                 rows);
}

/// Per-period volumes and mean rates by component (into the aquifer, or released from
/// storage, stacked up; out of it stacked down), in period order, and the numbers as a table.
void add_period_budget(HtmlReport& page, const CsvTable& periods, const Units& u) {
  const std::vector<std::string> names = periods.texts("period_name");
  const std::vector<std::string> component = periods.texts("component");
  const std::vector<double> index = periods.numbers("period"), start = periods.numbers("start"),
                            end = periods.numbers("end");
  const std::vector<double> into = periods.numbers("into_aquifer"),
                            out_of = periods.numbers("out_of_aquifer");
  std::vector<std::pair<double, BarValue>> volumes, rates;
  std::vector<std::vector<std::string>> rows;
  for (std::size_t i = 0; i < component.size() && i < into.size() && i < out_of.size(); ++i) {
    const std::string label = plain_component(component[i]);
    const std::string cat = fmt::format("{:g} {}", index[i], names[i]);
    const double length = end[i] - start[i];
    const double rate_in = length > 0.0 ? into[i] / length : std::nan("");
    const double rate_out = length > 0.0 ? out_of[i] / length : std::nan("");
    rows.push_back({fmt::format("{:g}", index[i]), names[i], label, table_number(into[i]),
                    table_number(out_of[i]), table_number(rate_in), table_number(rate_out)});
    if (component[i] == "total") continue;
    if (into[i] != 0.0) {
      volumes.push_back({index[i], {cat, label, into[i]}});
      rates.push_back({index[i], {cat, label, rate_in}});
    }
    if (out_of[i] != 0.0) {
      volumes.push_back({index[i], {cat, label, -out_of[i]}});
      rates.push_back({index[i], {cat, label, -rate_out}});
    }
  }
  auto in_period_order = [](std::vector<std::pair<double, BarValue>>& v) {
    std::stable_sort(v.begin(), v.end(),
                     [](const auto& a, const auto& b) { return a.first < b.first; });
    std::vector<BarValue> bars;
    for (const auto& [k, bar] : v) bars.push_back(bar);
    return bars;
  };
  page.add_heading("Water budget by stress period");
  page.add_chart(
      "Volume of each kind of water in each period: into the aquifer (or released from "
      "storage) above zero, out of it (or taken into storage) below",
      stacked_bar_spec(in_period_order(volumes), "stress period",
                       fmt::format("volume ({}3)", u.length)));
  page.add_chart("Mean rate of each kind of water in each period (volume / period length)",
                 stacked_bar_spec(in_period_order(rates), "stress period",
                                  fmt::format("mean rate ({}3/{})", u.length, u.time)));
  page.add_table(
      {"period", "name", "water", fmt::format("in ({}3)", u.length),
       fmt::format("out ({}3)", u.length), fmt::format("mean rate in ({}3/{})", u.length, u.time),
       fmt::format("mean rate out ({}3/{})", u.length, u.time)},
      rows);
}

/// The imbalance of each period (balance_periods.csv) as a table.
void add_period_balance(HtmlReport& page, const CsvTable& balance, const Units& u) {
  const std::vector<std::string> names = balance.texts("period_name");
  const std::vector<double> index = balance.numbers("period"),
                            into = balance.numbers("into_aquifer"),
                            out_of = balance.numbers("out_of_aquifer"),
                            imbalance = balance.numbers("imbalance_percent");
  std::vector<std::vector<std::string>> rows;
  for (std::size_t i = 0; i < names.size() && i < imbalance.size() && i < index.size() &&
                          i < into.size() && i < out_of.size();
       ++i)
    rows.push_back({fmt::format("{:g}", index[i]), names[i], table_number(into[i]),
                    table_number(out_of[i]), fmt::format("{:.3g}", imbalance[i])});
  page.add_paragraph(
      "Imbalance of each period: 100 (in - out) / ((in + out) / 2) of its total "
      "volumes; near zero when the equations were solved closely.");
  page.add_table({"period", "name", fmt::format("in ({}3)", u.length),
                  fmt::format("out ({}3)", u.length), "imbalance (%)"},
                 rows);
}

void add_step_charts(HtmlReport& page, const CsvTable& steps, const CsvTable& balance,
                     const CsvTable& balance_periods, const Units& u) {
  const std::vector<double> time = steps.numbers("time");
  const std::map<std::string, ComponentSeries> series = by_component(steps);
  std::vector<ChartSeries> storage;
  const std::pair<const char*, const char*> mechanisms[] = {
      {"storage_skeleton", "skeleton compression"},
      {"storage_water", "water expansion"},
      {"storage_elastic", "elastic (undivided)"},
      {"storage_drainage", "drainage of pores"},
      {"interbed_recoverable", "interbeds, elastic"},
      {"interbed_permanent", "interbeds, permanent"},
      {"delay_bed_recoverable", "delay beds, elastic"},
      {"delay_bed_permanent", "delay beds, permanent"}};
  for (const auto& [component, label] : mechanisms) {
    const auto found = series.find(component);
    if (found == series.end()) continue;
    const ComponentSeries& c = found->second;
    ChartSeries s{label, {}, {}, SeriesStyle::line};
    bool any = false;
    for (std::size_t k = 0; k < c.rows.size(); ++k) {
      s.x.push_back(time[c.rows[k]]);
      s.y.push_back(c.into[k] - c.out_of[k]);
      any |= s.y.back() != 0.0;
    }
    if (any) storage.push_back(s);
  }
  page.add_heading("Storage released by mechanism");
  const std::vector<double> step_time = balance.numbers("time");
  if (storage.empty())
    storage.push_back({"no storage change", step_time, std::vector<double>(step_time.size(), 0.0)});
  page.add_chart("Net release from storage at the end of each step (negative: taken into storage)",
                 line_chart_spec(storage, {fmt::format("time ({})", u.time)},
                                 {fmt::format("release rate ({}3/{})", u.length, u.time)}));
  page.add_heading("Mass balance");
  add_period_balance(page, balance_periods, u);
  page.add_chart("Imbalance of each step, 100 (into - out of the aquifer) / their mean",
                 line_chart_spec({{"imbalance", step_time, balance.numbers("imbalance_percent"),
                                   SeriesStyle::points}},
                                 {fmt::format("time ({})", u.time)}, {"imbalance (%)"}, 620, 200));
}

std::string stat_text(const std::optional<double>& v) {
  return v ? fmt::format("{:.3g}", *v) : std::string("not defined");
}

/// One bore with measured heads and their pairs with the simulated heads.
struct BorePairs {
  const Observation* bore;
  std::vector<HeadPair> pairs;
};

/// Statistics over all bores and per bore, simulated against measured, and residuals at the
/// bores; an honest message when no measured head falls inside the run.
void add_calibration(HtmlReport& page, const std::vector<BorePairs>& bores, int measured_given,
                     const std::vector<double>& times, const Units& u,
                     const std::optional<MapExtent>& extent) {
  page.add_heading("Calibration: simulated against measured heads");
  if (bores.empty()) {
    page.add_paragraph(
        "No measured heads were given for the bores, so the model is not compared "
        "with measurements.");
    return;
  }
  std::vector<HeadPair> all;
  for (const BorePairs& b : bores) all.insert(all.end(), b.pairs.begin(), b.pairs.end());
  if (all.empty()) {
    const auto [lo, hi] = std::minmax_element(times.begin(), times.end());
    page.add_paragraph(fmt::format(
        "None of the {} measured heads falls inside the run (time {:g} to {:g} {}), so no "
        "calibration statistics can be given. Check the times of the measured-head files "
        "against the periods of the model.",
        measured_given, times.empty() ? 0.0 : *lo, times.empty() ? 0.0 : *hi, u.time));
    return;
  }
  const double range = measured_range(all);
  page.add_paragraph(fmt::format(
      "Residual = simulated - measured head, at the measured times inside the run (simulated "
      "heads interpolated linearly in time). Scaled RMSE = RMSE / range of all measured heads "
      "({:.3g} {}); it is not defined when there is only one measured value or no range.",
      range, u.length));
  std::vector<std::vector<std::string>> rows;
  auto row = [&](const std::string& name, const std::vector<HeadPair>& pairs) {
    const CalibrationStatistics s = calibration_statistics(pairs, range);
    rows.push_back({name, std::to_string(s.count), stat_text(s.mean_error),
                    stat_text(s.mean_absolute_error), stat_text(s.rmse), stat_text(s.scaled_rmse)});
  };
  row("all bores", all);
  for (const BorePairs& b : bores) row(b.bore->name, b.pairs);
  page.add_table({"bore", "measured heads used", fmt::format("mean error ({})", u.length),
                  fmt::format("mean absolute error ({})", u.length),
                  fmt::format("RMSE ({})", u.length), "scaled RMSE (-)"},
                 rows);

  std::vector<ChartSeries> scatter;
  double lo = all.front().measured, hi = lo;
  for (const BorePairs& b : bores) {
    ChartSeries s{b.bore->name, {}, {}, SeriesStyle::points};
    for (const HeadPair& p : b.pairs) {
      s.x.push_back(p.measured);
      s.y.push_back(p.simulated);
      lo = std::min({lo, p.measured, p.simulated});
      hi = std::max({hi, p.measured, p.simulated});
    }
    if (!s.x.empty()) scatter.push_back(s);
  }
  scatter.push_back({"perfect fit (1:1 line)", {lo, hi}, {lo, hi}, SeriesStyle::line});
  page.add_chart("Simulated against measured heads; points on the 1:1 line fit exactly",
                 line_chart_spec(scatter, {fmt::format("measured head ({})", u.length)},
                                 {fmt::format("simulated head ({})", u.length)}, 420, 420));

  std::vector<MapPoint> residuals;
  for (const BorePairs& b : bores) {
    const CalibrationStatistics s = calibration_statistics(b.pairs, range);
    if (s.mean_error) residuals.push_back({b.bore->name, b.bore->x, b.bore->y, *s.mean_error});
  }
  page.add_chart(
      "Mean residual at each bore (simulated - measured): red where the model is too high, "
      "blue where it is too low",
      residual_map_spec(residuals, fmt::format("mean residual ({})", u.length), u.length, 560, 360,
                        extent));
}

/// Counts of confined, water-table and dry cells after each step (balance_steps.csv).
void add_converted_cells(HtmlReport& page, const CsvTable& steps, const Units& u) {
  page.add_heading("Cells converted between confined, water table and dry");
  const std::vector<double> time = steps.numbers("time");
  const std::vector<double> confined = steps.numbers("confined_cells"),
                            water_table = steps.numbers("water_table_cells"),
                            dry = steps.numbers("dry_cells");
  if (confined.empty()) {
    page.add_paragraph("The balance table holds no cell counts (results before version 2).");
    return;
  }
  auto range = [](const std::vector<double>& v) {
    const auto [lo, hi] = std::minmax_element(v.begin(), v.end());
    return *lo == *hi ? fmt::format("{:g} throughout", *lo)
                      : fmt::format("from {:g} to {:g}", *lo, *hi);
  };
  page.add_paragraph(fmt::format("Active cells confined: {}; with a water table: {}; dry: {}.",
                                 range(confined), range(water_table), range(dry)));
  page.add_chart("Number of cells in each state at the end of each step",
                 line_chart_spec({{"confined", time, confined, SeriesStyle::line},
                                  {"water table", time, water_table, SeriesStyle::line},
                                  {"dry", time, dry, SeriesStyle::line}},
                                 {fmt::format("time ({})", u.time)}, {"cells"}, 620, 220));
}

/// Wells that could not deliver what was asked (their cell ran dry): asked volume (the rate
/// times the period length) against the delivered volume of budget_features.csv.
void add_well_shortfall(HtmlReport& page, const std::filesystem::path& folder, const Model* model,
                        const Units& u) {
  page.add_heading("Well shortfall");
  if (!model || model->wells.empty()) {
    page.add_paragraph(model ? "The model has no wells."
                             : "Without the model the asked rates are not known.");
    return;
  }
  const std::filesystem::path file = folder / "budget_features.csv";
  if (!std::filesystem::exists(file)) {
    page.add_paragraph("No budget_features.csv in the results folder.");
    return;
  }
  const CsvTable features = read_csv_file(file);
  const std::vector<std::string> feature = features.texts("feature"), kind = features.texts("kind"),
                                 names = features.texts("period_name");
  const std::vector<double> index = features.numbers("period"),
                            into = features.numbers("into_aquifer"),
                            out_of = features.numbers("out_of_aquifer");
  std::vector<std::vector<std::string>> rows;
  for (std::size_t i = 0; i < feature.size() && i < kind.size() && i < index.size() &&
                          i < into.size() && i < out_of.size() && i < names.size();
       ++i) {
    if (kind[i] != "well") continue;
    const auto k = static_cast<std::size_t>(index[i]) - 1;
    if (k >= model->periods.size()) continue;
    for (const Well& w : model->wells) {
      if (w.name != feature[i]) continue;
      const double asked = w.rate.at(k, 0) * model->periods[k].length;  // positive: withdrawal
      const double delivered = out_of[i] - into[i];
      if (asked > 0.0 && asked - delivered > 1e-6 * asked)
        rows.push_back({w.name, fmt::format("{:g} {}", index[i], names[i]), table_number(asked),
                        table_number(delivered), table_number(asked - delivered),
                        fmt::format("{:.3g}", 100.0 * (asked - delivered) / asked)});
    }
  }
  if (rows.empty()) {
    page.add_paragraph("Every well delivered the withdrawal asked of it in every period.");
    return;
  }
  page.add_paragraph(
      "These wells could not deliver the withdrawal asked of them, because the "
      "aquifer at the well ran dry or nearly so; the shortfall is water not "
      "pumped.");
  page.add_table({"well", "period", fmt::format("asked ({}3)", u.length),
                  fmt::format("delivered ({}3)", u.length),
                  fmt::format("shortfall ({}3)", u.length), "shortfall (% of asked)"},
                 rows);
}

/// Period boundaries as rules and steady periods as labelled bands, for the hydrographs.
std::vector<ChartRule> period_rules(const CsvTable& periods, const Model* model) {
  const std::vector<std::string> names = periods.texts("period_name");
  const std::vector<double> index = periods.numbers("period"), start = periods.numbers("start"),
                            end = periods.numbers("end");
  std::vector<ChartRule> rules;
  double last = -1.0;
  for (std::size_t i = 0; i < names.size() && i < start.size() && i < end.size(); ++i) {
    if (index[i] == last) continue;
    last = index[i];
    const auto k = static_cast<std::size_t>(index[i]) - 1;
    if (model && k < model->periods.size() && model->periods[k].steady)
      rules.push_back({"steady: " + names[i], start[i], end[i], 0.0, true});
    if (i > 0) rules.push_back({names[i], start[i], std::nan(""), 0.0, true});
  }
  return rules;
}

int add_hydrographs(HtmlReport& page, const CsvTable& obs, const Model* model, const Units& u,
                    const std::vector<ChartRule>& rules) {
  const std::vector<std::string> names = obs.texts("observation");
  const std::vector<double> time = obs.numbers("time"), head = obs.numbers("head");
  std::vector<std::string> order;
  std::map<std::string, std::pair<std::vector<double>, std::vector<double>>> series;
  for (std::size_t i = 0; i < names.size(); ++i) {
    if (!series.count(names[i])) order.push_back(names[i]);
    series[names[i]].first.push_back(time[i]);
    series[names[i]].second.push_back(head[i]);
  }
  page.add_heading("Hydrographs at the bores");
  std::vector<BorePairs> bores;
  int measured_given = 0;
  for (const std::string& name : order) {
    const auto& [t, h] = series[name];
    std::vector<ChartSeries> s{{"simulated head", t, h, SeriesStyle::line}};
    const Observation* o = nullptr;
    if (model)
      for (const Observation& candidate : model->observations)
        if (candidate.name == name) o = &candidate;
    std::string caption = "Head at " + name;
    if (o && !o->measured.empty()) {
      ChartSeries m{"measured head", {}, {}, SeriesStyle::points};
      for (const MeasuredHead& mh : o->measured) {
        m.x.push_back(mh.time);
        m.y.push_back(mh.head);
      }
      s.push_back(m);
      measured_given += static_cast<int>(o->measured.size());
      bores.push_back({o, pair_measured_heads(o->measured, t, h)});
      caption += fmt::format(" ({} measured heads, {} inside the run)", o->measured.size(),
                             bores.back().pairs.size());
    }
    std::vector<ChartRule> r = rules;
    if (o && o->cell.valid() && model->aquifer.top.holds(std::size_t(o->cell.value)) &&
        std::isfinite(model->aquifer.top[std::size_t(o->cell.value)]))
      r.push_back({"aquifer top", 0.0, 0.0, model->aquifer.top[std::size_t(o->cell.value)], false});
    page.add_chart(caption, line_chart_spec(s, {fmt::format("time ({})", u.time)},
                                            {fmt::format("head ({})", u.length)}, 620, 240, r));
  }
  std::optional<MapExtent> extent;
  if (model)
    extent = MapExtent{model->grid.x_min(), model->grid.x_max(), model->grid.y_min(),
                       model->grid.y_max()};
  add_calibration(page, bores, measured_given, time, u, extent);
  int with_measurements = 0;
  for (const BorePairs& b : bores) with_measurements += b.pairs.empty() ? 0 : 1;
  return with_measurements;
}

/// Wells, river and drain cells and bores, to draw on every map.
std::vector<MapFeature> map_features(const Model* model) {
  std::vector<MapFeature> f;
  if (!model) return f;
  const RectilinearGrid& g = model->grid;
  auto at_cell = [&](const std::string& kind, const std::string& name, CellIndex c) {
    if (!c.valid() || c.value >= g.n_cells()) return;
    const RowCol rc = g.row_col(c);
    f.push_back({kind, name, g.x_center(rc.col), g.y_center(rc.row)});
  };
  for (const River& r : model->rivers)
    for (CellIndex c : r.cells) at_cell("river cell", r.name, c);
  for (const Drain& d : model->drains)
    for (CellIndex c : d.cells) at_cell("drain cell", d.name, c);
  for (const Well& w : model->wells) f.push_back({"well", w.name, w.x, w.y});
  for (const Observation& o : model->observations) f.push_back({"bore", o.name, o.x, o.y});
  for (const Observation& p : model->subsidence_points)
    f.push_back({"subsidence point", p.name, p.x, p.y});
  return f;
}

/// The field files to map: every output time, or those the user picked (--maps-at), or the
/// last. Throws ReportOptionError naming a picked time that no field file holds.
std::vector<std::pair<double, std::filesystem::path>> chosen_fields(
    const std::vector<std::filesystem::path>& files, const std::optional<std::vector<double>>& at,
    bool all) {
  std::vector<std::pair<double, std::filesystem::path>> timed;
  for (const auto& f : files) timed.push_back({read_field_vtr(f, "head").time, f});
  if (all) return timed;
  if (!at) return {timed.back()};
  std::vector<std::pair<double, std::filesystem::path>> chosen;
  for (double t : *at) {
    auto match = std::find_if(timed.begin(), timed.end(), [&](const auto& e) {
      return std::abs(e.first - t) <= 1e-9 * std::max(1.0, std::abs(t));
    });
    if (match == timed.end()) {
      std::string times;
      for (const auto& e : timed)
        times += fmt::format("{}{:g}", times.empty() ? "" : ", ", e.first);
      throw ReportOptionError(fmt::format(
          "--maps-at: no field file holds time {:g}; the output times are {}", t, times));
    }
    chosen.push_back(*match);
  }
  return chosen;
}

void add_maps(HtmlReport& page, const std::filesystem::path& folder, const Units& u,
              const Model* model, const ResultsReportOptions& options) {
  // A distributed run writes one .pvtr per output time over per-rank .vtr pieces.
  std::vector<std::filesystem::path> files, sets;
  for (const auto& e : std::filesystem::directory_iterator(folder)) {
    const std::string n = e.path().filename().string();
    if (n.rfind("fields_", 0) != 0) continue;
    if (e.path().extension() == ".vtr") files.push_back(e.path());
    if (e.path().extension() == ".pvtr") sets.push_back(e.path());
  }
  if (!sets.empty()) files = sets;
  std::sort(files.begin(), files.end());
  if (files.empty()) {
    if (options.maps_at)
      throw ReportOptionError(
          "--maps-at: the results folder holds no field files (fields_NNNN.vtr)");
    page.add_heading("Maps");
    page.add_paragraph("No field files (fields_NNNN.vtr) in the results folder.");
    return;
  }
  const std::vector<MapFeature> features = map_features(model);
  for (const auto& [time, f] : chosen_fields(files, options.maps_at, options.maps_at_all)) {
    const FieldMap head = read_field_vtr(f, "head"), drawdown = read_field_vtr(f, "drawdown");
    page.add_heading(fmt::format("Maps at time {:g} {}", time, u.time));
    page.add_chart(
        fmt::format("Head at time {:g} {}", time, u.time),
        heatmap_spec(head.x_edges, head.y_edges, head.values, fmt::format("head ({})", u.length),
                     u.length, "viridis", 560, features));
    page.add_chart(
        fmt::format("Drawdown from the initial head at time {:g} {} (positive: "
                    "lowered)",
                    time, u.time),
        heatmap_spec(drawdown.x_edges, drawdown.y_edges, drawdown.values,
                     fmt::format("drawdown ({})", u.length), u.length, "orangered", 560, features));
    const FieldMap state = read_field_vtr(f, "state");
    page.add_chart(fmt::format("State of each cell at time {:g} {}", time, u.time),
                   class_map_spec(state.x_edges, state.y_edges, state.values,
                                  {"dry", "water table", "confined"},
                                  {"#c9a227", "#5fb3c9", "#1b6f7a"}, u.length, 560, features));
    // Depth to water: written only for models with a land surface.
    FieldMap depth;
    bool has_depth = model != nullptr && !model->aquifer.land_surface.empty();
    try {
      if (has_depth) depth = read_field_vtr(f, "depth_to_water");
    } catch (const OutputError&) {
      has_depth = false;  // results written before the model had a land surface
    }
    if (has_depth) {
      page.add_chart(
          fmt::format("Depth to water below the land surface at time {:g} {} (negative: head "
                      "above the ground)",
                      time, u.time),
          heatmap_spec(depth.x_edges, depth.y_edges, depth.values,
                       fmt::format("depth to water ({})", u.length), u.length, "blues", 560,
                       features));
    }
    FieldMap compaction;
    try {
      compaction = read_field_vtr(f, "compaction");
    } catch (const OutputError&) {
      continue;  // older results without the array
    }
    page.add_chart(
        fmt::format("Compaction (ground sinking) since the start at time {:g} {}", time, u.time),
        heatmap_spec(compaction.x_edges, compaction.y_edges, compaction.values,
                     fmt::format("compaction ({})", u.length), u.length, "purples", 560, features));
    // Total subsidence: written only for models with interbeds.
    if (model && !model->aquifer.interbeds) continue;
    FieldMap subsidence;
    try {
      subsidence = read_field_vtr(f, "subsidence");
    } catch (const OutputError&) {
      continue;  // a model without interbeds (read --without-model), or older results
    }
    page.add_chart(
        fmt::format(
            "Subsidence (total lowering of the land surface: the aquifer's compaction "
            "and the interbeds', recoverable and permanent) since the start at time {:g} {}",
            time, u.time),
        heatmap_spec(subsidence.x_edges, subsidence.y_edges, subsidence.values,
                     fmt::format("subsidence ({})", u.length), u.length, "purples", 560, features));
  }
}

}  // namespace

std::filesystem::path report_model_path(const ResultsReportOptions& options,
                                        const std::string& summary_json) {
  if (options.without_model) return {};
  if (options.model_file) return *options.model_file;
  const std::filesystem::path recorded(json_text_value(summary_json, "model_file"));
  if (recorded.empty())
    throw ReportModelError(fmt::format(
        "{} names no model file: give the model with --model, or --without-model for a report "
        "without measured heads; no report was written",
        (options.results_folder / "summary.json").string()));
  // Summaries before results version 2 held the path as given on the command line.
  if (recorded.is_relative() && std::filesystem::exists(options.results_folder / recorded))
    return options.results_folder / recorded;
  return recorded;
}

ResultsReportSummary write_results_report(const ResultsReportOptions& options) {
  const std::filesystem::path& folder = options.results_folder;
  ResultsReportSummary summary;
  const std::string json = read_text_file(folder / "summary.json");
  Units u;
  if (auto l = json_text_value(json, "length_unit"); !l.empty()) u.length = l;
  if (auto t = json_text_value(json, "time_unit"); !t.empty()) u.time = t;
  const std::string title = json_text_value(json, "model_title");

  // Measured heads come from the model (its observations name the measured files). A model
  // that should be shown but cannot be read stops the report before anything is written.
  std::optional<Model> model;
  const std::filesystem::path model_path = report_model_path(options, json);
  if (!model_path.empty()) {
    ReadResult read = read_model_file(model_path);
    if (!read.ok()) {
      std::string why;
      for (const Diagnostic& d : read.diagnostics)
        if (d.severity == Severity::error) why += "\n  " + d.to_string();
      throw ReportModelError(fmt::format(
          "the model {} (for the measured heads) cannot be read; no report was written{}",
          model_path.string(), why));
    }
    model = std::move(*read.model);
  } else {
    summary.note = "no model file given (--without-model): no measured heads";
  }

  HtmlReport page("aquiledger results: " + (title.empty() ? folder.string() : title));
  page.add_heading("About this run");
  page.add_paragraph(fmt::format(
      "Model: {}. Title: {}. Results folder: {}. Units: length {}, "
      "time {}, volumes {}3.",
      model_path.empty() ? "not read (--without-model)" : model_path.string(),
      title.empty() ? "none given" : title, folder.string(), u.length, u.time, u.length));
  page.add_paragraph(
      "Caution: a model is a simplified picture of an aquifer built from incomplete data. It "
      "supports, and never replaces, the judgement of a licensed professional, and it does not "
      "replace the regulations in force where the aquifer lies.");
  const CsvTable budget_periods = read_csv_file(folder / "budget_periods.csv");
  add_periods(page, budget_periods, model ? &*model : nullptr, u);
  add_period_budget(page, budget_periods, u);
  const CsvTable balance_steps = read_csv_file(folder / "balance_steps.csv");
  add_step_charts(page, read_csv_file(folder / "budget_steps.csv"), balance_steps,
                  read_csv_file(folder / "balance_periods.csv"), u);
  add_converted_cells(page, balance_steps, u);
  add_well_shortfall(page, folder, model ? &*model : nullptr, u);
  // A model without observation points writes no observations.csv.
  if (const auto observations = folder / "observations.csv"; std::filesystem::exists(observations))
    summary.observations_with_measurements =
        add_hydrographs(page, read_csv_file(observations), model ? &*model : nullptr, u,
                        period_rules(budget_periods, model ? &*model : nullptr));
  else
    page.add_paragraph("The model has no observation points, so there are no hydrographs.");
  add_subsidence_section(page, folder, model ? &*model : nullptr, u.length, u.time,
                         period_rules(budget_periods, model ? &*model : nullptr));
  add_maps(page, folder, u, model ? &*model : nullptr, options);
  add_water_sources_section(page, folder);
  page.write(options.output_file);
  summary.charts = page.charts();
  return summary;
}

}  // namespace aquiledger
