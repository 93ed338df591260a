#include "io/files/output_lock.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstring>
#include <ctime>

namespace aquiledger {
namespace {

std::string host_name() {
  char name[256] = {0};
  if (gethostname(name, sizeof name - 1) != 0) return "unknown host";
  return name;
}

/// The owner line a lock file holds: "process 1234 on host h, started 2026-12-03T07:10:00Z".
std::string owner_line() {
  const std::time_t now = std::time(nullptr);
  char when[32] = {0};
  std::tm utc{};
  gmtime_r(&now, &utc);
  std::strftime(when, sizeof when, "%Y-%m-%dT%H:%M:%SZ", &utc);
  return fmt::format("process {} on host {}, started {}", getpid(), host_name(), when);
}

std::string read_owner(int fd) {
  char buffer[512] = {0};
  const ssize_t n = pread(fd, buffer, sizeof buffer - 1, 0);
  std::string text = n > 0 ? std::string(buffer, static_cast<std::size_t>(n)) : std::string();
  while (!text.empty() && (text.back() == '\n' || text.back() == '\r')) text.pop_back();
  return text;
}

[[noreturn]] void fail(const std::filesystem::path& path, const char* what) {
  throw OutputError(fmt::format("cannot lock the output folder: {} '{}': {}", what, path.string(),
                                std::strerror(errno)));
}

}  // namespace

OutputFolderLock::OutputFolderLock(const std::filesystem::path& folder)
    : path_(folder / file_name) {
  std::error_code ec;
  std::filesystem::create_directories(folder, ec);
  if (ec)
    throw OutputError(
        fmt::format("cannot create the output folder '{}': {}", folder.string(), ec.message()));
  // A run that finishes unlinks the file it locked; one that opened that file just before
  // would then lock an unlinked inode. Lock, then check the path still names what is locked.
  for (int attempt = 0; attempt < 100; ++attempt) {
    fd_ = open(path_.c_str(), O_RDWR | O_CREAT | O_CLOEXEC, 0644);
    if (fd_ < 0) fail(path_, "open");
    if (flock(fd_, LOCK_EX | LOCK_NB) != 0) {
      const int why = errno;
      const std::string owner = read_owner(fd_);
      close(fd_);
      fd_ = -1;
      if (why != EWOULDBLOCK) {
        errno = why;
        fail(path_, "flock");
      }
      throw OutputError(fmt::format(
          "the output folder '{}' is in use by another aquiledger run ({}); wait for it to end "
          "or give another folder with --output",
          folder.string(), owner.empty() ? "its owner is not recorded yet" : owner));
    }
    struct stat held {
    }, named{};
    if (fstat(fd_, &held) == 0 && stat(path_.c_str(), &named) == 0 && held.st_dev == named.st_dev &&
        held.st_ino == named.st_ino)
      break;
    close(fd_);
    fd_ = -1;
  }
  if (fd_ < 0) fail(path_, "lock file keeps changing:");
  stale_owner_ = read_owner(fd_);
  const std::string line = owner_line() + "\n";
  if (ftruncate(fd_, 0) != 0 || pwrite(fd_, line.data(), line.size(), 0) < 0) {
    const int why = errno;
    close(fd_);
    fd_ = -1;
    errno = why;
    fail(path_, "write");
  }
}

OutputFolderLock::~OutputFolderLock() {
  if (fd_ < 0) return;
  unlink(path_.c_str());
  close(fd_);  // releases the flock
}

}  // namespace aquiledger
