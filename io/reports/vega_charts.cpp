#include "io/reports/vega_charts.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>

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

/// A Vega expression naming datum.v's class: "names[datum.v]".
std::string name_lookup(const std::vector<std::string>& names) {
  std::string list = "[";
  for (std::size_t k = 0; k < names.size(); ++k) {
    if (k) list += ",";
    list += vega_json_string(names[k]);
  }
  return list + "][datum.v]";
}

/// An axis "format" entry: exponent form when every value is below 1e-3 in size (e.g. an
/// imbalance of 1e-10 %), so the labels are not long zero-padded decimals; empty otherwise.
std::string small_values_format(const std::vector<ChartSeries>& series, bool x_axis) {
  double largest = 0.0;
  for (const ChartSeries& s : series)
    for (double v : x_axis ? s.x : s.y)
      if (std::isfinite(v)) largest = std::max(largest, std::abs(v));
  return largest > 0.0 && largest < 1e-3 ? R"J(,"format":"~e")J" : "";
}

/// The axis entries of a count: no tick between whole numbers, integer labels.
constexpr const char* whole_number_ticks = R"J(,"tickMinStep":1,"format":"d")J";

std::string y_scale_with_rules(bool log) {
  return fmt::format(
      R"J({{"name":"y","type":"{}","domain":{{"fields":[{{"data":"all","field":"y"}},{{"data":"hrules","field":"y"}}]}},"range":"height","nice":true,"zero":false}})J",
      log ? "log" : "linear");
}

}  // namespace

std::string line_chart_spec(const std::vector<ChartSeries>& series, const AxisOptions& x,
                            const AxisOptions& y, int width, int height,
                            const std::vector<ChartRule>& rules) {
  std::string vrules = "[", bands = "[", hrules = "[";
  for (const ChartRule& r : rules) {
    std::string& target = !r.vertical ? hrules : std::isnan(r.x1) ? vrules : bands;
    if (target.size() > 1) target += ",";
    // n: the next vertical rule to the right, so a rule's label is cut short before it.
    double next = std::numeric_limits<double>::quiet_NaN();
    for (const ChartRule& other : rules)
      if (other.vertical && std::isnan(other.x1) && other.x0 > r.x0 && !(other.x0 >= next))
        next = other.x0;
    target += fmt::format(R"J({{"t":{},"x0":{},"x1":{},"y":{},"n":{}}})J",
                          vega_json_string(r.label), vega_json_number(r.x0), vega_json_number(r.x1),
                          vega_json_number(r.y), vega_json_number(next));
  }
  vrules += "]", bands += "]", hrules += "]";
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
      R"J("data":[{{"name":"all","values":{all}}},{{"name":"lines","values":{lines}}},{{"name":"points","values":{points}}},)J"
      R"J({{"name":"vrules","values":{vrules}}},{{"name":"bands","values":{bands}}},{{"name":"hrules","values":{hrules}}}],)J"
      R"J("scales":[{xs},{ys},{{"name":"colour","type":"ordinal","domain":{labels},"range":{palette}}}],)J"
      R"J("axes":[{{"orient":"bottom","scale":"x","title":{xt},"grid":true,"gridOpacity":0.25{xf}}},)J"
      R"J({{"orient":"left","scale":"y","title":{yt},"grid":true,"gridOpacity":0.25{yf}}}],)J"
      R"J("legends":[{{"stroke":"colour","fill":"colour","orient":"right","title":null}}],)J"
      R"J("marks":[{{"type":"rect","from":{{"data":"bands"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x0"}},"x2":{{"scale":"x","field":"x1"}},)J"
      R"J("y":{{"value":0}},"y2":{{"signal":"height"}},"fill":{{"value":"#c9a227"}},"fillOpacity":{{"value":0.15}}}}}}}},)J"
      R"J({{"type":"text","from":{{"data":"bands"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x0","offset":3}},"y":{{"value":11}},)J"
      R"J("text":{{"field":"t"}},"fontSize":{{"value":10}},"fill":{{"value":"#7a5d00"}},)J"
      R"J("limit":{{"signal":"max(scale('x', datum.x1) - scale('x', datum.x0) - 6, 12)"}}}}}}}},)J"
      R"J({{"type":"rule","from":{{"data":"vrules"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x0"}},"y":{{"value":0}},"y2":{{"signal":"height"}},)J"
      R"J("stroke":{{"value":"#888"}},"strokeDash":{{"value":[4,3]}}}}}}}},)J"
      R"J({{"type":"text","from":{{"data":"vrules"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x0","offset":3}},"y":{{"signal":"height","offset":-4}},)J"
      R"J("text":{{"field":"t"}},"fontSize":{{"value":9}},"fill":{{"value":"#555"}},)J"
      R"J("limit":{{"signal":"(datum.n == null ? width : scale('x', datum.n)) - scale('x', datum.x0) - 6"}}}}}}}},)J"
      R"J({{"type":"rule","from":{{"data":"hrules"}},"encode":{{"enter":{{"y":{{"scale":"y","field":"y"}},"x":{{"value":0}},"x2":{{"signal":"width"}},)J"
      R"J("stroke":{{"value":"#8e4585"}},"strokeWidth":{{"value":1.5}}}}}}}},)J"
      R"J({{"type":"text","from":{{"data":"hrules"}},"encode":{{"enter":{{"y":{{"scale":"y","field":"y","offset":-4}},"x":{{"value":4}},)J"
      R"J("text":{{"field":"t"}},"fontSize":{{"value":10}},"fill":{{"value":"#8e4585"}}}}}}}},)J"
      R"J({{"type":"group","from":{{"facet":{{"name":"one","data":"lines","groupby":"s"}}}},)J"
      R"J("marks":[{{"type":"line","from":{{"data":"one"}},"sort":{{"field":"datum.i"}},"encode":{{"enter":{{)J"
      R"J("x":{{"scale":"x","field":"x"}},"y":{{"scale":"y","field":"y"}},"stroke":{{"scale":"colour","field":"s"}},"strokeWidth":{{"value":2}}}}}}}}]}},)J"
      R"J({{"type":"symbol","from":{{"data":"points"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x"}},)J"
      R"J("y":{{"scale":"y","field":"y"}},"stroke":{{"scale":"colour","field":"s"}},"fill":{{"value":"transparent"}},)J"
      R"J("size":{{"value":30}},"strokeWidth":{{"value":1.5}}}}}}}}]}})J",
      fmt::arg("w", width), fmt::arg("h", height), fmt::arg("all", all), fmt::arg("lines", lines),
      fmt::arg("points", points), fmt::arg("xs", axis_scale("x", "all", "x", "width", x.log)),
      fmt::arg("ys", hrules.size() > 2 ? y_scale_with_rules(y.log)
                                       : axis_scale("y", "all", "y", "height", y.log)),
      fmt::arg("vrules", vrules), fmt::arg("bands", bands), fmt::arg("hrules", hrules),
      fmt::arg("labels", labels), fmt::arg("palette", palette),
      fmt::arg("xt", vega_json_string(x.title)), fmt::arg("yt", vega_json_string(y.title)),
      fmt::arg("xf", x.whole ? whole_number_ticks : small_values_format(series, true)),
      fmt::arg("yf", y.whole ? whole_number_ticks : small_values_format(series, false)));
}

