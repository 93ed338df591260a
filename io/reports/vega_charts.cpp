#include "io/reports/vega_charts.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "io/files/text_encoding.hpp"

namespace aquiledger {

std::string vega_json_number(double v) { return json_number(v); }

std::string vega_json_string(const std::string& s) { return json_string_for_html(s); }

namespace {

// Our palette: deep teal, burnt orange, slate blue, olive, plum, ochre, brick, grey-green.
constexpr const char* palette =
    R"J(["#1b6f7a","#d2691e","#4a5fa8","#7a8b2a","#8e4585","#c9a227","#a63d32","#6b8f71",)J"
    R"J("#3f3f3f","#e08fa0","#5fb3c9","#9c6b30"])J";

std::string axis_scale(const std::string& name, const std::string& data, const std::string& field,
                       const std::string& range, bool log) {
  return fmt::format(
      R"J({{"name":"{}","type":"{}","domain":{{"data":"{}","field":"{}"}},"range":"{}","nice":true,"zero":false}})J",
      name, log ? "log" : "linear", data, field, range);
}

}  // namespace

std::string line_chart_spec(const std::vector<ChartSeries>& series, const AxisOptions& x,
                            const AxisOptions& y, int width, int height) {
  std::string lines = "[", points = "[", all = "[", labels = "[";
  for (const ChartSeries& s : series) {
    if (labels.size() > 1) labels += ",";
    labels += vega_json_string(s.label);
    std::string& target = s.style == SeriesStyle::line ? lines : points;
    const std::size_t n = std::min(s.x.size(), s.y.size());
    for (std::size_t i = 0; i < n; ++i) {
      if (!std::isfinite(s.x[i]) || !std::isfinite(s.y[i])) continue;
      if ((x.log && s.x[i] <= 0.0) || (y.log && s.y[i] <= 0.0)) continue;
      const std::string row =
          fmt::format(R"J({{"s":{},"x":{},"y":{},"i":{}}})J", vega_json_string(s.label),
                      vega_json_number(s.x[i]), vega_json_number(s.y[i]), i);
      if (target.size() > 1) target += ",";
      target += row;
      if (all.size() > 1) all += ",";
      all += row;
    }
  }
  lines += "]", points += "]", all += "]", labels += "]";
  return fmt::format(
      R"J({{"$schema":"https://vega.github.io/schema/vega/v5.json","width":{w},"height":{h},"padding":8,)J"
      R"J("data":[{{"name":"all","values":{all}}},{{"name":"lines","values":{lines}}},{{"name":"points","values":{points}}}],)J"
      R"J("scales":[{xs},{ys},{{"name":"colour","type":"ordinal","domain":{labels},"range":{palette}}}],)J"
      R"J("axes":[{{"orient":"bottom","scale":"x","title":{xt},"grid":true,"gridOpacity":0.25}},)J"
      R"J({{"orient":"left","scale":"y","title":{yt},"grid":true,"gridOpacity":0.25}}],)J"
      R"J("legends":[{{"stroke":"colour","fill":"colour","orient":"top-right","title":null}}],)J"
      R"J("marks":[{{"type":"group","from":{{"facet":{{"name":"one","data":"lines","groupby":"s"}}}},)J"
      R"J("marks":[{{"type":"line","from":{{"data":"one"}},"sort":{{"field":"datum.i"}},"encode":{{"enter":{{)J"
      R"J("x":{{"scale":"x","field":"x"}},"y":{{"scale":"y","field":"y"}},"stroke":{{"scale":"colour","field":"s"}},"strokeWidth":{{"value":2}}}}}}}}]}},)J"
      R"J({{"type":"symbol","from":{{"data":"points"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x"}},)J"
      R"J("y":{{"scale":"y","field":"y"}},"stroke":{{"scale":"colour","field":"s"}},"fill":{{"value":"transparent"}},)J"
      R"J("size":{{"value":30}},"strokeWidth":{{"value":1.5}}}}}}}}]}})J",
      fmt::arg("w", width), fmt::arg("h", height), fmt::arg("all", all), fmt::arg("lines", lines),
      fmt::arg("points", points), fmt::arg("xs", axis_scale("x", "all", "x", "width", x.log)),
      fmt::arg("ys", axis_scale("y", "all", "y", "height", y.log)), fmt::arg("labels", labels),
      fmt::arg("palette", palette), fmt::arg("xt", vega_json_string(x.title)),
      fmt::arg("yt", vega_json_string(y.title)));
}

