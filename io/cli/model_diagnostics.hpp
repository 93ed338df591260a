#pragma once
// The diagnostics of a model file as every command that reads one prints them.
#include "io/model_file/model_reader.hpp"

namespace aquiledger {

/// Prints the diagnostics of a model that cannot be used (every error, and the warnings
/// with them, sorted by file and line; when print is set) to standard error, then the count
/// of errors; returns true when the model is usable. The warnings of a usable model are
/// printed once, by the command (model.warnings, with file and line).
bool print_model_diagnostics(const ReadResult& result, bool print = true);

}  // namespace aquiledger
