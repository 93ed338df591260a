// `aquiledger check`: reads and validates a model file and describes it.
#include <fmt/format.h>

#include <cstdio>

#include "io/cli/commands.hpp"
#include "io/cli/model_diagnostics.hpp"
#include "io/reports/check_report.hpp"

namespace aquiledger {

int run_check_command(const CheckOptions& options) {
  const ReadResult result = read_model_file(options.model_file);
  if (!print_model_diagnostics(result)) return exit_invalid_model;
  const Model& model = *result.model;
  if (!options.quiet) std::fputs(format_check_report(model).c_str(), stdout);
  std::fputs(model.warnings.empty()
                 ? "The model is valid.\n"
                 : fmt::format("The model is valid ({} warning{}).\n", model.warnings.size(),
                               model.warnings.size() == 1 ? "" : "s")
                       .c_str(),
             stdout);
  return exit_success;
}

}  // namespace aquiledger
