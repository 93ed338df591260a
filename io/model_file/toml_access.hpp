#pragma once
// Typed access to TOML values with messages naming the key, the value found and what was
// expected (io-internal header).
#include <toml++/toml.h>

#include <initializer_list>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "io/model_file/reader_context.hpp"

namespace aquiledger {

/// Levenshtein distance between two keys (for did-you-mean suggestions).
int edit_distance(std::string_view a, std::string_view b);
/// The closest allowed word to `word`, if close enough to be a likely typo.
std::optional<std::string> closest_word(std::string_view word,
                                        std::initializer_list<std::string_view> allowed);

/// Reports every key of `table` not in `allowed`, with a suggestion.
void check_keys(ReaderContext& ctx, const toml::table& table, const std::string& path,
                std::initializer_list<std::string_view> allowed);

/// The TOML type name of a node, for messages ("string", "integer", "table", ...).
std::string type_name(const toml::node& node);
/// The node's value shown as written, short.
std::string show(const toml::node& node);
/// "12.5" in shortest round-trip form.
std::string show_number(double value);

/// Number (integer or float) at key; error when present with another type or missing+required.
std::optional<double> read_number(ReaderContext& ctx, const toml::table& table,
                                  std::string_view key, const std::string& path, bool required);
std::optional<long long> read_integer(ReaderContext& ctx, const toml::table& table,
                                      std::string_view key, const std::string& path, bool required);
std::optional<bool> read_bool(ReaderContext& ctx, const toml::table& table, std::string_view key,
                              const std::string& path);
std::optional<std::string> read_string(ReaderContext& ctx, const toml::table& table,
                                       std::string_view key, const std::string& path,
                                       bool required);
/// A string that must be one of `allowed`; the error lists the allowed values.
std::optional<std::string> read_choice(ReaderContext& ctx, const toml::table& table,
                                       std::string_view key, const std::string& path,
                                       std::initializer_list<std::string_view> allowed);
/// A calendar time at key (seconds since 1970-01-01, io/files/calendar.hpp): a TOML date or
/// local date-time (2021-03-01, 2021-03-01T06:00:00) or a string in ISO 8601 form; a date-time
/// with a time-zone offset is refused (model times carry no zone).
std::optional<double> read_calendar_time(ReaderContext& ctx, const toml::table& table,
                                         std::string_view key, const std::string& path,
                                         bool required);
/// Number of a node (integer or finite float; inf and nan are not numbers), no message.
std::optional<double> number_of(const toml::node& node);

/// The entries of the array at `node` (key path `key`) each read by
/// `entry(ctx, element, "key[i]")` (an std::optional<double> that has reported its own error
/// when empty), or nullopt with an error when the node is no array or an entry is refused.
template <class Entry>
std::optional<std::vector<double>> read_array_entries(ReaderContext& ctx, const toml::node& node,
                                                      const std::string& key, Entry entry) {
  const toml::array* arr = node.as_array();
  if (!arr) {
    ctx.error(node, key, "expected an array of numbers, found " + type_name(node));
    return std::nullopt;
  }
  std::vector<double> out;
  for (std::size_t i = 0; i < arr->size(); ++i) {
    const std::optional<double> v = entry(ctx, (*arr)[i], key + "[" + std::to_string(i) + "]");
    if (!v) return std::nullopt;
    out.push_back(*v);
  }
  return out;
}
/// An array of finite numbers at `node` (key path `key`), or nullopt with an error.
std::optional<std::vector<double>> read_number_array(ReaderContext& ctx, const toml::node& node,
                                                     const std::string& key);

/// Key path "section.key" for messages.
inline std::string key_path(const std::string& path, std::string_view key) {
  return path + "." + std::string(key);
}

}  // namespace aquiledger
