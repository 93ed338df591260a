#include "io/reports/results_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "io/files/csv_table.hpp"
#include "io/files/output_error.hpp"
#include "io/model_file/model_reader.hpp"
#include "io/reports/html_report.hpp"
#include "io/reports/vega_charts.hpp"
#include "io/reports/water_sources_report.hpp"
#include "io/results/vtk_fields.hpp"
#include "postproc/observation_sampler.hpp"
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

/// Per-period volumes by component: into the aquifer stacked up, out of it stacked down.
void add_period_budget(HtmlReport& page, const CsvTable& periods, const Units& u) {
  const std::vector<std::string> names = periods.texts("period_name");
  const std::vector<double> index = periods.numbers("period");
  std::vector<BarValue> bars;
  for (const auto& [component, s] : by_component(periods)) {
    if (component == "total") continue;
    for (std::size_t k = 0; k < s.rows.size(); ++k) {
      const std::size_t row = s.rows[k];
      const std::string cat = fmt::format("{} {}", index[row], names[row]);
      if (s.into[k] != 0.0) bars.push_back({cat, component, s.into[k]});
      if (s.out_of[k] != 0.0) bars.push_back({cat, component, -s.out_of[k]});
    }
  }
  page.add_heading("Water budget by stress period");
  page.add_chart(
      "Volume by component in each period: into the aquifer (or released from storage) "
      "above zero, out of it (or taken into storage) below",
      stacked_bar_spec(bars, "stress period", fmt::format("volume ({}3)", u.length)));
}

void add_step_charts(HtmlReport& page, const CsvTable& steps, const CsvTable& balance,
                     const Units& u) {
  const std::vector<double> time = steps.numbers("time");
  const std::map<std::string, ComponentSeries> series = by_component(steps);
  std::vector<ChartSeries> storage;
  const std::pair<const char*, const char*> mechanisms[] = {
      {"storage_skeleton", "skeleton compression"},
      {"storage_water", "water expansion"},
      {"storage_elastic", "elastic (undivided)"},
      {"storage_drainage", "drainage of pores"}};
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
  page.add_chart("Imbalance of each step, 100 (into - out of the aquifer) / their mean",
                 line_chart_spec({{"imbalance", step_time, balance.numbers("imbalance_percent"),
                                   SeriesStyle::points}},
                                 {fmt::format("time ({})", u.time)}, {"imbalance (%)"}, 620, 200));
}

int add_hydrographs(HtmlReport& page, const CsvTable& obs, const Model* model, const Units& u) {
  const std::vector<std::string> names = obs.texts("observation");
  const std::vector<double> time = obs.numbers("time"), head = obs.numbers("head");
  std::vector<std::string> order;
  std::map<std::string, std::pair<std::vector<double>, std::vector<double>>> series;
  for (std::size_t i = 0; i < names.size(); ++i) {
    if (!series.count(names[i])) order.push_back(names[i]);
    series[names[i]].first.push_back(time[i]);
    series[names[i]].second.push_back(head[i]);
  }
  page.add_heading("Hydrographs at the observations");
  std::vector<std::vector<std::string>> stats_rows;
  int with_measurements = 0;
  for (const std::string& name : order) {
    const auto& [t, h] = series[name];
    std::vector<ChartSeries> s{{"simulated", t, h, SeriesStyle::line}};
    const Observation* o = nullptr;
    if (model)
      for (const Observation& candidate : model->observations)
        if (candidate.name == name) o = &candidate;
    std::string caption = "Head at " + name;
    if (o && !o->measured.empty()) {
      ChartSeries m{"measured", {}, {}, SeriesStyle::points};
      for (const MeasuredHead& mh : o->measured) {
        m.x.push_back(mh.time);
        m.y.push_back(mh.head);
      }
      s.push_back(m);
      const ResidualStatistics r = residual_statistics(o->measured, t, h);
      stats_rows.push_back({name, std::to_string(r.count), fmt::format("{:.3g}", r.mean_error),
                            fmt::format("{:.3g}", r.rmse), fmt::format("{:.3g}", r.scaled_rmse)});
      caption += fmt::format(": {} measured heads, mean error {:.3g} {}, RMSE {:.3g} {}", r.count,
                             r.mean_error, u.length, r.rmse, u.length);
      ++with_measurements;
    }
    page.add_chart(caption, line_chart_spec(s, {fmt::format("time ({})", u.time)},
                                            {fmt::format("head ({})", u.length)}, 620, 220));
  }
  if (!stats_rows.empty()) {
    page.add_heading("Residual statistics (simulated minus measured)");
    page.add_table({"observation", "measured heads", fmt::format("mean error ({})", u.length),
                    fmt::format("RMSE ({})", u.length), "scaled RMSE (-)"},
                   stats_rows);
  }
  return with_measurements;
}

void add_maps(HtmlReport& page, const std::filesystem::path& folder, const Units& u) {
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
    page.add_heading("Maps");
    page.add_paragraph("No field files (fields_NNNN.vtr) in the results folder.");
    return;
  }
  std::vector<std::filesystem::path> chosen{files[files.size() / 2]};
  if (files.size() > 1 && files.back() != chosen.front()) chosen.push_back(files.back());
  for (const auto& f : chosen) {
    const FieldMap head = read_field_vtr(f, "head"), drawdown = read_field_vtr(f, "drawdown");
    page.add_heading(
        fmt::format("Maps at t = {:g} {} ({})", head.time, u.time, f.filename().string()));
    page.add_chart(fmt::format("Head at t = {:g} {}", head.time, u.time),
                   heatmap_spec(head.x_edges, head.y_edges, head.values,
                                fmt::format("head ({})", u.length), u.length, "viridis"));
    page.add_chart(fmt::format("Drawdown from the initial head at t = {:g} {}", head.time, u.time),
                   heatmap_spec(drawdown.x_edges, drawdown.y_edges, drawdown.values,
                                fmt::format("drawdown ({})", u.length), u.length, "orangered"));
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
  page.add_paragraph(fmt::format("Results folder {}; model {}. Units: length {}, time {}.",
                                 folder.string(), model_path.string(), u.length, u.time));
  add_period_budget(page, read_csv_file(folder / "budget_periods.csv"), u);
  add_step_charts(page, read_csv_file(folder / "budget_steps.csv"),
                  read_csv_file(folder / "balance_steps.csv"), u);
  // A model without observation points writes no observations.csv.
  if (const auto observations = folder / "observations.csv"; std::filesystem::exists(observations))
    summary.observations_with_measurements =
        add_hydrographs(page, read_csv_file(observations), model ? &*model : nullptr, u);
  else
    page.add_paragraph("The model has no observation points, so there are no hydrographs.");
  add_maps(page, folder, u);
  add_water_sources_section(page, folder);
  page.write(options.output_file);
  summary.charts = page.charts();
  return summary;
}

}  // namespace aquiledger
