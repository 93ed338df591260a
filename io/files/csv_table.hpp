#pragma once
// A small CSV reader (RFC 4180 quoting): the result tables for the HTML report, and the
// time-series and feature tables a model reads.
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

namespace aquiledger {

struct CsvTable {
  std::vector<std::string> header;
  std::vector<std::vector<std::string>> rows;
  int header_line = 1;         ///< file line (1-based) of the header
  std::vector<int> row_lines;  ///< file line where each row starts (blank lines are skipped)
  /// Index of a column, if present.
  std::optional<std::size_t> column(const std::string& name) const;
  /// The column as numbers ("nan" and unparsable cells read NaN); empty when absent.
  std::vector<double> numbers(const std::string& name) const;
  /// The column as text; empty when absent.
  std::vector<std::string> texts(const std::string& name) const;
};

/// The cell text without leading and trailing blanks (spaces, tabs, carriage returns).
std::string trimmed_cell(const std::string& cell);

/// Parses CSV text whose first line is the header.
CsvTable parse_csv(const std::string& text);

/// Reads and parses a file; throws ReadError naming the path when it cannot be read.
CsvTable read_csv_file(const std::filesystem::path& path);

/// Whole file as text; throws ReadError naming the path.
std::string read_text_file(const std::filesystem::path& path);

}  // namespace aquiledger
