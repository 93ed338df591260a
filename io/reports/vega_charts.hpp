#pragma once
// Vega (v5) chart specifications as JSON text, for the HTML reports. Labels, colours and
// layout are our own; every axis title carries its unit.
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
  std::string title;  ///< with unit, e.g. "time (d)"
  bool log = false;   ///< logarithmic scale (non-positive values are left out)
};

/// Lines and/or point series on shared axes, with a legend. NaN values are left out.
std::string line_chart_spec(const std::vector<ChartSeries>& series, const AxisOptions& x,
                            const AxisOptions& y, int width = 620, int height = 300);

/// One bar segment of a stacked bar chart.
struct BarValue {
  std::string category;  ///< bar (x axis), e.g. the period name
  std::string segment;   ///< colour, e.g. the budget component
  double value = 0.0;    ///< signed: positive stacks up, negative down
};

/// Bars stacked by segment for each category (negative values stack below zero).
std::string stacked_bar_spec(const std::vector<BarValue>& values, const std::string& x_title,
                             const std::string& y_title, int width = 620, int height = 320);

/// A map of cell values: rectangles from cell edges (x west to east, y south to north),
/// coloured by value; NaN cells are left out. x_edges: n_cols + 1 values; y_edges: n_rows + 1
/// values north to south; values: n_rows * n_cols in raster order (row 0 north).
std::string heatmap_spec(const std::vector<double>& x_edges, const std::vector<double>& y_edges,
                         const std::vector<double>& values, const std::string& value_title,
                         const std::string& length_unit, const std::string& scheme,
                         int width = 560);

/// A JSON number: shortest round-trip form, "null" when not finite.
std::string vega_json_number(double v);
/// A JSON string literal with escapes.
std::string vega_json_string(const std::string& s);

}  // namespace aquiledger
