#pragma once
// The HTML page of a parameter estimation (`estimate`, docs/report.md, "The estimation
// page"): the estimates with their 95 % intervals, the correlation matrix with the warnings
// for pairs the measurements do not separate, composite scaled sensitivities, the weighted
// residuals and the objective history. Built on the report's page frame (html_report.hpp)
// and charts (vega_charts.hpp).
#include <string>

#include "io/reports/html_report.hpp"
#include "postproc/parameter_estimation.hpp"

namespace aquiledger {

/// The page (render it with load_vega_library()). model: the calibrated model (for its units),
/// setup_file and model_file: as shown to the reader.
HtmlReport estimation_page(const Model& model, const EstimationSetup& setup,
                           const EstimationResult& result, const std::string& setup_file,
                           const std::string& model_file);

}  // namespace aquiledger
