#include "io/results_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "io/csv_table.hpp"
#include "io/html_report.hpp"
#include "io/model_reader.hpp"
#include "io/output_error.hpp"
#include "io/vega_charts.hpp"
#include "io/vtk_fields.hpp"
#include "io/water_sources_report.hpp"
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

/// Per-period volumes by component: released/in stacked up, stored/out stacked down.
void add_period_budget(HtmlReport& page, const CsvTable& periods, const Units& u) {
  const std::vector<std::string> names = periods.texts("name");
  const std::vector<double> index = periods.numbers("period");
  std::vector<BarValue> bars;
  for (std::size_t k = 0; k < n_budget_components; ++k) {
    const std::string stem(component_label(static_cast<BudgetComponent>(k)));
    const std::vector<double> in = periods.numbers(stem + "_in"), out = periods.numbers(stem + "_out");
    for (std::size_t p = 0; p < names.size() && p < in.size(); ++p) {
      const std::string cat = fmt::format("{} {}", index[p], names[p]);
      if (in[p] != 0.0) bars.push_back({cat, stem, in[p]});
      if (out[p] != 0.0) bars.push_back({cat, stem, -out[p]});
    }
  }
  page.add_heading("Water budget by stress period");
  page.add_chart("Volume by component in each period: into the aquifer (or released from storage) "
                 "above zero, out of it (or taken into storage) below",
                 stacked_bar_spec(bars, "stress period", fmt::format("volume ({}3)", u.length)));
}

void add_step_charts(HtmlReport& page, const CsvTable& steps, const Units& u) {
  const std::vector<double> time = steps.numbers("time");
  std::vector<ChartSeries> storage;
  const std::pair<const char*, const char*> mechanisms[] = {
      {"storage_skeleton", "skeleton compression"}, {"storage_water", "water expansion"},
      {"storage_elastic", "elastic (undivided)"}, {"storage_drainage", "drainage of pores"}};
  for (const auto& [stem, label] : mechanisms) {
    const std::vector<double> in = steps.numbers(std::string(stem) + "_in");
    const std::vector<double> out = steps.numbers(std::string(stem) + "_out");
    ChartSeries s{label, time, {}, SeriesStyle::line};
    bool any = false;
    for (std::size_t i = 0; i < in.size(); ++i) {
      s.y.push_back(in[i] - out[i]);
      any |= s.y.back() != 0.0;
    }
    if (any) storage.push_back(s);
  }
  page.add_heading("Storage released by mechanism");
  if (storage.empty()) storage.push_back({"no storage change", time, std::vector<double>(time.size(), 0.0)});
  page.add_chart("Net release from storage at the end of each step (negative: taken into storage)",
                 line_chart_spec(storage, {fmt::format("time ({})", u.time)},
                                 {fmt::format("release rate ({}3/{})", u.length, u.time)}));
  page.add_heading("Mass balance");
  page.add_chart("Budget discrepancy of each step, 100 (in - out) / ((in + out) / 2)",
                 line_chart_spec({{"discrepancy", time, steps.numbers("discrepancy_percent"),
                                   SeriesStyle::points}},
                                 {fmt::format("time ({})", u.time)}, {"discrepancy (%)"}, 620, 200));
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
    page.add_heading(fmt::format("Maps at t = {:g} {} ({})", head.time, u.time, f.filename().string()));
    page.add_chart(fmt::format("Head at t = {:g} {}", head.time, u.time),
                   heatmap_spec(head.x_edges, head.y_edges, head.values,
                                fmt::format("head ({})", u.length), u.length, "viridis"));
    page.add_chart(fmt::format("Drawdown from the initial head at t = {:g} {}", head.time, u.time),
                   heatmap_spec(drawdown.x_edges, drawdown.y_edges, drawdown.values,
                                fmt::format("drawdown ({})", u.length), u.length, "orangered"));
  }
}

}  // namespace

ResultsReportSummary write_results_report(const ResultsReportOptions& options) {
  const std::filesystem::path& folder = options.results_folder;
  ResultsReportSummary summary;
  const std::string json = read_text_file(folder / "summary.json");
  Units u;
  if (auto l = json_text_value(json, "length_unit"); !l.empty()) u.length = l;
  if (auto t = json_text_value(json, "time_unit"); !t.empty()) u.time = t;
  const std::string title = json_text_value(json, "model_title");

  // Measured heads come from the model (its observations name the measured files).
  std::optional<Model> model;
  std::filesystem::path model_path =
      options.model_file ? *options.model_file : std::filesystem::path(json_text_value(json, "model_file"));
  if (!model_path.empty() && !std::filesystem::exists(model_path) && model_path.is_relative() &&
      std::filesystem::exists(folder / model_path))
    model_path = folder / model_path;
  if (!model_path.empty()) {
    ReadResult read = read_model_file(model_path);
    if (read.ok())
      model = std::move(*read.model);
    else
      summary.note = "the model " + model_path.string() + " could not be read: no measured heads";
  } else {
    summary.note = "no model file known: no measured heads";
  }

  HtmlReport page("aquiledger results: " + (title.empty() ? folder.string() : title));
  page.add_paragraph(fmt::format("Results folder {}; model {}. Units: length {}, time {}.",
                                 folder.string(), model_path.string(), u.length, u.time));
  add_period_budget(page, read_csv_file(folder / "budget_periods.csv"), u);
  add_step_charts(page, read_csv_file(folder / "budget_steps.csv"), u);
  summary.observations_with_measurements =
      add_hydrographs(page, read_csv_file(folder / "observations.csv"), model ? &*model : nullptr, u);
  add_maps(page, folder, u);
  add_water_sources_section(page, folder);
  page.write(options.output_file);
  summary.charts = page.charts();
  return summary;
}

}  // namespace aquiledger
