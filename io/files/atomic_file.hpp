#pragma once
// Result files are replaced whole: the new content goes to a temporary file in the same
// folder, is flushed to disk, and is renamed over the old file. A crash (or a failed run)
// therefore leaves either the previous complete version or the new complete version.
#include <filesystem>
#include <string_view>

#include "io/files/output_error.hpp"

namespace aquiledger {

/// Writes contents to path atomically. Throws OutputError naming the path and the reason;
/// no temporary file is left behind on failure.
void write_file_atomically(const std::filesystem::path& path, std::string_view contents);

/// A hidden temporary name beside path (same folder, so the final rename is atomic).
std::filesystem::path temporary_path_for(const std::filesystem::path& path);

/// Creates an empty temporary file beside target (temporary_path_for) and returns its path,
/// for a writer that reports errors poorly to fill; throws OutputError naming target and the
/// OS reason when that is impossible.
std::filesystem::path create_temporary_for(const std::filesystem::path& target);

/// Flushes a fully written temporary file to disk and renames it to target. On failure the
/// temporary is removed and OutputError names the target.
void commit_temporary_file(const std::filesystem::path& temporary,
                           const std::filesystem::path& target);

/// Removes the temporary file if it exists; never throws (for error paths).
void discard_temporary_file(const std::filesystem::path& temporary) noexcept;

/// Creates the folder if missing and proves it writable by creating and removing a probe
/// file. Throws OutputError naming the folder and the reason otherwise.
void check_output_folder_writable(const std::filesystem::path& folder);

}  // namespace aquiledger
