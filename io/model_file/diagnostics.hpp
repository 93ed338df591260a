#pragma once
// Messages about a model file: errors stop the run before anything is allocated, warnings
// never do. Each names the file, the line and column where known, and the key path.
#include <filesystem>
#include <string>
#include <vector>

namespace aquiledger {

enum class Severity { error, warning };

struct Diagnostic {
  Severity severity = Severity::error;
  std::filesystem::path file;
  int line = 0;     ///< 1-based; 0 when unknown
  int column = 0;   ///< 1-based; 0 when unknown
  std::string key;  ///< key path, e.g. "[aquifer].k" or "[[well]] 'north well'.pumping_rate"
  std::string message;
  /// "path:line:column: error: key: message" (line and column left out when unknown).
  std::string to_string() const;
};

/// Where in which file something was written.
struct SourceSpot {
  std::filesystem::path file;
  int line = 0;
  int column = 0;
};

/// Collects every diagnostic of one read, so that all errors are reported together.
class Diagnostics {
 public:
  void error(const SourceSpot& at, std::string key, std::string message);
  void warning(const SourceSpot& at, std::string key, std::string message);
  bool has_errors() const { return n_errors_ > 0; }
  int n_errors() const { return n_errors_; }
  const std::vector<Diagnostic>& items() const { return items_; }
  std::vector<Diagnostic> take() { return std::move(items_); }

 private:
  std::vector<Diagnostic> items_;
  int n_errors_ = 0;
};

}  // namespace aquiledger
