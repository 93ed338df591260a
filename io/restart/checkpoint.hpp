#pragma once
// Checkpoint files: the state a run needs to continue exactly where it stopped (docs/
// robustness.md). One file per output folder, replaced atomically, so it is always a
// complete checkpoint: the newest. Layout: magic "AQLCKPT1", format version, byte-order mark,
// fingerprints of the model file and of every file it read, then the state (run position,
// heads, linear-solver start, counters, and the recorder's tables), and a fingerprint of
// those bytes that detects a damaged file.
#include <cstdint>
#include <filesystem>
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "io/results/result_recorder.hpp"
#include "solver/simulation.hpp"

namespace aquiledger {

/// A checkpoint that cannot be used: missing, damaged, or written for other input files.
class CheckpointError : public std::runtime_error {
 public:
  using std::runtime_error::runtime_error;
};

inline constexpr std::string_view checkpoint_file_name = "checkpoint.aqck";
inline constexpr std::uint32_t checkpoint_format_version =
    6;  ///< 4: interbeds' preconsolidation heads; 5: subsidence at subsidence points;
        ///< 6: delay beds' node state and budget components (5 is still read)

/// FNV-1a fingerprints of the model file's bytes and of each file it read.
struct InputFingerprint {
  std::uint64_t model = 0;
  std::vector<std::pair<std::string, std::uint64_t>> files;  ///< path, fingerprint; sorted
};

/// Fingerprints the files now on disk; throws CheckpointError naming a file it cannot read.
InputFingerprint fingerprint_inputs(const Model& model);

struct Checkpoint {
  InputFingerprint inputs;
  int threads = 0;  ///< solver threads of the run (results agree bit for bit only with the same)
  StartState state;
  RecorderState recorder;
};

std::string encode_checkpoint(const Checkpoint& checkpoint);
/// The same in an older format that this program still reads (5: no delay beds; the state
/// must hold no delay-bed state and no delay-bed budget), for tests of that reading.
std::string encode_checkpoint(const Checkpoint& checkpoint, std::uint32_t version);
/// Throws CheckpointError when the bytes are not a complete checkpoint of this format.
Checkpoint decode_checkpoint(std::string_view bytes);

/// Writes folder/checkpoint.aqck atomically; throws OutputError.
void write_checkpoint(const std::filesystem::path& folder, const Checkpoint& checkpoint);
/// Reads folder/checkpoint.aqck; throws CheckpointError (missing, damaged).
Checkpoint read_checkpoint(const std::filesystem::path& folder);

/// A distributed run's checkpoint is a set: one part per rank (that rank's rows and its
/// recorder, `checkpoint_sSLOT_rRRRR.aqck`, each a complete checkpoint file behind a header
/// naming the rank, the rank count and the set's generation) and the index
/// `checkpoint_set.aqck`, written last by rank 0 once every part is on disk. Generations
/// alternate between two slots, so the parts the index names are never the ones being
/// written: a run killed at any moment leaves the last complete set.
inline constexpr std::string_view checkpoint_set_file_name = "checkpoint_set.aqck";

/// The index of a checkpoint set.
struct CheckpointSet {
  int n_ranks = 1;
  std::uint64_t generation = 0;  ///< 1 for the first set of a run
};

/// Name of a part of generation `generation` for `rank`.
std::string checkpoint_part_name(std::uint64_t generation, int rank);
/// Writes this rank's part atomically; throws OutputError.
void write_checkpoint_part(const std::filesystem::path& folder, const CheckpointSet& set, int rank,
                           const Checkpoint& checkpoint);
/// Writes the index atomically (rank 0, after every part is on disk); throws OutputError.
void write_checkpoint_set(const std::filesystem::path& folder, const CheckpointSet& set);
/// Reads the index; throws CheckpointError (missing, damaged).
CheckpointSet read_checkpoint_set(const std::filesystem::path& folder);
/// Reads this rank's part of the set; throws CheckpointError when it is missing, damaged, or
/// of another rank, rank count or generation.
Checkpoint read_checkpoint_part(const std::filesystem::path& folder, const CheckpointSet& set,
                                int rank);

/// Why the checkpoint does not belong to these input files (naming the first changed file),
/// or nullopt when it does.
std::optional<std::string> checkpoint_mismatch(const InputFingerprint& saved,
                                               const InputFingerprint& now,
                                               const std::filesystem::path& model_file);

}  // namespace aquiledger
