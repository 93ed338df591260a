#pragma once
// The files of a parameter estimation (docs/results.md, "Estimation results"):
// estimate.json (everything), estimated_parameters.csv, parameter_correlation.csv,
// target_residuals.csv and objective_history.csv.
#include <filesystem>
#include <string>

#include "postproc/parameter_estimation.hpp"

namespace aquiledger {

/// parameter,property,form,value,lower_95,upper_95,css,at_bound,start,lower,upper
std::string estimated_parameters_csv(const EstimationSetup& setup, const EstimationResult& r);
/// parameter, then one column per parameter: the correlation matrix of the fitted unknowns.
std::string parameter_correlation_csv(const EstimationSetup& setup, const EstimationResult& r);
/// target,kind,time,measured,simulated,residual,weight,weighted_residual
std::string target_residuals_csv(const EstimationSetup& setup, const EstimationResult& r);
/// iteration,objective
std::string objective_history_csv(const EstimationResult& r);
std::string estimate_json(const EstimationSetup& setup, const EstimationResult& r,
                          const std::string& setup_file, const std::string& version);

/// Writes the five files into folder (created if missing), each atomically; throws
/// OutputError naming the file that could not be written.
void write_estimation_files(const std::filesystem::path& folder, const EstimationSetup& setup,
                            const EstimationResult& r, const std::string& setup_file,
                            const std::string& version);

}  // namespace aquiledger
