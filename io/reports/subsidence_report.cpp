#include "io/reports/subsidence_report.hpp"

#include <fmt/format.h>

#include <map>

#include "io/files/csv_table.hpp"
#include "postproc/calibration_statistics.hpp"

namespace aquiledger {

namespace {

/// "not defined" for a statistic that has none (no pair), else 4 significant digits.
std::string statistic(const std::optional<double>& v) {
  return v ? fmt::format("{:.4g}", *v) : std::string("not defined");
}

}  // namespace

bool add_subsidence_section(HtmlReport& page, const std::filesystem::path& folder,
                            const Model* model, const std::string& length_unit,
                            const std::string& time_unit, const std::vector<ChartRule>& rules) {
  const std::filesystem::path file = folder / "subsidence_points.csv";
  if (!std::filesystem::exists(file) || (model && !model->aquifer.interbeds)) return false;
  const CsvTable table = read_csv_file(file);
  const std::vector<std::string> names = table.texts("point");
  const std::vector<double> time = table.numbers("time"), sunk = table.numbers("subsidence");
  std::vector<std::string> order;
  std::map<std::string, std::pair<std::vector<double>, std::vector<double>>> series;
  for (std::size_t i = 0; i < names.size(); ++i) {
    if (!series.count(names[i])) order.push_back(names[i]);
    series[names[i]].first.push_back(time[i]);
    series[names[i]].second.push_back(sunk[i]);
  }
  page.add_heading("Subsidence at the subsidence points");
  page.add_paragraph(fmt::format(
      "Simulated subsidence (positive: the ground has sunk since the start of the run) at each "
      "subsidence point, as an extensometer would record it, with the measured readings given "
      "in the model. Residual = simulated - measured subsidence at the measured times inside "
      "the run (simulated values interpolated linearly in time); negative: the model sinks "
      "less than the ground did. Units: {}.",
      length_unit));
  std::vector<std::vector<std::string>> rows;
  for (const std::string& name : order) {
    const auto& [t, s] = series[name];
    std::vector<ChartSeries> lines{{"simulated subsidence", t, s, SeriesStyle::line}};
    const Observation* point = nullptr;
    if (model)
      for (const Observation& candidate : model->subsidence_points)
        if (candidate.name == name) point = &candidate;
    std::string caption = "Subsidence at " + name;
    if (point && !point->measured.empty()) {
      ChartSeries m{"measured subsidence", {}, {}, SeriesStyle::points};
      for (const MeasuredHead& reading : point->measured) {
        m.x.push_back(reading.time);
        m.y.push_back(reading.head);
      }
      lines.push_back(m);
      const std::vector<HeadPair> pairs = pair_measured_heads(point->measured, t, s);
      const CalibrationStatistics st = calibration_statistics(pairs, 0.0);
      caption += fmt::format(" ({} measured values, {} inside the run)", point->measured.size(),
                             pairs.size());
      rows.push_back({name, std::to_string(st.count), statistic(st.mean_error),
                      statistic(st.mean_absolute_error), statistic(st.rmse)});
    }
    page.add_chart(caption,
                   line_chart_spec(lines, {fmt::format("time ({})", time_unit)},
                                   {fmt::format("subsidence ({})", length_unit)}, 620, 240, rules));
  }
  if (rows.empty()) {
    page.add_paragraph(
        "No measured subsidence was given for the points, so the model is not compared with "
        "measurements.");
  } else {
    page.add_table({"point", "measured values used", fmt::format("mean error ({})", length_unit),
                    fmt::format("mean absolute error ({})", length_unit),
                    fmt::format("RMSE ({})", length_unit)},
                   rows);
  }
  return true;
}

}  // namespace aquiledger
