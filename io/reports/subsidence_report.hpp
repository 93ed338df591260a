#pragma once
// The report's subsidence series: simulated subsidence at each subsidence point against time
// with its measured readings, and their residual statistics, from subsidence_points.csv
// (docs/results.md, docs/report.md).
#include <filesystem>
#include <string>
#include <vector>

#include "io/reports/html_report.hpp"
#include "io/reports/vega_charts.hpp"
#include "solver/model.hpp"

namespace aquiledger {

/// Adds the section when the folder holds subsidence_points.csv and the model has interbeds
/// (without the model, model == nullptr: whenever the file is there); returns false (page
/// unchanged) otherwise. The measured readings come from the model's points. rules: the
/// period boundaries drawn on every chart. Throws OutputError when the file cannot be read.
bool add_subsidence_section(HtmlReport& page, const std::filesystem::path& folder,
                            const Model* model, const std::string& length_unit,
                            const std::string& time_unit, const std::vector<ChartRule>& rules);

}  // namespace aquiledger
