#pragma once
// The whole text of an input file the readers parse (model file, estimation set-up, pumping
// test), or the one error that refuses it.
#include <cstdint>
#include <filesystem>
#include <optional>
#include <string>

#include "io/model_file/diagnostics.hpp"

namespace aquiledger {

struct InputFileText {
  std::string text;                 ///< the file's bytes (empty when refused)
  std::optional<Diagnostic> error;  ///< set when the file is refused or cannot be opened
};

/// Reads path whole, or refuses it as io/files/input_file_guard.hpp does ("<what> is not a
/// regular file ..."), or cannot open it ("cannot open the <what>"); `what` names the kind
/// of file in those messages, e.g. "model file".
InputFileText read_input_file_text(const std::filesystem::path& path, std::uintmax_t max_bytes,
                                   const std::string& what);

}  // namespace aquiledger
