#pragma once
// Reads a model file (TOML, see docs/model-format.md) into the plain Model the solver takes.
// Everything is validated before any per-cell array is allocated, and all errors are
// reported together.
#include <filesystem>
#include <functional>
#include <optional>
#include <string_view>
#include <vector>

#include "io/model_file/diagnostics.hpp"
#include "solver/model.hpp"

namespace aquiledger {

struct ReadResult {
  std::optional<Model> model;           ///< set when there were no errors
  std::vector<Diagnostic> diagnostics;  ///< errors and warnings, in the order found
  bool ok() const;
};

/// The rows of the per-cell inputs a process keeps, given the grid's shape (rows, columns):
/// a distributed rank's band (owned) and the rows it holds (window). The aquifer, interbed
/// and initial-head arrays of the Model then hold the window's rows only (Model::band), and
/// the checks of those values and the memory guard cover them; the scalar settings and the
/// features are read whole on every process.
using BandOfGrid = std::function<GridPart(int n_rows, int n_cols)>;

/// Reads and validates the model file at path (every row, or the band `band_of` gives).
ReadResult read_model_file(const std::filesystem::path& path, const BandOfGrid& band_of = {});

/// Reads TOML text as though it were the file at as_if_path (relative paths in it, such as
/// array files and the output folder, are taken relative to that file's folder).
ReadResult read_model_text(std::string_view toml_text, const std::filesystem::path& as_if_path,
                           const BandOfGrid& band_of = {});

}  // namespace aquiledger
