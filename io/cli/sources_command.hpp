#pragma once
// `aquiledger sources`: the options and the command (io/cli/sources_command.cpp).
#include <filesystem>
#include <optional>
#include <string>

namespace CLI {
class App;
}

namespace aquiledger {

struct SourcesOptions {
  std::optional<std::filesystem::path> model_file;
  std::string wells;  ///< comma-separated names of the wells whose water is traced
  std::optional<std::filesystem::path> output_folder;      ///< default: the model's results folder
  std::optional<std::filesystem::path> with_wells_folder;  ///< compare two results folders
  std::optional<std::filesystem::path> without_wells_folder;
  std::string time_unit = "d";  ///< of the compared folders (their budget tables omit it)
  std::optional<int> threads;
  bool quiet = false;
};

/// Adds the subcommand and its options to the program's command line.
CLI::App* add_sources_subcommand(CLI::App& app, SourcesOptions& options);

int run_sources_command(const SourcesOptions& options);

}  // namespace aquiledger
