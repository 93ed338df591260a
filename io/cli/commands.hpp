#pragma once
#include <filesystem>
#include <optional>

namespace aquiledger {

/// Exit codes (docs/model-format.md, "Exit status").
inline constexpr int exit_success = 0;
inline constexpr int exit_invalid_model = 1;
inline constexpr int exit_not_converged = 2;
inline constexpr int exit_output_failure = 3;

struct CheckOptions {
  std::filesystem::path model_file;
};

struct RunOptions {
  std::filesystem::path model_file;
  std::optional<std::filesystem::path> output_folder;
  std::optional<int> threads;
  bool quiet = false;
};

int run_check_command(const CheckOptions& options);
int run_run_command(const RunOptions& options);

}  // namespace aquiledger