std::string stacked_bar_spec(const std::vector<BarValue>& values, const std::string& x_title,
                             const std::string& y_title, int width, int height,
                             const std::string& legend_title) {
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
      R"J({legends})J"
      R"J("marks":[{{"type":"rect","from":{{"data":"bars"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"c"}},)J"
      R"J("width":{{"scale":"x","band":1}},"y":{{"scale":"y","field":"y0"}},"y2":{{"scale":"y","field":"y1"}},)J"
      R"J("fill":{{"scale":"colour","field":"g"}},"tooltip":{{"signal":"datum.g + ': ' + format(datum.v, '.4~s')"}}}}}}}},)J"
      R"J({{"type":"rule","encode":{{"enter":{{"x":{{"value":0}},"x2":{{"signal":"width"}},"y":{{"scale":"y","value":0}},"stroke":{{"value":"#222"}}}}}}}}]}})J",
      fmt::arg("w", width), fmt::arg("h", height), fmt::arg("rows", rows),
      fmt::arg("cats", categories), fmt::arg("palette", palette),
      fmt::arg("xt", vega_json_string(x_title)), fmt::arg("yt", vega_json_string(y_title)),
      fmt::arg("legends", legend_title.empty()
                              ? std::string()
                              : R"("legends":[{"fill":"colour","orient":"right","title":)" +
                                    vega_json_string(legend_title) + "}],"));
}

