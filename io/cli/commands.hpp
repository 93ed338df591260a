#pragma once
#include <filesystem>
#include <optional>
#include <string>

namespace aquiledger {

/// Exit codes (docs/model-format.md, "Exit status").
inline constexpr int exit_success = 0;
inline constexpr int exit_invalid_model = 1;
inline constexpr int exit_not_converged = 2;
inline constexpr int exit_output_failure = 3;
inline constexpr int exit_bad_checkpoint = 4;  ///< --resume without a usable checkpoint
/// `verify`: a benchmark fell outside its tolerance.
inline constexpr int exit_verification_failed = 5;
/// The command line was wrong (also: an option this build does not have).
inline constexpr int exit_usage = 64;

struct CheckOptions {
  std::filesystem::path model_file;
  bool quiet = false;  ///< errors and the final line only
};

struct RunOptions {
  std::filesystem::path model_file;
  std::optional<std::filesystem::path> output_folder;
  std::optional<int> threads;
  bool quiet = false;
  int checkpoint_every = 0;       ///< write a checkpoint every N accepted steps (0: never)
  bool resume = false;            ///< continue from the output folder's checkpoint
  std::string engine = "serial";  ///< "serial", or "petsc" (distributed, under mpirun)
};

struct VerifyOptions {
  std::filesystem::path output_folder = "verify-results";
  bool quiet = false;  ///< failures and the final line only
};

struct ReportOptions {
  std::filesystem::path results_folder;
  std::optional<std::filesystem::path> output_file;  ///< default RESULTS/report.html
  std::optional<std::filesystem::path> model_file;   ///< default: summary.json's model_file
  bool without_model = false;                        ///< no measured heads
  std::optional<std::string> maps_at;                ///< "all" or times "T1,T2" (T)
  bool quiet = false;                                ///< errors only
};

int run_check_command(const CheckOptions& options);
int run_run_command(const RunOptions& options);
int run_verify_command(const VerifyOptions& options);
int run_report_command(const ReportOptions& options);

}  // namespace aquiledger
