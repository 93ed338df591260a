#pragma once
// `aquiledger drawdown-fit`: the options and the command (io/cli/drawdown_fit_command.cpp).
#include <filesystem>
#include <optional>
#include <string>

namespace CLI {
class App;
}

namespace aquiledger {

struct DrawdownFitOptions {
  std::filesystem::path test_file;
  std::optional<std::string> model;                    ///< a model name or "auto"
  std::optional<std::filesystem::path> output_folder;  ///< default: beside the test file
  bool quiet = false;
};

/// Adds the subcommand and its options to the program's command line.
CLI::App* add_drawdown_fit_subcommand(CLI::App& app, DrawdownFitOptions& options);

int run_drawdown_fit_command(const DrawdownFitOptions& options);

}  // namespace aquiledger
