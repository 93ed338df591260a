#pragma once
// Helpers for the reader tests: a small valid model (3 rows x 4 columns of 10 m cells, origin
// at (0, 0), so x runs 0..40 m and y 0..30 m) and edits of its text.
#include <catch2/catch.hpp>
#include <string>

#include "io/model_file/model_reader.hpp"

namespace reader_test {

inline const std::string data_dir = std::string(AQUILEDGER_TEST_DATA_DIR) + "/reader";

inline std::string base_model() {
  return R"([model]
title = "small test model"
length_unit = "m"
time_unit = "d"

[grid]
nrow = 3
ncol = 4
dx = 10.0
dy = 10.0
origin = [0.0, 0.0]

[aquifer]
top = 10.0
bottom = 0.0
k = 5.0
condition = "switching"
specific_yield = 0.2
specific_storage = 1.0e-5

[initial]
head = 9.0

[[period]]
name = "first"
length = 10.0
steps = 2

[[period]]
name = "second"
length = 20.0
steps = 4
growth = 1.5
)";
}

/// The text with `from` (which must occur) replaced by `to`.
inline std::string edit(std::string text, const std::string& from, const std::string& to) {
  const auto pos = text.find(from);
  REQUIRE(pos != std::string::npos);
  return text.replace(pos, from.size(), to);
}

/// 1-based line of the first occurrence of `what` in `text`.
inline int line_of(const std::string& text, const std::string& what) {
  const auto pos = text.find(what);
  REQUIRE(pos != std::string::npos);
  return 1 + static_cast<int>(
                 std::count(text.begin(), text.begin() + static_cast<std::ptrdiff_t>(pos), '\n'));
}

inline aquiledger::ReadResult read(const std::string& text) {
  return aquiledger::read_model_text(text, data_dir + "/inline.toml");
}

inline std::string all_messages(const aquiledger::ReadResult& r) {
  std::string s;
  for (const auto& d : r.diagnostics) s += d.to_string() + "\n";
  return s;
}

/// True when an error names `key` (exactly) and its message contains every fragment; when
/// line > 0 the error must also be on that line.
inline bool has_error(const aquiledger::ReadResult& r, const std::string& key,
                      std::initializer_list<std::string> fragments, int line = 0) {
  for (const auto& d : r.diagnostics) {
    if (d.severity != aquiledger::Severity::error || d.key != key) continue;
    if (line > 0 && d.line != line) continue;
    bool all = true;
    for (const auto& f : fragments) all = all && d.message.find(f) != std::string::npos;
    if (all) return true;
  }
  return false;
}

inline bool has_warning(const aquiledger::ReadResult& r, const std::string& key,
                        const std::string& fragment) {
  for (const auto& d : r.diagnostics)
    if (d.severity == aquiledger::Severity::warning && d.key == key &&
        d.message.find(fragment) != std::string::npos)
      return true;
  return false;
}

}  // namespace reader_test
