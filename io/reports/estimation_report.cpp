#include "io/reports/estimation_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "io/reports/vega_charts.hpp"

namespace aquiledger {
namespace {

std::string estimation_number(double v) {
  if (!std::isfinite(v)) return "not defined";
  return fmt::format("{:.4g}", v);
}

/// The unit of a parameter's value as the page shows it.
std::string estimated_parameter_unit(const Model& m, const ModelParameter& p) {
  if (p.form == ParameterForm::multiplier) return "- (multiplier)";
  switch (p.property) {
    case ParameterProperty::conductivity:
      return m.length_unit + "/" + m.time_unit;
    case ParameterProperty::specific_storage:
      return "1/" + m.length_unit;
    default:
      return "-";
  }
}

/// The unit of a target's values.
std::string target_unit(const Model& m, TargetKind kind) {
  return kind == TargetKind::flow ? m.length_unit + "3/" + m.time_unit : m.length_unit;
}

}  // namespace

HtmlReport estimation_page(const Model& model, const EstimationSetup& setup,
                           const EstimationResult& result, const std::string& setup_file,
                           const std::string& model_file) {
  const BoundedFitResult& fit = result.fit;
  const std::string tu = model.time_unit;
  HtmlReport page("Parameter estimation" + (model.title.empty() ? "" : ": " + model.title));
  const std::size_t k = setup.parameters.size();

  page.add_heading("About this calibration");
  page.add_paragraph(fmt::format(
      "Set-up file {}; model {}. {} measured value(s) in {} target(s), {} parameter(s). The fit "
      "{} after {} iteration(s) and {} model run(s) with exact sensitivities. Objective "
      "(weighted sum of squares with the prior terms) {} at the start, {} at the end; error "
      "variance s2 = {} (about 1 when the weights are the measurements' true variances: "
      "Hill and Tiedeman, 2007, ch. 6), s = {}.",
      setup_file, model_file, result.observed.size(), setup.targets.size(), k,
      fit.converged ? "converged" : "did NOT converge", fit.n_iterations, result.n_model_runs,
      estimation_number(fit.cost_history.front()), estimation_number(fit.weighted_sum_of_squares),
      estimation_number(fit.error_variance), estimation_number(std::sqrt(fit.error_variance))));
  page.add_paragraph(
      "Caution: a calibrated model supports, and never replaces, the judgement of a licensed "
      "professional and the local regulations. Other parameter values, or another model, may "
      "fit the measurements as well.");
  if (result.warnings.empty())
    page.add_paragraph(
        "No warnings: no estimate on a bound, no pair of parameters correlated "
        "beyond |r| = 0.95.");
  for (const std::string& w : result.warnings) page.add_paragraph("Warning: " + w + ".");

  page.add_heading("Estimates");
  page.add_paragraph(
      "Linearised 95 % intervals (Student t; in ln p for log-transformed parameters, mapped "
      "back; docs/estimation.md). Near a bound or for strongly correlated parameters they are "
      "only indicative. The fitted model with these values is fitted_model.toml beside this "
      "page.");
  {
    std::vector<std::vector<std::string>> rows;
    for (std::size_t j = 0; j < k; ++j) {
      const EstimatedParameter& e = setup.parameters[j];
      const auto i = static_cast<Eigen::Index>(j);
      rows.push_back({e.parameter.name, parameter_property_label(e.parameter.property),
                      estimation_number(fit.parameters[i]), estimation_number(fit.lower_95[i]),
                      estimation_number(fit.upper_95[i]),
                      estimated_parameter_unit(model, e.parameter), estimation_number(e.start),
                      estimation_number(result.css[i]), fit.at_bound[j] ? "yes" : "no"});
    }
    page.add_table({"parameter", "property", "value", "95 % low", "95 % high", "unit", "start",
                    "CSS", "on a bound"},
                   rows);
  }

  page.add_heading("Correlations");
  page.add_paragraph(
      "Correlation of the fitted unknowns (ln p, or p where log = false). A pair beyond |r| = "
      "0.95 is not separately identifiable from these measurements (Hill and Tiedeman, 2007, "
      "guideline 9): only a combination of the two is determined; more kinds of measurement "
      "(a flow beside heads, a transient beside a steady state) or a prior separate them.");
  {
    std::vector<std::string> header{"r"};
    for (const EstimatedParameter& e : setup.parameters) header.push_back(e.parameter.name);
    std::vector<std::vector<std::string>> rows;
    for (std::size_t r = 0; r < k; ++r) {
      std::vector<std::string> row{setup.parameters[r].parameter.name};
      for (std::size_t c = 0; c < k; ++c) {
        const double v =
            fit.correlation(static_cast<Eigen::Index>(r), static_cast<Eigen::Index>(c));
        const bool flagged = r != c && std::abs(v) > identifiability_correlation;
        row.push_back(fmt::format("{:.3f}{}", v, flagged ? " (not identifiable)" : ""));
      }
      rows.push_back(row);
    }
    page.add_table(header, rows);
  }

  page.add_heading("Composite scaled sensitivities");
  {
    std::vector<BarValue> bars;
    double largest = 0.0;
    for (std::size_t j = 0; j < k; ++j) {
      const double css = result.css[static_cast<Eigen::Index>(j)];
      bars.push_back({setup.parameters[j].parameter.name, "CSS", css});
      largest = std::max(largest, css);
    }
    std::string weak;
    for (std::size_t j = 0; j < k; ++j)
      if (result.css[static_cast<Eigen::Index>(j)] < 0.01 * largest)
        weak += (weak.empty() ? "" : ", ") + setup.parameters[j].parameter.name;
    page.add_chart(
        "Composite scaled sensitivity of each parameter at the estimates, css_j = (sum_i "
        "(dy_i/d ln p_j)^2 w_i / n)^(1/2) (Hill and Tiedeman, 2007, eq. 4-3): how much the "
        "measurements as a whole say about it. Below about 1 % of the largest a parameter is "
        "poorly determined (common practice)" +
            (weak.empty() ? ": none is here." : ": here " + weak + "."),
        stacked_bar_spec(bars, "parameter", "composite scaled sensitivity (-)", 620, 260, ""));
  }

  page.add_heading("Residuals");
  {
    std::vector<ChartSeries> weighted;
    std::vector<std::vector<std::string>> rows;
    Eigen::Index row = 0;
    for (const EstimationTarget& t : setup.targets) {
      ChartSeries s{t.name, {}, {}, SeriesStyle::points};
      double sum = 0.0, sum2 = 0.0, wsum2 = 0.0;
      for (std::size_t i = 0; i < t.times.size(); ++i, ++row) {
        const double r = fit.residuals[row];
        const double wr = r * std::sqrt(result.weights[row]);
        s.x.push_back(t.times[i]);
        s.y.push_back(wr);
        sum += r;
        sum2 += r * r;
        wsum2 += wr * wr;
      }
      const double n = static_cast<double>(t.times.size());
      rows.push_back({t.name, target_kind_label(t.kind), target_unit(model, t.kind),
                      std::to_string(t.times.size()), estimation_number(sum / n),
                      estimation_number(std::sqrt(sum2 / n)), estimation_number(wsum2)});
      weighted.push_back(std::move(s));
    }
    page.add_table({"target", "kind", "unit", "values", "mean residual", "rms residual",
                    "weighted sum of squares"},
                   rows);
    page.add_chart(
        "Weighted residuals (measured - simulated) times the square root of the weight, per "
        "target, against time. With weights 1 / variance they should scatter about zero with "
        "a spread of about 1 and no trend in time; runs of one sign point at a model error "
        "rather than measurement noise (Hill and Tiedeman, 2007, ch. 7).",
        line_chart_spec(weighted, {"time (" + tu + ")", false}, {"weighted residual (-)", false},
                        620, 300, {{"zero", 0.0, 0.0, 0.0, false}}));
  }

  page.add_heading("Objective history");
  {
    ChartSeries s{"objective", {}, {}, SeriesStyle::line};
    for (std::size_t i = 0; i < fit.cost_history.size(); ++i) {
      s.x.push_back(static_cast<double>(i));
      s.y.push_back(fit.cost_history[i]);
    }
    page.add_chart(
        "The objective (weighted sum of squares with the prior terms) at the start (iteration "
        "0) and after each accepted step of the bounded Levenberg-Marquardt iteration.",
        line_chart_spec({s}, {"iteration", false, true}, {"objective (-)", true}, 620, 240));
  }
  page.add_paragraph(
      "Every value is also in estimate.json and the CSV files beside this page "
      "(estimated_parameters.csv, parameter_correlation.csv, target_residuals.csv, "
      "objective_history.csv; docs/results.md).");
  return page;
}

}  // namespace aquiledger
