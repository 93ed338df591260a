#include "io/cli/model_diagnostics.hpp"

#include <algorithm>
#include <tuple>
#include <vector>

#include "io/cli/command_output.hpp"

namespace aquiledger {

/// Prints the diagnostics of a model that cannot be used (every error, and the warnings
/// with them; when print is set); returns true when the model is usable. The warnings of a
/// usable model are printed once, by the command (model.warnings, with file and line).
bool print_model_diagnostics(const ReadResult& result, bool print) {
  if (!print || result.ok()) return result.ok();
  std::vector<Diagnostic> sorted = result.diagnostics;
  std::stable_sort(sorted.begin(), sorted.end(), [](const Diagnostic& a, const Diagnostic& b) {
    return std::tie(a.file, a.line) < std::tie(b.file, b.line);
  });
  const int errors = print_diagnostics(sorted);
  if (errors > 0)
    std::fprintf(stderr, "%d error%s: the model was not run.\n", errors, errors == 1 ? "" : "s");
  return result.ok();
}

}  // namespace aquiledger
