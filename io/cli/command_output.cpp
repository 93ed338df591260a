#include "io/cli/command_output.hpp"

#include <fmt/format.h>

#include <cstdio>

#include "io/reports/run_report.hpp"

namespace aquiledger {

int print_diagnostics(const std::vector<Diagnostic>& diagnostics) {
  int errors = 0;
  for (const Diagnostic& d : diagnostics) {
    std::fprintf(stderr, "%s\n", d.to_string().c_str());
    if (d.severity == Severity::error) ++errors;
  }
  return errors;
}

std::string summary_end(const std::filesystem::path& folder) {
  return fmt::format("Results in {}\n\n{}\n", folder.string(), professional_caution);
}

}  // namespace aquiledger
