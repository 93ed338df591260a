#pragma once
// The fitted model of an estimation written back as a runnable model file
// (docs/estimation.md, "The fitted model"): the calibrated model's own file with the fitted
// values in place of the old ones (values, not multipliers), its relative paths rewritten for
// the new folder, and array files for cell properties that are no longer one value or one
// value per zone. TOML++ lives in this folder only, so the writer does too.
#include <filesystem>
#include <stdexcept>
#include <string>
#include <vector>

#include "postproc/estimation_setup.hpp"
#include "solver/model.hpp"

namespace aquiledger {

/// A value form the writer cannot scale in place (a feature's conductance or rate given by a
/// file, a raster or a time series): the fitted model is then not written; the message says
/// which key and by what factor to scale it by hand.
class FittedModelUnsupported : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

struct FittedModelFile {
  std::string name;      ///< file name within the output folder
  std::string contents;  ///< the whole file
};

/// Everything the fitted model needs, fitted_model.toml last. `model_file` is the calibrated
/// model's file, `base` the model read from it, `values` the fitted parameters in the set-up's
/// order, `folder` where the files will go (for the relative paths), `header` comment lines
/// (without '#') saying what produced the file. Throws FittedModelUnsupported.
std::vector<FittedModelFile> fitted_model_files(const std::filesystem::path& model_file,
                                                const Model& base, const EstimationSetup& setup,
                                                const std::vector<double>& values,
                                                const std::filesystem::path& folder,
                                                const std::vector<std::string>& header);

/// Writes the files of fitted_model_files into folder, each atomically, fitted_model.toml last
/// (so a present fitted_model.toml always finds its array files). Throws OutputError.
void write_fitted_model(const std::filesystem::path& folder,
                        const std::vector<FittedModelFile>& files);

}  // namespace aquiledger
