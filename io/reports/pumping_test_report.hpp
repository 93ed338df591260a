#pragma once
// The HTML page of a pumping-test interpretation (`drawdown-fit`, docs/pumping-tests.md,
// "The interpretation page"): diagnostic plots (log-log with the Bourdet derivative, semi-log
// with the Cooper-Jacob line, residuals), the fitted values with 95 % intervals and
// correlations, the model comparison and the classification, worded as suggestions. Built on
// the report's page frame (html_report.hpp) and charts (vega_charts.hpp).
#include <string>

#include "io/reports/html_report.hpp"
#include "postproc/pumping_test_fit.hpp"

namespace aquiledger {

/// The page (render it with load_vega_library()): sections and charts in the order of
/// docs/pumping-tests.md.
HtmlReport pumping_test_page(const PumpingTest& test, const PumpingTestInterpretation& result,
                             const std::string& test_file);

}  // namespace aquiledger
