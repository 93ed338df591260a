#pragma once
// One run at a time per output folder. Two runs writing into the same folder would
// interleave their tables and field files; the second is refused before it writes anything.
//
// The lock is an advisory flock(2) on `.aquiledger-run.lock` in the folder, holding the
// owner's process id, host and start time for the message. The kernel releases a flock when
// its process ends in any way (SIGKILL included), so a lock left by a dead run is stale by
// construction: the next run takes it over and says so. On network file systems flock is
// only as reliable as the server's lock support (NFSv4 emulates it with byte-range locks).
#include <filesystem>
#include <string>

#include "io/files/output_error.hpp"

namespace aquiledger {

class OutputFolderLock {
 public:
  /// Creates the folder if missing and takes its lock. Throws OutputError naming the folder
  /// and the other run (process id, host, start time) when a live run holds it, or the
  /// operating system's reason when the lock file cannot be made.
  explicit OutputFolderLock(const std::filesystem::path& folder);
  ~OutputFolderLock();  ///< removes the lock file and releases the lock
  OutputFolderLock(const OutputFolderLock&) = delete;
  OutputFolderLock& operator=(const OutputFolderLock&) = delete;

  /// When the lock file was left by a run that ended without removing it (killed): its
  /// description ("process 1234 on host h, started ..."); empty otherwise.
  const std::string& stale_owner() const { return stale_owner_; }

  static constexpr const char* file_name = ".aquiledger-run.lock";

 private:
  int fd_ = -1;
  std::filesystem::path path_;
  std::string stale_owner_;
};

}  // namespace aquiledger
