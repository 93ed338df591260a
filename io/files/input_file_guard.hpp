#pragma once
// Input files are read whole: one that is not a regular file (a FIFO or /dev/zero would
// block or never end) or far larger than its content could need (a sparse 10 GB file) is
// refused before anything is read, with the figures.
#include <cstdint>
#include <filesystem>
#include <optional>
#include <string>

namespace aquiledger {

/// Largest model file read (L: a model file holds settings and small tables; arrays belong
/// in array files).
inline constexpr std::uintmax_t max_model_file_bytes = 64ull << 20;
/// Largest measured-head CSV read.
inline constexpr std::uintmax_t max_measured_file_bytes = 256ull << 20;

/// Bytes an array file of n_values numbers may take: 64 per value (a full-precision double
/// such as -1.2345678901234567e-100 is 24 characters; the rest leaves room for separators
/// and comments) plus 1 MiB for headers and comment blocks.
std::uintmax_t max_array_file_bytes(double n_values);

/// Why path cannot be read as an input file of at most max_bytes, or nullopt when it can.
/// A missing file is not refused here (the caller reports it as it always has).
std::optional<std::string> input_file_refusal(const std::filesystem::path& path,
                                              std::uintmax_t max_bytes);

}  // namespace aquiledger
