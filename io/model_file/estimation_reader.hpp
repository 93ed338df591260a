#pragma once
// Reads an estimation set-up file (TOML; docs/estimation.md): [estimate] names the model,
// [[parameter]] what to fit, [[target]] what was measured. The model is read too, and every
// parameter and target is resolved against it (zones, bores, features). All errors are
// reported together, each naming file, line and key.
#include <filesystem>
#include <optional>
#include <string_view>
#include <vector>

#include "io/model_file/diagnostics.hpp"
#include "postproc/estimation_setup.hpp"
#include "solver/model.hpp"

namespace aquiledger {

struct EstimationReadResult {
  std::optional<Model> model;            ///< the model the set-up names, when it read
  std::filesystem::path model_file;      ///< that model's file (absolute), when named
  std::optional<EstimationSetup> setup;  ///< set when neither file had errors
  std::vector<Diagnostic> diagnostics;   ///< of the set-up file and of the model file
};

EstimationReadResult read_estimation_file(const std::filesystem::path& path);
/// Reads TOML text as though it were the file at as_if_path (the model relative to it).
EstimationReadResult read_estimation_text(std::string_view toml_text,
                                          const std::filesystem::path& as_if_path);

}  // namespace aquiledger
