#pragma once
// The report's section on the sources of the chosen wells' water, from water_sources.csv
// (written by `aquiledger sources`) in the results folder.
#include <filesystem>

#include "io/reports/html_report.hpp"

namespace aquiledger {

/// Adds the section when folder holds water_sources.csv; returns false (page unchanged)
/// when it does not. Throws OutputError when the file is there but cannot be read.
bool add_water_sources_section(HtmlReport& page, const std::filesystem::path& folder);

}  // namespace aquiledger
