#include "io/model_file/array_source.hpp"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <fstream>

#include "io/files/input_file_guard.hpp"

namespace aquiledger {

std::size_t ArraySource::n_values() const {
  std::size_t n = 0;
  for (const auto& r : rows) n += r.n_values;
  return n;
}

std::optional<double> parse_value(const std::string& token) {
  const char* begin = token.data();
  const char* end = token.data() + token.size();
  if (begin != end && *begin == '+') ++begin;
  double value = 0.0;
  auto [stop, ec] = std::from_chars(begin, end, value);
  if (ec != std::errc() || stop != end || !std::isfinite(value)) return std::nullopt;
  return value;
}

namespace {

/// Splits a line (comment removed) at white space and commas.
std::vector<std::string> split_tokens(const std::string& line) {
  std::vector<std::string> tokens;
  std::string current;
  for (char c : line) {
    if (c == '#') break;
    if (std::isspace(static_cast<unsigned char>(c)) || c == ',') {
      if (!current.empty()) tokens.push_back(std::move(current));
      current.clear();
    } else {
      current += c;
    }
  }
  if (!current.empty()) tokens.push_back(std::move(current));
  return tokens;
}

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return std::tolower(c); });
  return s;
}

/// Reads the six (or five, without NODATA_value) header lines of a raster.
void read_raster_header(std::ifstream& in, int& line_no, ArraySource& out,
                        std::string& first_data_line, int& first_data_line_no) {
  RasterHeader h;
  bool have_ncols = false, have_nrows = false, have_x = false, have_y = false, have_size = false;
  std::string line;
  while (std::getline(in, line)) {
    ++line_no;
    auto tokens = split_tokens(line);
    if (tokens.empty()) continue;
    const std::string key = lower(tokens[0]);
    const bool is_header = key == "ncols" || key == "nrows" || key == "xllcorner" ||
                           key == "yllcorner" || key == "xllcenter" || key == "yllcenter" ||
                           key == "cellsize" || key == "nodata_value";
    if (!is_header) {
      first_data_line = line;
      first_data_line_no = line_no;
      break;
    }
    std::optional<double> v = tokens.size() == 2 ? parse_value(tokens[1]) : std::nullopt;
    if (!v) {
      out.problems.push_back(
          {line_no, "raster header line '" + line + "' needs one number after the key"});
      continue;
    }
    if (key == "ncols") h.ncols = static_cast<int>(*v), have_ncols = true;
    if (key == "nrows") h.nrows = static_cast<int>(*v), have_nrows = true;
    if (key == "xllcorner" || key == "xllcenter")
      h.xll = *v, have_x = true, h.centre_given = key == "xllcenter";
    if (key == "yllcorner" || key == "yllcenter") h.yll = *v, have_y = true;
    if (key == "cellsize") h.cellsize = *v, have_size = true;
    if (key == "nodata_value") h.nodata = *v;
  }
  if (!(have_ncols && have_nrows && have_x && have_y && have_size))
    out.problems.push_back(
        {line_no, "raster header incomplete: needs ncols, nrows, xllcorner, yllcorner, cellsize"});
  out.raster = h;
}

void read_data_line(const std::string& line, int line_no, ArraySource& out) {
  auto tokens = split_tokens(line);
  if (tokens.empty()) return;
  ArrayRow row;
  row.line = line_no;
  row.n_values = tokens.size();
  const int index = static_cast<int>(out.rows.size());
  const bool keep = !out.band || (index >= out.band->first && index < out.band->end());
  if (keep) row.values.reserve(tokens.size());
  for (std::size_t t = 0; t < tokens.size(); ++t) {
    auto v = parse_value(tokens[t]);
    if (!v) {
      const std::string lower_token = lower(tokens[t]);
      const bool is_nan = lower_token.find("nan") != std::string::npos ||
                          lower_token.find("inf") != std::string::npos;
      out.problems.push_back({line_no, (is_nan ? "value '" : "not a number: '") + tokens[t] +
                                           "' (value " + std::to_string(t + 1) + " on the line)" +
                                           (is_nan ? " is not a finite number" : "")});
      if (keep) row.values.push_back(std::nan(""));
      continue;
    }
    if (out.raster && out.raster->nodata && *v == *out.raster->nodata) v = std::nan("");
    if (keep) row.values.push_back(*v);
  }
  out.rows.push_back(std::move(row));
}

}  // namespace

ArraySource load_array_source(const std::filesystem::path& file, std::uintmax_t max_bytes,
                              std::optional<RowBand> band) {
  ArraySource out;
  out.file = file;
  out.band = band;
  if (auto refusal = input_file_refusal(file, max_bytes)) {
    out.readable = true;  // it exists; the refusal is the message
    out.refusal = std::move(*refusal);
    return out;
  }
  std::ifstream in(file);
  if (!in) return out;
  out.readable = true;
  int line_no = 0;
  std::string line;
  if (lower(file.extension().string()) == ".asc") {
    std::string first;
    int first_no = 0;
    read_raster_header(in, line_no, out, first, first_no);
    if (first_no > 0) read_data_line(first, first_no, out);
  }
  while (std::getline(in, line)) read_data_line(line, ++line_no, out);
  return out;
}

}  // namespace aquiledger
