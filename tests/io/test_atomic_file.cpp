#include <catch2/catch.hpp>
#include <fstream>
#include <sstream>

#include "io/files/atomic_file.hpp"
#include "small_model.hpp"

using namespace aquiledger;
using aquiledger::testing::file_names;
using aquiledger::testing::scratch_folder;

namespace {
std::string read_all(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}
}  // namespace

TEST_CASE("atomic write replaces the file whole and leaves no temporary", "[io][atomic]") {
  const auto folder = scratch_folder("atomic");
  const auto path = folder / "table.csv";
  write_file_atomically(path, "first version\n");
  write_file_atomically(path, "second, longer version\n");
  CHECK(read_all(path) == "second, longer version\n");
  CHECK(file_names(folder) == std::vector<std::string>{"table.csv"});
  std::filesystem::remove_all(folder);
}

// Tests run as root, for whom permission bits do not stop a write; a path whose parent is a
// regular file fails for every user (POSIX open(2): ENOTDIR).
TEST_CASE("a write below a regular file fails with OutputError naming the path", "[io][atomic]") {
  const auto folder = scratch_folder("atomic-fail");
  write_file_atomically(folder / "plain", "x");
  const auto bad = folder / "plain" / "table.csv";
  try {
    write_file_atomically(bad, "content");
    FAIL("no exception");
  } catch (const OutputError& e) {
    const std::string what = e.what();
    CHECK(what.find(bad.string()) != std::string::npos);
    CHECK(what.find("Not a directory") != std::string::npos);  // strerror(ENOTDIR), glibc
  }
  CHECK(file_names(folder) == std::vector<std::string>{"plain"});
  std::filesystem::remove_all(folder);
}

TEST_CASE("output folder check creates a missing folder and rejects unwritable ones",
          "[io][atomic]") {
  const auto base = scratch_folder("folder-check");
  const auto nested = base / "a" / "b";
  check_output_folder_writable(nested);
  CHECK(std::filesystem::is_directory(nested));
  CHECK(file_names(nested).empty());  // the probe file is gone

  // A folder that cannot be created: its parent is a regular file.
  write_file_atomically(base / "plain", "x");
  CHECK_THROWS_AS(check_output_folder_writable(base / "plain" / "results"), OutputError);
  // An existing folder where no file can be created, even by root: /proc (procfs refuses
  // new files, proc(5)).
  try {
    check_output_folder_writable("/proc");
    FAIL("no exception");
  } catch (const OutputError& e) {
    CHECK(std::string(e.what()).find("/proc") != std::string::npos);
  }
  std::filesystem::remove_all(base);
}
