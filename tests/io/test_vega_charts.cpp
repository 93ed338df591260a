#include <catch2/catch.hpp>
#include <cmath>
#include <string>

#include "io/reports/vega_charts.hpp"

using namespace aquiledger;

// The chart specifications are JSON text for Vega; these checks read the parts the report's
// readability depends on (axis labels, rule labels, the residual map's area). The browser
// test (tests/scripts/report_browser.sh) checks that the specifications render.

TEST_CASE("an axis of values all below 1e-3 is labelled in exponent form", "[io][charts]") {
  const ChartSeries tiny{"imbalance", {1.0, 2.0, 3.0}, {1.5e-10, -2.1e-10, 0.0}};
  const std::string spec = line_chart_spec({tiny}, {"time (d)"}, {"imbalance (%)"});
  // The y axis carries the format, the x axis (values 1..3) does not.
  const std::string y_axis =
      R"J("title":"imbalance (%)","grid":true,"gridOpacity":0.25,"format":"~e")J";
  const std::string x_axis = R"J("title":"time (d)","grid":true,"gridOpacity":0.25})J";
  CHECK(spec.find(y_axis) != std::string::npos);
  CHECK(spec.find(x_axis) != std::string::npos);

  const ChartSeries heads{"head", {1.0, 2.0}, {40.0, 39.5}};
  CHECK(line_chart_spec({heads}, {"time (d)"}, {"head (m)"}).find("~e") == std::string::npos);
}

TEST_CASE("an axis of counts has ticks at whole numbers only", "[io][charts]") {
  // Three iterations of an estimation: an axis of 0..2 would otherwise be ticked at 0.5 steps.
  const ChartSeries objective{"objective", {0.0, 1.0, 2.0}, {9.0, 2.0, 1.5}};
  const std::string spec =
      line_chart_spec({objective}, {"iteration", false, true}, {"objective (-)", true});
  CHECK(
      spec.find(
          R"J("title":"iteration","grid":true,"gridOpacity":0.25,"tickMinStep":1,"format":"d")J") !=
      std::string::npos);
  CHECK(spec.find(R"J("title":"objective (-)","grid":true,"gridOpacity":0.25})J") !=
        std::string::npos);
}

TEST_CASE("a period boundary's label carries the next boundary, to stop before it",
          "[io][charts]") {
  const double nan = std::nan("");
  const std::vector<ChartRule> rules = {
      {"winter", 545.0, nan}, {"summer", 365.0, nan}, {"steady: start", 0.0, 365.0}};
  const std::string spec = line_chart_spec({{"head", {0.0, 700.0}, {1.0, 2.0}}}, {"time (d)"},
                                           {"head (m)"}, 620, 240, rules);
  CHECK(spec.find(R"J({"t":"summer","x0":365,"x1":null,"y":0,"n":545})J") != std::string::npos);
  CHECK(spec.find(R"J({"t":"winter","x0":545,"x1":null,"y":0,"n":null})J") != std::string::npos);
  CHECK(spec.find(R"J("limit":{"signal":)J") != std::string::npos);
}

TEST_CASE("the residual map spans the model area when given it", "[io][charts]") {
  const std::vector<MapPoint> one = {{"bore", 11400.0, 5900.0, 0.37}};
  const std::string fitted = residual_map_spec(one, "mean residual (m)", "m");
  CHECK(fitted.find(R"J("domain":{"data":"bores","field":"x"})J") != std::string::npos);
  // 16000 m by 8000 m at 560 px wide: 280 px high, the shape of the area.
  const std::string framed = residual_map_spec(one, "mean residual (m)", "m", 560, 360,
                                               MapExtent{0.0, 16000.0, 0.0, 8000.0});
  CHECK(framed.find(R"J("domain":[0,16000])J") != std::string::npos);
  CHECK(framed.find(R"J("domain":[0,8000])J") != std::string::npos);
  CHECK(framed.find(R"J("height":280)J") != std::string::npos);
}
