#pragma once
// A small model for the writer tests: variable spacing, one inactive cell, distinct values in
// every cell so that any mix-up of rows, columns or arrays shows.
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <string>
#include <system_error>
#include <vector>

#include "solver/model.hpp"

namespace aquiledger::testing {

/// 2 rows x 3 columns; column widths 10, 20, 40; row heights 5 (north), 15 (south);
/// origin (100, 200); the north-east cell (row 0, col 2) is inactive.
inline Model small_model() {
  Model m;
  m.title = "writer test \"basin\", <small>";
  // Move-assigned from strings: GCC 12 warns (-Wrestrict) on the inlined assign of a short
  // literal here, a known false positive of that compiler.
  m.length_unit = std::string("m");
  m.time_unit = std::string("d");
  m.grid = RectilinearGrid({10.0, 20.0, 40.0}, {5.0, 15.0}, 100.0, 200.0, {1, 1, 0, 1, 1, 1});
  const int n = m.grid.n_cells();
  m.aquifer.condition = Condition::switching;
  for (int c = 0; c < n; ++c) {
    m.aquifer.kx.values().push_back(1.0 / (c + 3.0));  // not representable in short decimals
    m.aquifer.ky.values().push_back(0.1 * (c + 1));
    m.aquifer.top.values().push_back(40.0 + c / 7.0);
    m.aquifer.bottom.values().push_back(-c / 3.0);
    m.aquifer.specific_storage.values().push_back(1.0e-6 * std::sqrt(c + 2.0));
    m.aquifer.specific_yield.values().push_back(0.1 + c / 97.0);
  }
  return m;
}

/// The folders scratch_folder made in this process.
inline std::vector<std::filesystem::path>& scratch_folders_made() {
  static std::vector<std::filesystem::path> made;
  return made;
}

/// Removes every folder scratch_folder made; runs when the test program exits, passed or
/// failed (registered after the list exists, so it runs before the list is destroyed).
inline void remove_scratch_folders() {
  for (const auto& folder : scratch_folders_made()) {
    std::error_code ignored;
    std::filesystem::remove_all(folder, ignored);
  }
}

/// A fresh empty folder for one test's files, removed when the test program exits.
inline std::filesystem::path scratch_folder(const std::string& name) {
  static const bool cleanup_registered = [] {
    scratch_folders_made();
    return std::atexit(remove_scratch_folders) == 0;
  }();
  (void)cleanup_registered;
  const auto folder = std::filesystem::temp_directory_path() /
                      ("aquiledger-test-" + name + "-" + std::to_string(::getpid()));
  std::filesystem::remove_all(folder);
  std::filesystem::create_directories(folder);
  scratch_folders_made().push_back(folder);
  return folder;
}

/// Names of regular files in a folder (to prove no temporary is left behind).
inline std::vector<std::string> file_names(const std::filesystem::path& folder) {
  std::vector<std::string> names;
  for (const auto& e : std::filesystem::directory_iterator(folder))
    names.push_back(e.path().filename().string());
  std::sort(names.begin(), names.end());
  return names;
}

}  // namespace aquiledger::testing
