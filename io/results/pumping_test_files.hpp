#pragma once
// The files of a pumping-test interpretation (docs/pumping-tests.md, "Output files"):
// fit.json (every fitted value, interval, correlation, AICc and the classification),
// parameters.csv and fit_series.csv.
#include <filesystem>
#include <string>

#include "postproc/pumping_test_fit.hpp"

namespace aquiledger {

/// Unit of each parameter of a model for the test's units ("m2/d", "-", "m").
std::string parameter_unit(const std::string& parameter, const PumpingTest& test);

std::string drawdown_fit_json(const PumpingTest& test, const PumpingTestInterpretation& result,
                              const std::string& test_file, const std::string& version);
/// model,parameter,value,low,high,unit: every candidate's parameters, 95 % interval.
std::string parameters_csv(const PumpingTest& test, const PumpingTestInterpretation& result);
/// well,time,measured,fitted,residual,derivative for the chosen model.
std::string fit_series_csv(const PumpingTest& test, const PumpingTestInterpretation& result);

/// Writes the three files into folder (created if missing), each atomically; throws
/// OutputError naming the file that could not be written.
void write_drawdown_fit_files(const std::filesystem::path& folder, const PumpingTest& test,
                              const PumpingTestInterpretation& result, const std::string& test_file,
                              const std::string& version);

}  // namespace aquiledger
