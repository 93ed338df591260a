#include "io/files/atomic_file.hpp"

#include <fcntl.h>
#include <fmt/core.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <cstring>
#include <string>
#include <system_error>

namespace aquiledger {
namespace {

[[noreturn]] void fail(std::string_view what, const std::filesystem::path& path, int error) {
  throw OutputError(fmt::format("cannot {} '{}': {}", what, path.string(), std::strerror(error)));
}

/// Closes a POSIX descriptor on scope exit unless released.
class FileDescriptor {
 public:
  explicit FileDescriptor(int fd) : fd_(fd) {}
  FileDescriptor(const FileDescriptor&) = delete;
  FileDescriptor& operator=(const FileDescriptor&) = delete;
  ~FileDescriptor() {
    if (fd_ >= 0) ::close(fd_);
  }
  int get() const { return fd_; }
  /// Closes now and returns 0 or the errno of close (which may report a delayed write error).
  int close_now() {
    const int rc = ::close(fd_);
    fd_ = -1;
    return rc == 0 ? 0 : errno;
  }

 private:
  int fd_;
};

int write_all(int fd, std::string_view data) {
  while (!data.empty()) {
    const ssize_t n = ::write(fd, data.data(), data.size());
    if (n < 0) {
      if (errno == EINTR) continue;
      return errno;
    }
    data.remove_prefix(static_cast<std::size_t>(n));
  }
  return 0;
}

/// Makes the rename itself durable; a folder that refuses fsync (some file systems) is not
/// an error, since the file content is already on disk.
void sync_folder(const std::filesystem::path& folder) noexcept {
  const std::string name = folder.empty() ? std::string(".") : folder.string();
  const int fd = ::open(name.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (fd < 0) return;
  (void)::fsync(fd);
  ::close(fd);
}

}  // namespace

std::filesystem::path temporary_path_for(const std::filesystem::path& path) {
  // The pid and a counter keep concurrent writers (two runs, two threads) apart.
  static std::atomic<unsigned> counter{0};
  const std::string name =
      fmt::format(".{}.tmp-{}-{}", path.filename().string(), ::getpid(), counter++);
  return path.parent_path() / name;
}

std::filesystem::path create_temporary_for(const std::filesystem::path& target) {
  std::filesystem::path temporary = temporary_path_for(target);
  const int fd = ::open(temporary.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0644);
  if (fd < 0) fail("write", target, errno);
  ::close(fd);
  return temporary;
}

void discard_temporary_file(const std::filesystem::path& temporary) noexcept {
  std::error_code ignored;
  std::filesystem::remove(temporary, ignored);
}

void commit_temporary_file(const std::filesystem::path& temporary,
                           const std::filesystem::path& target) {
  {
    FileDescriptor fd(::open(temporary.c_str(), O_RDONLY | O_CLOEXEC));
    if (fd.get() < 0) {
      const int error = errno;
      discard_temporary_file(temporary);
      fail("write", target, error);
    }
    if (::fsync(fd.get()) != 0) {
      const int error = errno;
      discard_temporary_file(temporary);
      fail("flush to disk", target, error);
    }
  }
  if (::rename(temporary.c_str(), target.c_str()) != 0) {
    const int error = errno;
    discard_temporary_file(temporary);
    fail("replace", target, error);
  }
  sync_folder(target.parent_path());
}

void write_file_atomically(const std::filesystem::path& path, std::string_view contents) {
  const std::filesystem::path temporary = temporary_path_for(path);
  FileDescriptor fd(::open(temporary.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0644));
  if (fd.get() < 0) fail("write", path, errno);
  int error = write_all(fd.get(), contents);
  if (error == 0 && ::fsync(fd.get()) != 0) error = errno;
  const int close_error = fd.close_now();
  if (error == 0) error = close_error;
  if (error != 0) {
    discard_temporary_file(temporary);
    fail("write", path, error);
  }
  if (::rename(temporary.c_str(), path.c_str()) != 0) {
    error = errno;
    discard_temporary_file(temporary);
    fail("replace", path, error);
  }
  sync_folder(path.parent_path());
}

void check_output_folder_writable(const std::filesystem::path& folder) {
  std::error_code ec;
  std::filesystem::create_directories(folder, ec);
  if (ec) {
    throw OutputError(
        fmt::format("cannot create output folder '{}': {}", folder.string(), ec.message()));
  }
  if (!std::filesystem::is_directory(folder, ec)) {
    throw OutputError(fmt::format("output folder '{}' is not a folder", folder.string()));
  }
  const std::filesystem::path probe = folder / fmt::format(".aquiledger-probe-{}", ::getpid());
  const int fd = ::open(probe.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
  if (fd < 0) {
    throw OutputError(fmt::format("output folder '{}' is not writable: {}", folder.string(),
                                  std::strerror(errno)));
  }
  ::close(fd);
  if (::unlink(probe.c_str()) != 0) {
    throw OutputError(fmt::format("output folder '{}': cannot remove probe file: {}",
                                  folder.string(), std::strerror(errno)));
  }
}

}  // namespace aquiledger
