#pragma once
// The model folder a fuzz input is read in: shared by the fuzz target and the regression
// test (tests/io/test_model_reader_fuzz_regressions.cpp) so that both read an input the same way.
#include <array>
#include <string_view>

namespace fuzz_test {

/// Source-relative folders that hold seed models (and the array files they name).
inline constexpr std::array<std::string_view, 3> seed_folders{
    "tests/data/reader", "cases/01-marrow-basin", "tests/data/robust"};

/// The folder named by a first line "#@FOLDER" when it is one of seed_folders, else the first.
inline std::string_view folder_of(std::string_view text) {
  if (text.substr(0, 2) == "#@") {
    const std::string_view line = text.substr(2, text.find('\n') - 2);
    for (std::string_view f : seed_folders)
      if (line == f ||
          (line.size() == f.size() + 1 && line.back() == '\r' && line.substr(0, f.size()) == f))
        return f;
  }
  return seed_folders[0];
}

}  // namespace fuzz_test
