#pragma once
// The cells of a written CSV file as text, for the writer tests: one row a line, split at
// every comma (the files they read quote no field).
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

namespace aquiledger::testing {

inline std::vector<std::vector<std::string>> read_csv_cells(const std::filesystem::path& p) {
  std::ifstream in(p);
  std::vector<std::vector<std::string>> rows;
  for (std::string line; std::getline(in, line);) {
    rows.emplace_back(1);
    for (char ch : line) {
      if (ch == ',')
        rows.back().emplace_back();
      else
        rows.back().back() += ch;
    }
  }
  return rows;
}

}  // namespace aquiledger::testing
