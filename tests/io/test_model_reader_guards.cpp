// Input that would exhaust memory, time or the reader itself is refused before anything big
// is allocated or read, with the estimated figure (io/model_file/memory_guard,
// io/files/input_file_guard).
#include <sys/stat.h>
#include <unistd.h>

#include <catch2/catch.hpp>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "io/model_file/model_reader.hpp"

namespace {

namespace fs = std::filesystem;
using aquiledger::read_model_file;
using aquiledger::read_model_text;
using aquiledger::ReadResult;

std::string model_text(long nrow, long ncol, const std::string& k, const std::string& periods) {
  return "[grid]\nnrow = " + std::to_string(nrow) + "\nncol = " + std::to_string(ncol) +
         "\ndx = 1.0\ndy = 1.0\n[aquifer]\ntop = 1.0\nbottom = 0.0\nk = " + k +
         "\ncondition = \"confined\"\nspecific_storage = 1e-5\n[initial]\nhead = 0.5\n" + periods;
}

const std::string one_period = "[[period]]\nlength = 1.0\nsteps = 1\n";

/// True when some error message contains every one of the parts.
bool error_says(const ReadResult& r, std::initializer_list<std::string> parts) {
  for (const auto& d : r.diagnostics) {
    bool all = d.severity == aquiledger::Severity::error;
    for (const auto& p : parts) all = all && d.message.find(p) != std::string::npos;
    if (all) return true;
  }
  return false;
}

struct TempFolder {
  fs::path path;
  TempFolder() {
    path = fs::temp_directory_path() / ("aquiledger-guards-" + std::to_string(::getpid()));
    fs::create_directories(path);
  }
  ~TempFolder() {
    std::error_code ignored;
    fs::remove_all(path, ignored);
  }
};

}  // namespace

TEST_CASE("a grid larger than memory is refused with the estimate", "[io][guards]") {
  // 40000 x 40000 = 1.6e9 cells at the guard's 1 KiB per cell = 1.6384e12 bytes = 1525.9 GiB
  // (arithmetic), more than any machine this runs on.
  const ReadResult r =
      read_model_text(model_text(40000, 40000, "1.0", one_period), "/x/model.toml");
  CHECK_FALSE(r.ok());
  CHECK(error_says(r, {"1600000000 cells", "1525.9 GiB"}));
}

TEST_CASE("AQUILEDGER_MEMORY_LIMIT_MB lowers the memory the guard allows", "[io][guards]") {
  // 1000 x 1000 cells need about 1e6 KiB = 0.95 GiB, more than a 100 MiB limit.
  ::setenv("AQUILEDGER_MEMORY_LIMIT_MB", "100", 1);
  const ReadResult r = read_model_text(model_text(1000, 1000, "1.0", one_period), "/x/model.toml");
  ::unsetenv("AQUILEDGER_MEMORY_LIMIT_MB");
  CHECK_FALSE(r.ok());
  CHECK(error_says(r, {"1000000 cells", "1.0 GiB", "only 0.1 GiB"}));
}

TEST_CASE("a run of more than 1e12 cell-steps is refused with the figure", "[io][guards]") {
  // 2000 x 1000 cells over 10 periods of 1e6 steps: 2e6 x 1e7 = 2e13 cell-steps.
  std::string periods;
  for (int p = 0; p < 10; ++p) periods += "[[period]]\nlength = 1.0\nsteps = 1000000\n";
  const ReadResult r = read_model_text(model_text(2000, 1000, "1.0", periods), "/x/model.toml");
  CHECK_FALSE(r.ok());
  CHECK(error_says(r, {"2000000 cells over 10000000 time steps", "2e+13 cell-steps"}));
}

TEST_CASE("an array file far larger than the grid needs is not read", "[io][guards]") {
  TempFolder dir;
  // A sparse 10 GiB file: 10 GiB of NUL bytes that take no disk space.
  std::ofstream(dir.path / "k.txt").close();
  fs::resize_file(dir.path / "k.txt", 10ull << 30);
  // 100 x 100 cells may take 64 B x 1e4 + 1 MiB = 1.6 MiB (io/files/input_file_guard.hpp).
  const ReadResult r = read_model_text(model_text(100, 100, "{ file = \"k.txt\" }", one_period),
                                       dir.path / "model.toml");
  CHECK_FALSE(r.ok());
  CHECK(error_says(r, {"k.txt", "10.0 GiB", "1.6 MiB", "not read"}));
}

TEST_CASE("devices, pipes and folders are not read as input files", "[io][guards]") {
  TempFolder dir;
  // /dev/zero never ends and a FIFO without a writer blocks for ever: both would hang.
  const std::string fifo = (dir.path / "pipe.txt").string();
  REQUIRE(::mkfifo(fifo.c_str(), 0600) == 0);
  fs::create_directories(dir.path / "folder.txt");
  const std::vector<std::string> files{"/dev/zero", fifo, (dir.path / "folder.txt").string()};
  for (const std::string& file : files) {
    INFO(file);
    const ReadResult r = read_model_text(
        model_text(3, 4, "{ file = \"" + file + "\" }", one_period), dir.path / "model.toml");
    CHECK_FALSE(r.ok());
    CHECK(error_says(r, {"is not a regular file"}));
  }
  const ReadResult model = read_model_file("/dev/zero");
  CHECK_FALSE(model.ok());
  CHECK(error_says(model, {"model file", "is not a regular file"}));
}