namespace {

std::string feature_rows(const std::vector<MapFeature>& features) {
  std::string rows = "[";
  for (const MapFeature& f : features) {
    if (rows.size() > 1) rows += ",";
    rows += fmt::format(R"J({{"k":{},"t":{},"x":{},"y":{}}})J", vega_json_string(f.kind),
                        vega_json_string(f.label), vega_json_number(f.x), vega_json_number(f.y));
  }
  return rows + "]";
}

/// Cells as rectangles with a colour scale (given as JSON), features on top with their own
/// legend (shape and colour by kind).
std::string cell_map_spec(const std::vector<double>& x_edges, const std::vector<double>& y_edges,
                          const std::vector<double>& values, const std::string& colour_scale,
                          const std::string& colour_legend, const std::string& length_unit,
                          int width, const std::vector<MapFeature>& features) {
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
      R"J("data":[{{"name":"cells","values":{rows}}},{{"name":"features","values":{features}}}],)J"
      R"J("scales":[{{"name":"x","type":"linear","domain":[{x0},{x1}],"range":"width","zero":false}},)J"
      R"J({{"name":"y","type":"linear","domain":[{y0},{y1}],"range":"height","zero":false}},)J"
      R"J({colour},)J"
      R"J({{"name":"kind","type":"ordinal","domain":["well","river cell","drain cell","bore","subsidence point"],"range":["circle","square","diamond","triangle-up","cross"]}},)J"
      R"J({{"name":"kindcolour","type":"ordinal","domain":["well","river cell","drain cell","bore","subsidence point"],"range":["#d00000","#1f5fd6","#2e8b57","#ffffff","#f2c500"]}}],)J"
      R"J("axes":[{{"orient":"bottom","scale":"x","title":"x ({lu})"}},{{"orient":"left","scale":"y","title":"y ({lu})"}}],)J"
      R"J("legends":[{legend},{{"shape":"kind","fill":"kindcolour","title":"drawn on the map","orient":"right","symbolStrokeColor":"#222"}}],)J"
      R"J("marks":[{{"type":"rect","from":{{"data":"cells"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"a"}},)J"
      R"J("x2":{{"scale":"x","field":"b"}},"y":{{"scale":"y","field":"n"}},"y2":{{"scale":"y","field":"s"}},)J"
      R"J("fill":{{"scale":"colour","field":"v"}},"tooltip":{{"signal":"format(datum.v, '.4~g')"}}}}}}}},)J"
      R"J({{"type":"symbol","from":{{"data":"features"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x"}},"y":{{"scale":"y","field":"y"}},)J"
      R"J("shape":{{"scale":"kind","field":"k"}},"fill":{{"scale":"kindcolour","field":"k"}},"stroke":{{"value":"#222"}},"size":{{"value":60}},)J"
      R"J("tooltip":{{"signal":"datum.k + ': ' + datum.t"}}}}}}}}]}})J",
      fmt::arg("w", width), fmt::arg("h", height), fmt::arg("rows", rows),
      fmt::arg("features", feature_rows(features)),
      fmt::arg("x0", vega_json_number(x_edges.front())),
      fmt::arg("x1", vega_json_number(x_edges.back())),
      fmt::arg("y0", vega_json_number(y_edges.back())),
      fmt::arg("y1", vega_json_number(y_edges.front())), fmt::arg("colour", colour_scale),
      fmt::arg("legend", colour_legend), fmt::arg("lu", length_unit));
}

}  // namespace

std::string heatmap_spec(const std::vector<double>& x_edges, const std::vector<double>& y_edges,
                         const std::vector<double>& values, const std::string& value_title,
                         const std::string& length_unit, const std::string& scheme, int width,
                         const std::vector<MapFeature>& features) {
  return cell_map_spec(
      x_edges, y_edges, values,
      fmt::format(
          R"J({{"name":"colour","type":"linear","domain":{{"data":"cells","field":"v"}},"range":{{"scheme":"{}"}},"zero":false,"nice":true}})J",
          scheme),
      fmt::format(
          R"J({{"fill":"colour","type":"gradient","title":{},"format":".4~g","gradientLength":{{"signal":"height * 0.6"}}}})J",
          vega_json_string(value_title)),
      length_unit, width, features);
}