std::string stacked_bar_spec(const std::vector<BarValue>& values, const std::string& x_title,
                             const std::string& y_title, int width, int height) {
  std::string rows = "[", categories = "[";
  std::vector<std::string> seen;
  for (const BarValue& v : values) {
    if (!std::isfinite(v.value)) continue;
    if (rows.size() > 1) rows += ",";
    rows += fmt::format(R"J({{"c":{},"g":{},"v":{}}})J", vega_json_string(v.category),
                        vega_json_string(v.segment), vega_json_number(v.value));
    if (std::find(seen.begin(), seen.end(), v.category) == seen.end()) {
      seen.push_back(v.category);
      if (categories.size() > 1) categories += ",";
      categories += vega_json_string(v.category);
    }
  }
  rows += "]", categories += "]";
  return fmt::format(
      R"J({{"$schema":"https://vega.github.io/schema/vega/v5.json","width":{w},"height":{h},"padding":8,)J"
      R"J("data":[{{"name":"bars","values":{rows},"transform":[{{"type":"stack","groupby":["c"],"field":"v","sort":{{"field":"g"}}}}]}}],)J"
      R"J("scales":[{{"name":"x","type":"band","domain":{cats},"range":"width","padding":0.2}},)J"
      R"J({{"name":"y","type":"linear","domain":{{"data":"bars","fields":["y0","y1"]}},"range":"height","nice":true,"zero":true}},)J"
      R"J({{"name":"colour","type":"ordinal","domain":{{"data":"bars","field":"g","sort":true}},"range":{palette}}}],)J"
      R"J("axes":[{{"orient":"bottom","scale":"x","title":{xt},"labelAngle":-30,"labelAlign":"right"}},)J"
      R"J({{"orient":"left","scale":"y","title":{yt},"grid":true,"gridOpacity":0.25}}],)J"
      R"J("legends":[{{"fill":"colour","orient":"right","title":"component"}}],)J"
      R"J("marks":[{{"type":"rect","from":{{"data":"bars"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"c"}},)J"
      R"J("width":{{"scale":"x","band":1}},"y":{{"scale":"y","field":"y0"}},"y2":{{"scale":"y","field":"y1"}},)J"
      R"J("fill":{{"scale":"colour","field":"g"}},"tooltip":{{"signal":"datum.g + ': ' + format(datum.v, '.4~s')"}}}}}}}},)J"
      R"J({{"type":"rule","encode":{{"enter":{{"x":{{"value":0}},"x2":{{"signal":"width"}},"y":{{"scale":"y","value":0}},"stroke":{{"value":"#222"}}}}}}}}]}})J",
      fmt::arg("w", width), fmt::arg("h", height), fmt::arg("rows", rows),
      fmt::arg("cats", categories), fmt::arg("palette", palette),
      fmt::arg("xt", vega_json_string(x_title)), fmt::arg("yt", vega_json_string(y_title)));
}

std::string heatmap_spec(const std::vector<double>& x_edges, const std::vector<double>& y_edges,
                         const std::vector<double>& values, const std::string& value_title,
                         const std::string& length_unit, const std::string& scheme, int width) {
  const std::size_t n_cols = x_edges.size() - 1, n_rows = y_edges.size() - 1;
  std::string rows = "[";
  for (std::size_t r = 0; r < n_rows; ++r)
    for (std::size_t c = 0; c < n_cols; ++c) {
      const double v = values[r * n_cols + c];
      if (!std::isfinite(v)) continue;
      if (rows.size() > 1) rows += ",";
      rows +=
          fmt::format(R"J({{"a":{},"b":{},"n":{},"s":{},"v":{}}})J", vega_json_number(x_edges[c]),
                      vega_json_number(x_edges[c + 1]), vega_json_number(y_edges[r]),
                      vega_json_number(y_edges[r + 1]), vega_json_number(v));
    }
  rows += "]";
  const double span_x = x_edges.back() - x_edges.front();
  const double span_y = y_edges.front() - y_edges.back();
  const int height = std::max(80, static_cast<int>(std::lround(width * span_y / span_x)));
  return fmt::format(
      R"J({{"$schema":"https://vega.github.io/schema/vega/v5.json","width":{w},"height":{h},"padding":8,)J"
      R"J("data":[{{"name":"cells","values":{rows}}}],)J"
      R"J("scales":[{{"name":"x","type":"linear","domain":[{x0},{x1}],"range":"width","zero":false}},)J"
      R"J({{"name":"y","type":"linear","domain":[{y0},{y1}],"range":"height","zero":false}},)J"
      R"J({{"name":"colour","type":"linear","domain":{{"data":"cells","field":"v"}},"range":{{"scheme":"{scheme}"}},"zero":false}}],)J"
      R"J("axes":[{{"orient":"bottom","scale":"x","title":"x ({lu})"}},{{"orient":"left","scale":"y","title":"y ({lu})"}}],)J"
      R"J("legends":[{{"fill":"colour","type":"gradient","title":{vt},"gradientLength":{{"signal":"height * 0.8"}}}}],)J"
      R"J("marks":[{{"type":"rect","from":{{"data":"cells"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"a"}},)J"
      R"J("x2":{{"scale":"x","field":"b"}},"y":{{"scale":"y","field":"n"}},"y2":{{"scale":"y","field":"s"}},)J"
      R"J("fill":{{"scale":"colour","field":"v"}},"tooltip":{{"signal":"format(datum.v, '.4~g')"}}}}}}}}]}})J",
      fmt::arg("w", width), fmt::arg("h", height), fmt::arg("rows", rows),
      fmt::arg("x0", vega_json_number(x_edges.front())),
      fmt::arg("x1", vega_json_number(x_edges.back())),
      fmt::arg("y0", vega_json_number(y_edges.back())),
      fmt::arg("y1", vega_json_number(y_edges.front())), fmt::arg("scheme", scheme),
      fmt::arg("lu", length_unit), fmt::arg("vt", vega_json_string(value_title)));
}

}  // namespace aquiledger
