#pragma once
// Vega (v5) chart specifications as JSON text, for the HTML reports. Labels, colours and
// layout are our own; every axis title carries its unit.
#include <optional>
#include <string>
#include <vector>

namespace aquiledger {

enum class SeriesStyle { line, points };

/// One named series of a line chart.
struct ChartSeries {
  std::string label;
  std::vector<double> x;
  std::vector<double> y;
  SeriesStyle style = SeriesStyle::line;
};

struct AxisOptions {
  std::string title;   ///< with unit, e.g. "time (d)"
  bool log = false;    ///< logarithmic scale (non-positive values are left out)
  bool whole = false;  ///< counts (iterations): ticks only at whole numbers, labelled as such
};

/// A labelled mark across a chart: a vertical rule at x0 (x1 NaN), or a shaded band from
/// x0 to x1; or a horizontal rule at y (vertical false).
struct ChartRule {
  std::string label;
  double x0 = 0.0, x1 = 0.0;  ///< in x axis units; x1 NaN for a rule
  double y = 0.0;             ///< in y axis units, for a horizontal rule
  bool vertical = true;
};

/// Lines and/or point series on shared axes, with a legend. NaN values are left out. rules:
/// period boundaries, a steady band, the aquifer top... drawn behind the series; a
/// horizontal rule widens the y axis to show it.
std::string line_chart_spec(const std::vector<ChartSeries>& series, const AxisOptions& x,
                            const AxisOptions& y, int width = 620, int height = 300,
                            const std::vector<ChartRule>& rules = {});

/// One bar segment of a stacked bar chart.
struct BarValue {
  std::string category;  ///< bar (x axis), e.g. the period name
  std::string segment;   ///< colour, e.g. the budget component
  double value = 0.0;    ///< signed: positive stacks up, negative down
};

/// Bars stacked by segment for each category (negative values stack below zero), with a legend
/// of the segments under legend_title (none when it is empty).
std::string stacked_bar_spec(const std::vector<BarValue>& values, const std::string& x_title,
                             const std::string& y_title, int width = 620, int height = 320,
                             const std::string& legend_title = "water");

/// A feature drawn over a map: a symbol at a point, e.g. a well, a river or drain cell, a bore.
struct MapFeature {
  std::string kind;         ///< legend entry in plain words: "well", "river cell", ...
  std::string label;        ///< tooltip, e.g. the feature's name
  double x = 0.0, y = 0.0;  ///< L
};

/// A map of cell values: rectangles from cell edges (x west to east, y south to north),
/// coloured by value; NaN cells are left out. x_edges: n_cols + 1 values; y_edges: n_rows + 1
/// values north to south; values: n_rows * n_cols in raster order (row 0 north).
std::string heatmap_spec(const std::vector<double>& x_edges, const std::vector<double>& y_edges,
                         const std::vector<double>& values, const std::string& value_title,
                         const std::string& length_unit, const std::string& scheme, int width = 560,
                         const std::vector<MapFeature>& features = {});

/// A map of classes (e.g. 0 dry, 1 water table, 2 confined): cells as in heatmap_spec coloured
/// by the class names (class_names[v]); values outside the names are left out.
std::string class_map_spec(const std::vector<double>& x_edges, const std::vector<double>& y_edges,
                           const std::vector<double>& values,
                           const std::vector<std::string>& class_names,
                           const std::vector<std::string>& class_colours,
                           const std::string& length_unit, int width = 560,
                           const std::vector<MapFeature>& features = {});

/// A named point of a map (a bore) with a value.
struct MapPoint {
  std::string label;
  double x = 0.0, y = 0.0;  ///< L
  double value = 0.0;       ///< in the unit of the value title
};

/// The area a map covers (L), e.g. the model grid.
struct MapExtent {
  double x_min = 0.0, x_max = 0.0, y_min = 0.0, y_max = 0.0;
};

/// Labelled points on map axes coloured on a diverging scale centred on zero (red above
/// zero, blue below), e.g. the mean residual at each bore. With an extent the axes span it
/// (same shape as the other maps), so a single bore is placed in the model area.
std::string residual_map_spec(const std::vector<MapPoint>& points, const std::string& value_title,
                              const std::string& length_unit, int width = 560, int height = 360,
                              const std::optional<MapExtent>& extent = std::nullopt);

/// A JSON number: shortest round-trip form, "null" when not finite.
std::string vega_json_number(double v);
/// A JSON string literal with escapes.
std::string vega_json_string(const std::string& s);

}  // namespace aquiledger