std::string class_map_spec(const std::vector<double>& x_edges, const std::vector<double>& y_edges,
                           const std::vector<double>& values,
                           const std::vector<std::string>& class_names,
                           const std::vector<std::string>& class_colours,
                           const std::string& length_unit, int width,
                           const std::vector<MapFeature>& features) {
  // Class numbers become their names, so the legend reads in plain words.
  std::vector<double> codes(values.size(), std::nan(""));
  for (std::size_t i = 0; i < values.size(); ++i)
    if (std::isfinite(values[i]) && values[i] >= 0.0 && values[i] < double(class_names.size()))
      codes[i] = values[i];
  std::string names = "[", colours = "[";
  for (std::size_t k = 0; k < class_names.size(); ++k) {
    if (k) names += ",", colours += ",";
    names += vega_json_string(class_names[k]);
    colours += vega_json_string(k < class_colours.size() ? class_colours[k] : "#999");
  }
  names += "]", colours += "]";
  std::string spec = cell_map_spec(
      x_edges, y_edges, codes,
      fmt::format(R"J({{"name":"colour","type":"ordinal","domain":{},"range":{}}})J", names,
                  colours),
      R"J({"fill":"colour","title":"cell state","orient":"right"})J", length_unit, width, features);
  // Colour by the class name: each cell's value v is the class number.
  const std::string by_value = R"J("fill":{"scale":"colour","field":"v"})J";
  const std::size_t at = spec.find(by_value);
  if (at != std::string::npos)
    spec.replace(at, by_value.size(),
                 R"J("fill":{"scale":"colour","signal":)J" +
                     vega_json_string(name_lookup(class_names)) + "}");
  return spec;
}

std::string residual_map_spec(const std::vector<MapPoint>& points, const std::string& value_title,
                              const std::string& length_unit, int width, int height,
                              const std::optional<MapExtent>& extent) {
  std::string rows = "[";
  double largest = 0.0;
  for (const MapPoint& p : points) {
    if (!std::isfinite(p.value)) continue;
    if (rows.size() > 1) rows += ",";
    rows += fmt::format(R"J({{"b":{},"x":{},"y":{},"v":{}}})J", vega_json_string(p.label),
                        vega_json_number(p.x), vega_json_number(p.y), vega_json_number(p.value));
    largest = std::max(largest, std::abs(p.value));
  }
  rows += "]";
  if (largest == 0.0) largest = 1.0;
  std::string x_domain = R"J({"data":"bores","field":"x"},"nice":true,"padding":30)J";
  std::string y_domain = R"J({"data":"bores","field":"y"},"nice":true,"padding":30)J";
  if (extent && extent->x_max > extent->x_min && extent->y_max > extent->y_min) {
    x_domain =
        fmt::format("[{},{}]", vega_json_number(extent->x_min), vega_json_number(extent->x_max));
    y_domain =
        fmt::format("[{},{}]", vega_json_number(extent->y_min), vega_json_number(extent->y_max));
    height = static_cast<int>(
        std::lround(width * (extent->y_max - extent->y_min) / (extent->x_max - extent->x_min)));
  }
  return fmt::format(
      R"J({{"$schema":"https://vega.github.io/schema/vega/v5.json","width":{w},"height":{h},"padding":8,)J"
      R"J("data":[{{"name":"bores","values":{rows}}}],)J"
      R"J("scales":[{{"name":"x","type":"linear","domain":{xd},"range":"width","zero":false}},)J"
      R"J({{"name":"y","type":"linear","domain":{yd},"range":"height","zero":false}},)J"
      R"J({{"name":"colour","type":"linear","domain":[{lo},{hi}],"range":{{"scheme":"redblue"}},"reverse":true}}],)J"
      R"J("axes":[{{"orient":"bottom","scale":"x","title":"x ({lu})"}},{{"orient":"left","scale":"y","title":"y ({lu})"}}],)J"
      R"J("legends":[{{"fill":"colour","type":"gradient","title":{vt},"format":".2~f"}}],)J"
      R"J("marks":[{{"type":"symbol","from":{{"data":"bores"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x"}},)J"
      R"J("y":{{"scale":"y","field":"y"}},"size":{{"value":220}},"fill":{{"scale":"colour","field":"v"}},"stroke":{{"value":"#333"}},)J"
      R"J("tooltip":{{"signal":"datum.b + ': ' + format(datum.v, '.3~f')"}}}}}}}},)J"
      R"J({{"type":"text","from":{{"data":"bores"}},"encode":{{"enter":{{"x":{{"scale":"x","field":"x","offset":10}},)J"
      R"J("y":{{"scale":"y","field":"y","offset":-8}},"text":{{"signal":"datum.b + ' (' + format(datum.v, '+.2~f') + ')'"}},"fontSize":{{"value":11}},"fill":{{"value":"#1d2b33"}}}}}}}}]}})J",
      fmt::arg("w", width), fmt::arg("h", height), fmt::arg("rows", rows),
      fmt::arg("lo", vega_json_number(-largest)), fmt::arg("hi", vega_json_number(largest)),
      fmt::arg("lu", length_unit), fmt::arg("vt", vega_json_string(value_title)),
      fmt::arg("xd", x_domain), fmt::arg("yd", y_domain));
}

}  // namespace aquiledger
