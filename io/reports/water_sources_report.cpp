#include "io/reports/water_sources_report.hpp"

#include <fmt/format.h>

#include <cmath>
#include <map>

#include "io/files/csv_table.hpp"
#include "io/reports/vega_charts.hpp"
#include "postproc/water_sources.hpp"

namespace aquiledger {

namespace {

/// In alphabetical order, the order the bar chart gives its colours, so that the line chart
/// colours each group the same way.
constexpr const char* groups[] = {"boundaries", "other stresses", "rivers and drains", "storage"};

std::string share_text(double v) { return std::isfinite(v) ? fmt::format("{:.3f}", v) : "-"; }

}  // namespace

bool add_water_sources_section(HtmlReport& page, const std::filesystem::path& folder) {
  const std::filesystem::path file = folder / "water_sources.csv";
  if (!std::filesystem::exists(file)) return false;
  const CsvTable t = read_csv_file(file);
  const std::vector<double> period = t.numbers("period"), end = t.numbers("end");
  const std::vector<double> volume = t.numbers("volume"),
                            cumulative = t.numbers("cumulative_volume");
  const std::vector<double> pumped = t.numbers("pumped_volume");
  const std::vector<double> cumulative_pumped = t.numbers("cumulative_pumped_volume");
  const std::vector<std::string> name = t.texts("period_name"), source = t.texts("source");
  const std::vector<std::string> feature = t.texts("feature"), unit = t.texts("volume_unit");
  const std::size_t n = source.size();
  if (period.size() != n || volume.size() != n || cumulative.size() != n || pumped.size() != n ||
      cumulative_pumped.size() != n || end.size() != n)
    return false;

  // Shares by group: per period (bars) and cumulative (lines against the period end time).
  std::vector<BarValue> bars;
  std::map<std::string, ChartSeries> lines;
  std::map<std::pair<double, std::string>, std::pair<double, double>>
      by_group;  // volume, cumulative
  std::map<double, std::tuple<std::string, double, double, double>>
      periods;  // name, end, pumped, cum.
  for (std::size_t i = 0; i < n; ++i) {
    auto& g = by_group[{period[i], std::string(source_group(source[i]))}];
    g.first += volume[i];
    g.second += cumulative[i];
    periods[period[i]] = {name[i], end[i], pumped[i], cumulative_pumped[i]};
  }
  for (const auto& [p, info] : periods) {
    const auto& [pname, pend, ppumped, pcum] = info;
    for (const char* g : groups) {
      const auto found = by_group.find({p, g});
      if (found == by_group.end()) continue;
      const double s = share_of(found->second.first, ppumped);
      if (std::isfinite(s) && s != 0.0) bars.push_back({fmt::format("{:g} {}", p, pname), g, s});
      ChartSeries& line = lines[g];
      line.label = g;
      line.x.push_back(pend);
      line.y.push_back(share_of(found->second.second, pcum));
    }
  }
  const std::string vu = unit.empty() ? "" : unit.front();
  const std::vector<std::string> rate_unit = t.texts("rate_unit");
  const std::string tu = rate_unit.empty() || rate_unit.front().find('/') == std::string::npos
                             ? std::string("model time unit")
                             : rate_unit.front().substr(rate_unit.front().find('/') + 1);
  page.add_heading("Sources of the chosen wells' water");
  page.add_paragraph(
      "The difference between a run with the chosen wells and one without them (Theis, 1940; "
      "Barlow and Leake, 2012): a positive share is water the pumping took from storage or "
      "drew from (or kept from leaving through) a river, drain or boundary. The shares of a "
      "period sum to one. Periods in which the chosen wells pump nothing have no share.");
  page.add_chart("Share of the water pumped in each period, by source",
                 stacked_bar_spec(bars, "stress period", "share of the volume pumped (-)"));
  std::vector<ChartSeries> series;
  for (const char* g : groups)
    if (lines.count(g)) series.push_back(lines[g]);
  page.add_chart("Share of the water pumped since the start, at the end of each period",
                 line_chart_spec(series, {fmt::format("time at the end of the period ({})", tu)},
                                 {"share of the volume pumped (-)"}));
  // The same in numbers, per period.
  std::vector<std::vector<std::string>> period_rows;
  for (const auto& [p, info] : periods) {
    const auto& [pname, pend, ppumped, pcum] = info;
    std::vector<std::string> row{fmt::format("{:g}", p), pname, fmt::format("{:.4g}", ppumped)};
    for (const char* g : groups) {
      const auto found = by_group.find({p, g});
      row.push_back(
          share_text(found == by_group.end() ? 0.0 : share_of(found->second.first, ppumped)));
    }
    period_rows.push_back(row);
  }
  std::vector<std::string> header{"period", "name", fmt::format("pumped ({})", vu)};
  for (const char* g : groups) header.push_back(fmt::format("share from {} (-)", g));
  page.add_table(header, period_rows);
  // Cumulative to the end of the last period, every source.
  std::vector<std::vector<std::string>> rows;
  const double last = periods.empty() ? 0.0 : periods.rbegin()->first;
  const double last_pumped = periods.empty() ? 0.0 : std::get<3>(periods.rbegin()->second);
  for (std::size_t i = 0; i < n; ++i)
    if (period[i] == last)
      rows.push_back({source[i], feature[i], std::string(source_group(source[i])),
                      fmt::format("{:.4g}", cumulative[i]),
                      share_text(share_of(cumulative[i], last_pumped))});
  page.add_table({"source", "feature", "group", fmt::format("volume since the start ({})", vu),
                  "share of the volume pumped (-)"},
                 rows);
  return true;
}

}  // namespace aquiledger
