// One run per output folder (io/files/output_lock.hpp): a second lock on a held folder is refused
// naming the holder, a released lock leaves nothing behind, and a lock file whose owner is
// gone is taken over. flock(2) locks belong to open file descriptions, so two locks taken in
// one process conflict just as two processes' do.
#include <unistd.h>

#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>
#include <optional>
#include <string>

#include "io/files/output_lock.hpp"

using namespace aquiledger;

namespace {
std::filesystem::path fresh_folder(const std::string& name) {
  const auto p = std::filesystem::temp_directory_path() /
                 ("aquiledger-lock-" + name + "-" + std::to_string(getpid()));
  std::filesystem::remove_all(p);
  return p;
}
}  // namespace

TEST_CASE("a held output folder refuses a second run, naming the holder", "[output_lock]") {
  const auto folder = fresh_folder("held");
  std::optional<OutputFolderLock> first;
  first.emplace(folder);
  CHECK(first->stale_owner().empty());
  try {
    OutputFolderLock second(folder);
    FAIL("the second lock was granted");
  } catch (const OutputError& e) {
    const std::string m = e.what();
    INFO(m);
    CHECK(m.find(folder.string()) != std::string::npos);
    CHECK(m.find("in use by another aquiledger run") != std::string::npos);
    CHECK(m.find("process " + std::to_string(getpid()) + " on host ") != std::string::npos);
  }
  first.reset();
  CHECK_FALSE(std::filesystem::exists(folder / OutputFolderLock::file_name));
  OutputFolderLock again(folder);  // free once released
  CHECK(again.stale_owner().empty());
  std::filesystem::remove_all(folder);
}

TEST_CASE("a lock file left by a run that ended is taken over", "[output_lock]") {
  const auto folder = fresh_folder("stale");
  std::filesystem::create_directories(folder);
  const std::string left = "process 4194303 on host elsewhere, started 2026-01-01T00:00:00Z";
  std::ofstream(folder / OutputFolderLock::file_name) << left << "\n";
  {
    OutputFolderLock lock(folder);
    CHECK(lock.stale_owner() == left);
  }
  std::filesystem::remove_all(folder);
}
