#pragma once
// `aquiledger estimate`: the options and the command (io/cli/estimate_command.cpp).
#include <filesystem>
#include <optional>

namespace CLI {
class App;
}

namespace aquiledger {

struct EstimateOptions {
  std::filesystem::path setup_file;
  std::optional<std::filesystem::path> output_folder;  ///< default: beside the set-up file
  bool quiet = false;
};

/// Adds the subcommand and its options to the program's command line.
CLI::App* add_estimate_subcommand(CLI::App& app, EstimateOptions& options);

int run_estimate_command(const EstimateOptions& options);

}  // namespace aquiledger
