#include "io/files/csv_table.hpp"

#include <charconv>
#include <cmath>
#include <fstream>
#include <limits>
#include <sstream>

#include "io/files/output_error.hpp"
#include "io/files/read_error.hpp"

namespace aquiledger {

std::optional<std::size_t> CsvTable::column(const std::string& name) const {
  for (std::size_t i = 0; i < header.size(); ++i)
    if (header[i] == name) return i;
  return std::nullopt;
}

std::vector<double> CsvTable::numbers(const std::string& name) const {
  std::vector<double> out;
  const auto c = column(name);
  if (!c) return out;
  for (const auto& row : rows) {
    double v = std::numeric_limits<double>::quiet_NaN();
    if (*c < row.size()) {
      const std::string& s = row[*c];
      double parsed = 0.0;
      const auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), parsed);
      if (ec == std::errc() && p == s.data() + s.size()) v = parsed;
    }
    out.push_back(v);
  }
  return out;
}

std::vector<std::string> CsvTable::texts(const std::string& name) const {
  std::vector<std::string> out;
  const auto c = column(name);
  if (!c) return out;
  for (const auto& row : rows) out.push_back(*c < row.size() ? row[*c] : std::string());
  return out;
}

std::string trimmed_cell(const std::string& cell) {
  const auto b = cell.find_first_not_of(" \t\r"), e = cell.find_last_not_of(" \t\r");
  return b == std::string::npos ? std::string() : cell.substr(b, e - b + 1);
}

CsvTable parse_csv(const std::string& text) {
  std::vector<std::vector<std::string>> records;
  std::vector<int> lines;  // file line where each record starts
  std::vector<std::string> record;
  std::string field;
  bool quoted = false, any = false;
  int line = 1, record_line = 1;
  for (std::size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (c == '\n' || (c == '\r' && !(i + 1 < text.size() && text[i + 1] == '\n'))) ++line;
    if (quoted) {
      if (c == '"' && i + 1 < text.size() && text[i + 1] == '"') {
        field += '"';
        ++i;
      } else if (c == '"') {
        quoted = false;
      } else {
        field += c;
      }
    } else if (c == '"') {
      quoted = any = true;
    } else if (c == ',') {
      record.push_back(field);
      field.clear();
      any = true;
    } else if (c == '\n' || c == '\r') {
      if (c == '\r' && i + 1 < text.size() && text[i + 1] == '\n') ++i, ++line;
      if (any || !field.empty()) {
        record.push_back(field);
        records.push_back(record);
        lines.push_back(record_line);
      }
      record_line = line;
      record.clear();
      field.clear();
      any = false;
    } else {
      field += c;
      any = true;
    }
  }
  if (any || !field.empty()) {
    record.push_back(field);
    records.push_back(record);
    lines.push_back(record_line);
  }
  CsvTable table;
  if (records.empty()) return table;
  table.header = records.front();
  table.header_line = lines.front();
  table.rows.assign(records.begin() + 1, records.end());
  table.row_lines.assign(lines.begin() + 1, lines.end());
  return table;
}

std::string read_text_file(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw ReadError("cannot read " + path.string());
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

CsvTable read_csv_file(const std::filesystem::path& path) {
  return parse_csv(read_text_file(path));
}

}  // namespace aquiledger
