#include "io/model_file/diagnostics.hpp"

namespace aquiledger {

std::string Diagnostic::to_string() const {
  std::string s = file.string();
  if (line > 0) {
    s.append(":").append(std::to_string(line));
    if (column > 0) s.append(":").append(std::to_string(column));
  }
  s += severity == Severity::error ? ": error: " : ": warning: ";
  if (!key.empty()) s += key + ": ";
  s += message;
  return s;
}

void Diagnostics::error(const SourceSpot& at, std::string key, std::string message) {
  items_.push_back(
      {Severity::error, at.file, at.line, at.column, std::move(key), std::move(message)});
  ++n_errors_;
}

void Diagnostics::warning(const SourceSpot& at, std::string key, std::string message) {
  items_.push_back(
      {Severity::warning, at.file, at.line, at.column, std::move(key), std::move(message)});
}

}  // namespace aquiledger
