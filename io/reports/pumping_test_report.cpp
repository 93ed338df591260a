#include "io/reports/pumping_test_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>

#include "io/reports/vega_charts.hpp"
#include "io/results/pumping_test_files.hpp"

namespace aquiledger {
namespace {

std::string number(double v) {
  if (!std::isfinite(v)) return "not defined";
  return fmt::format("{:.4g}", v);
}

std::vector<double> parameter_vector(const ModelFit& m) {
  return {m.fit.parameters.data(), m.fit.parameters.data() + m.fit.parameters.size()};
}

/// n times spaced evenly in ln t over (first, last] of the well's times after pumping began.
std::vector<double> curve_times(const ObservationSeries& well, double start, int n) {
  double lo = std::numeric_limits<double>::infinity(), hi = 0.0;
  for (double t : well.times)
    if (t > start) lo = std::min(lo, t), hi = std::max(hi, t);
  std::vector<double> t;
  if (!(hi > lo)) return t;
  const double a = std::log(lo - start), b = std::log(hi - start);
  for (int i = 0; i < n; ++i) t.push_back(start + std::exp(a + (b - a) * i / (n - 1)));
  return t;
}

/// The storage the late Cooper-Jacob line sees: S, or S + Sy for delayed yield (Neuman, 1974).
double late_storage(const ModelFit& m) {
  // The numerical model of a switching aquifer: S + Sy once the water table is reached.
  const bool sum = m.model == WellTestModel::neuman ||
                   (m.model == WellTestModel::numerical && m.fit.parameters.size() > 2);
  return sum ? m.fit.parameters[1] + m.fit.parameters[2] : m.fit.parameters[1];
}

/// A screen for the page: "top .. bottom m", "piezometer tip at z m" or the whole aquifer.
std::string screen_text(const std::optional<WellScreen>& screen, const std::string& lu) {
  if (!screen) return "the whole aquifer";
  if (screen->top == screen->bottom)
    return fmt::format("piezometer tip at {} {}", number(screen->top), lu);
  return fmt::format("{} to {} {}", number(screen->top), number(screen->bottom), lu);
}

std::string model_title(WellTestModel m) {
  switch (m) {
    case WellTestModel::theis:
      return "Theis (1935)";
    case WellTestModel::cooper_jacob:
      return "Cooper and Jacob (1946)";
    case WellTestModel::hantush_jacob:
      return "Hantush and Jacob (1955), leaky";
    case WellTestModel::neuman:
      return "Neuman (1974), delayed yield";
    case WellTestModel::papadopulos_cooper:
      return "Papadopulos and Cooper (1967), large-diameter well";
    case WellTestModel::hantush_aquitard_storage:
      return "Hantush (1960), leaky with aquitard storage";
    case WellTestModel::hantush_partial_penetration:
      return "Hantush (1961), partially penetrating wells";
    case WellTestModel::numerical:
      return "the program's flow model on a radial-telescoping grid";
  }
  return model_name(m);
}

}  // namespace

HtmlReport pumping_test_page(const PumpingTest& test, const PumpingTestInterpretation& result,
                             const std::string& test_file) {
  const std::string title =
      "Pumping-test interpretation" + (test.title.empty() ? "" : ": " + test.title);
  HtmlReport page(title);
  const ModelFit& m = result.chosen_fit();
  const std::vector<double> p = parameter_vector(m);
  const std::string lu = test.length_unit, tu = test.time_unit;
  const double start = test.schedule.front().start;
  const double q0 = test.schedule.front().rate;
  const double first_end =
      test.schedule.size() > 1 ? test.schedule[1].start : std::numeric_limits<double>::infinity();

  page.add_heading("About this test");
  page.add_paragraph(fmt::format(
      "Test file {}; {} observation(s) in {} well(s); lengths in {}, times in {}; {} rate "
      "step(s), the first {} {}3/{} from {} {}.",
      test_file, test.n_observations(), test.wells.size(), lu, tu, test.schedule.size(), number(q0),
      lu, tu, number(start), tu));
  page.add_paragraph(
      "Caution: a fitted model supports, and never replaces, the judgement of a licensed "
      "professional and the local regulations. The values below are those of idealised "
      "aquifers that fit the measured drawdowns best; several aquifers can fit equally well.");
  {
    std::vector<std::vector<std::string>> rows;
    for (const RateStep& s : test.schedule)
      rows.push_back({number(s.start), s.rate > 0.0 ? number(s.rate) : "0 (recovery)"});
    page.add_table({"from (" + tu + ")", "rate (" + lu + "3/" + tu + ")"}, rows);
    rows.clear();
    const bool screens = test.has_screens() && test.aquifer;
    for (const ObservationSeries& w : test.wells) {
      rows.push_back({w.name, number(w.distance), std::to_string(w.times.size()),
                      w.images.empty()
                          ? "none"
                          : fmt::format("{} image at {} {}",
                                        w.images.front().recharge ? "recharge" : "barrier",
                                        number(w.images.front().image_distance), lu)});
      if (screens) rows.back().push_back(screen_text(w.screen, lu));
    }
    std::vector<std::string> header{"well", "distance (" + lu + ")", "measurements",
                                    "straight boundary"};
    if (screens) header.push_back("screen");
    page.add_table(header, rows);
    if (test.pumped_well.well > 0.0)
      page.add_paragraph(fmt::format("Pumped well: radius {} {}, casing radius {} {}.",
                                     number(test.pumped_well.well), lu,
                                     number(test.pumped_well.casing), lu));
    if (screens)
      page.add_paragraph(fmt::format(
          "Screens (elevations, the datum of the aquifer's top {} {} and bottom {} {}): pumped "
          "well {}; K_z / K_r {}. The closed forms other than Hantush (1961) take every well "
          "as screened through the whole aquifer.",
          number(test.aquifer->bottom + test.aquifer->thickness()), lu,
          number(test.aquifer->bottom), lu, screen_text(test.pumped_screen, lu),
          test.anisotropy_ratio ? "held at " + number(*test.anisotropy_ratio) : "fitted"));
  }

  page.add_heading("Fitted values");
  page.add_paragraph(fmt::format(
      "Model: {}; {}. {} of the drawdowns used, rms residual {} {}. Intervals are linearised "
      "95 % intervals on ln p (docs/pumping-tests.md); near a bound or for strongly correlated "
      "parameters they are only indicative.",
      model_title(m.model), result.choice_reason, m.n_used, number(m.rms_residual), lu));
  if (!m.description.empty()) page.add_paragraph("The model: " + m.description + ".");
  const std::vector<std::string>& names = m.parameter_names;
  {
    std::vector<std::vector<std::string>> rows;
    for (std::size_t j = 0; j < names.size(); ++j) {
      const auto i = static_cast<Eigen::Index>(j);
      rows.push_back({names[j], number(m.fit.parameters[i]), number(m.fit.lower_95[i]),
                      number(m.fit.upper_95[i]), parameter_unit(names[j], test),
                      m.fit.at_bound[j] ? "yes" : "no"});
    }
    page.add_table({"parameter", "value", "95 % low", "95 % high", "unit", "on a bound"}, rows);
    std::vector<std::string> header{"correlation of ln p"};
    header.insert(header.end(), names.begin(), names.end());
    rows.clear();
    for (std::size_t r = 0; r < names.size(); ++r) {
      std::vector<std::string> row{names[r]};
      for (std::size_t c = 0; c < names.size(); ++c)
        row.push_back(fmt::format("{:.3f}", m.fit.correlation(static_cast<Eigen::Index>(r),
                                                              static_cast<Eigen::Index>(c))));
      rows.push_back(row);
    }
    page.add_table(header, rows);
  }

  page.add_heading("Model comparison");
  {
    double best = std::numeric_limits<double>::infinity();
    for (const ModelFit& c : result.candidates) best = std::min(best, c.aicc);
    std::vector<std::vector<std::string>> rows;
    for (const ModelFit& c : result.candidates)
      rows.push_back({model_title(c.model), std::to_string(c.parameter_names.size()),
                      std::to_string(c.n_used), number(c.rms_residual),
                      fmt::format("{:.2f}", c.aicc), fmt::format("{:.2f}", c.aicc - best),
                      &c == &m ? "chosen" : ""});
    page.add_table({"model", "parameters", "drawdowns used", "rms residual (" + lu + ")", "AICc",
                    "AICc - lowest", ""},
                   rows);
    page.add_paragraph(
        "AICc: Akaike's criterion with the small-sample correction of Hurvich and Tsai (1989); "
        "lower is better, and a difference under about 2 is no real support for the more "
        "complex model (Burnham and Anderson, 2002; common practice).");
  }

  page.add_heading("What the fit suggests");
  for (const std::string& s : result.classification) page.add_paragraph("- " + s);

  // Diagnostic plots.
  std::vector<ChartSeries> loglog, semilog, residuals;
  for (std::size_t w = 0; w < test.wells.size(); ++w) {
    const ObservationSeries& well = test.wells[w];
    std::vector<double> t, s, d, rt, r;
    for (std::size_t i = 0; i < well.times.size(); ++i) {
      if (well.times[i] <= start) continue;
      t.push_back(well.times[i] - start);
      s.push_back(well.drawdowns[i]);
      d.push_back(result.derivatives[w][i]);
      if (m.used[w][i]) {
        rt.push_back(well.times[i] - start);
        r.push_back(well.drawdowns[i] - m.fitted[w][i]);
      }
    }
    // Models without a closed form carry their curve (ModelFit::curve).
    const bool carried = !m.curve_times.empty();
    const std::vector<double> ct = carried ? m.curve_times[w] : curve_times(well, start, 80);
    std::vector<double> ctp, cs;
    for (std::size_t c = 0; c < ct.size(); ++c) {
      ctp.push_back(ct[c] - start);
      cs.push_back(carried ? m.curve[w][c]
                           : schedule_drawdown(m.model, p, test.schedule, well.distance, ct[c],
                                               well.images, test.pumped_well,
                                               partial_penetration_of(test, well)));
    }
    std::vector<double> cd = logarithmic_derivative(ctp, cs, 0.1);
    loglog.push_back({well.name + ": drawdown", t, s, SeriesStyle::points});
    loglog.push_back({well.name + ": derivative", t, d, SeriesStyle::points});
    loglog.push_back({well.name + ": fitted drawdown", ctp, cs, SeriesStyle::line});
    loglog.push_back({well.name + ": fitted derivative", ctp, cd, SeriesStyle::line});
    semilog.push_back({well.name + ": drawdown", t, s, SeriesStyle::points});
    // Cooper and Jacob (1946): s = Q / (4 pi T) ln(2.25 T t / (r^2 S)), over the first step.
    std::vector<double> lt, ls;
    const double tt = p[0], ss = late_storage(m);
    const double r2 = std::max(well.distance, 1e-9) * std::max(well.distance, 1e-9);
    // Partial penetration shifts the late line by Hantush's (1961) constant Q / (4 pi T) f_s:
    // the fitted model's drawdown less Theis's once u = r^2 S / (4 T t) is 1e-10.
    double shift = 0.0;
    if (m.model == WellTestModel::hantush_partial_penetration) {
      const double t_late = r2 * p[1] / (4.0 * tt * 1e-10);
      const std::vector<RateStep> steady_rate{{0.0, q0}};
      shift =
          schedule_drawdown(m.model, p, steady_rate, well.distance, t_late, {}, test.pumped_well,
                            partial_penetration_of(test, well)) -
          schedule_drawdown(WellTestModel::theis, {tt, p[1]}, steady_rate, well.distance, t_late);
    }
    for (double tc : ctp) {
      if (start + tc > first_end) break;
      const double v =
          q0 / (4.0 * std::numbers::pi * tt) * std::log(2.25 * tt * tc / (r2 * ss)) + shift;
      if (v <= 0.0) continue;
      lt.push_back(tc);
      ls.push_back(v);
    }
    semilog.push_back({well.name + ": Cooper-Jacob line", lt, ls, SeriesStyle::line});
    residuals.push_back({well.name, rt, r, SeriesStyle::points});
  }
  const std::string time_title = "time since pumping began (" + tu + ")";
  page.add_heading("Diagnostic plots");
  page.add_chart(
      "Log-log: measured drawdown and its logarithmic derivative ds/d ln t (Bourdet et al., "
      "1989) as points, the fitted model and its derivative as lines. A level derivative is "
      "radial flow (Theis, 1935); a late fall suggests leakage or a recharge boundary, a trough "
      "delayed yield, a late rise a barrier.",
      line_chart_spec(loglog, {time_title, true}, {"drawdown, derivative (" + lu + ")", true}, 620,
                      340));
  page.add_chart(
      fmt::format("Semi-log: measured drawdown and the Cooper-Jacob (1946) straight line "
                  "s = Q / (4 pi T) ln(2.25 T t / (r2 S)) with the fitted T and {} and the first "
                  "rate, drawn over the first pumping step; it holds for u = r2 S / (4 T t) "
                  "under about 0.01 (Cooper and Jacob, 1946){}.",
                  m.model == WellTestModel::neuman ? "S + Sy (the late, water-table line)" : "S",
                  m.model == WellTestModel::hantush_partial_penetration
                      ? ", shifted for each well by the fitted model's late partial-penetration "
                        "constant (Hantush, 1961)"
                      : ""),
      line_chart_spec(semilog, {time_title, true}, {"drawdown (" + lu + ")", false}, 620, 320));
  page.add_chart("Residuals: measured minus fitted drawdown of the drawdowns in the fit.",
                 line_chart_spec(residuals, {time_title, true}, {"residual (" + lu + ")", false},
                                 620, 200, {{"zero", 0.0, 0.0, 0.0, false}}));
  page.add_paragraph(
      "Every fitted value is also in fit.json and parameters.csv, and the series in "
      "fit_series.csv, beside this page.");
  return page;
}

}  // namespace aquiledger
