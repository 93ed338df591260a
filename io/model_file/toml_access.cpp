#include "io/model_file/toml_access.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <sstream>
#include <vector>

#include "io/files/calendar.hpp"

namespace aquiledger {

SourceSpot ReaderContext::spot(const toml::source_region& region) const {
  return {model_file, static_cast<int>(region.begin.line), static_cast<int>(region.begin.column)};
}

SourceSpot ReaderContext::spot(const toml::node& node) const { return spot(node.source()); }

std::filesystem::path ReaderContext::resolve(const std::string& relative) const {
  const std::filesystem::path p(relative);
  return (p.is_absolute() ? p : base_dir / p).lexically_normal();
}

std::string describe_cell(int n_cols, int cell) {
  return "row " + std::to_string(cell / n_cols + 1) + ", column " +
         std::to_string(cell % n_cols + 1);
}

int edit_distance(std::string_view a, std::string_view b) {
  std::vector<int> prev(b.size() + 1), cur(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = static_cast<int>(j);
  for (std::size_t i = 1; i <= a.size(); ++i) {
    cur[0] = static_cast<int>(i);
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const int substitution = prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1);
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, substitution});
    }
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

std::optional<std::string> closest_word(std::string_view word,
                                        std::initializer_list<std::string_view> allowed) {
  // A cut-short word ("switch" for "switching") is as likely a slip as a typo.
  if (word.size() >= 3)
    for (std::string_view candidate : allowed)
      if (candidate.substr(0, word.size()) == word) return std::string(candidate);
  std::optional<std::string> best;
  int best_distance = 0;
  for (std::string_view candidate : allowed) {
    const int d = edit_distance(word, candidate);
    if (!best || d < best_distance) {
      best = std::string(candidate);
      best_distance = d;
    }
  }
  // A typo changes a few letters; beyond a third of the word it is a different word.
  const int limit = std::max(2, static_cast<int>(word.size()) / 3);
  if (best && best_distance <= limit) return best;
  return std::nullopt;
}

namespace {
std::string list_words(std::initializer_list<std::string_view> words) {
  std::string s;
  for (std::string_view w : words) {
    if (!s.empty()) s += ", ";
    s += std::string(w);
  }
  return s;
}
}  // namespace

void check_keys(ReaderContext& ctx, const toml::table& table, const std::string& path,
                std::initializer_list<std::string_view> allowed) {
  for (auto&& [key, value] : table) {
    const std::string_view k = key.str();
    if (std::find(allowed.begin(), allowed.end(), k) != allowed.end()) continue;
    std::string message = "unknown key '" + std::string(k) + "'";
    if (auto guess = closest_word(k, allowed)) message += "; did you mean '" + *guess + "'?";
    message += " (allowed here: " + list_words(allowed) + ")";
    SourceSpot at = ctx.spot(key.source());
    if (at.line == 0) at = ctx.spot(value);
    ctx.error(at, key_path(path, k), message);
  }
}

std::string type_name(const toml::node& node) {
  switch (node.type()) {
    case toml::node_type::table:
      return "table";
    case toml::node_type::array:
      return "array";
    case toml::node_type::string:
      return "string";
    case toml::node_type::integer:
      return "integer";
    case toml::node_type::floating_point:
      return std::isfinite(node.as_floating_point()->get()) ? "number" : "non-finite number";
    case toml::node_type::boolean:
      return "boolean";
    case toml::node_type::date:
      return "date";
    case toml::node_type::time:
      return "time";
    case toml::node_type::date_time:
      return "date-time";
    default:
      return "nothing";
  }
}

std::string show_number(double value) {
  char buffer[64];
  auto [end, ec] = std::to_chars(buffer, buffer + sizeof buffer, value);
  return ec == std::errc() ? std::string(buffer, end) : std::to_string(value);
}

namespace {

/// Appends a short TOML-like rendering of node, stopping once out is longer than limit.
/// Arrays and tables are rendered here, not by TOML++'s formatter: that one (3.3) converts
/// log10 of a floating-point value below 1 to an unsigned count (undefined behaviour, found
/// by tests/fuzz; regression tests/data/fuzz/formatter-log10.toml), and it formats a long
/// array whole only for the message to cut it.
void render(const toml::node& node, std::string& out, std::size_t limit) {
  if (out.size() > limit) return;
  if (auto s = node.as_string()) {
    out += '"' + s->get() + '"';
  } else if (auto i = node.as_integer()) {
    out += show_number(static_cast<double>(i->get()));
  } else if (auto f = node.as_floating_point()) {
    out += show_number(f->get());
  } else if (auto b = node.as_boolean()) {
    out += b->get() ? "true" : "false";
  } else if (auto a = node.as_array()) {
    out += '[';
    for (std::size_t k = 0; k < a->size() && out.size() <= limit; ++k) {
      if (k > 0) out += ", ";
      render(*a->get(k), out, limit);
    }
    out += ']';
  } else if (auto t = node.as_table()) {
    out += '{';
    bool first = true;
    for (auto&& [key, value] : *t) {
      if (out.size() > limit) break;
      out += first ? " " : ", ";
      first = false;
      out += std::string(key.str()) + " = ";
      render(value, out, limit);
    }
    out += first ? "}" : " }";
  } else {
    std::ostringstream text;  // dates and times
    node.visit([&](auto&& n) { text << n; });
    out += text.str();
  }
}

}  // namespace

std::string show(const toml::node& node) {
  std::string text;
  render(node, text, 60);
  if (text.size() > 60) text = text.substr(0, 57) + "...";
  for (char& c : text)
    if (c == '\n' || c == '\r') c = ' ';
  return text;
}

std::optional<double> number_of(const toml::node& node) {
  if (auto i = node.as_integer()) return static_cast<double>(i->get());
  // TOML allows inf and nan; no quantity of a model is either, so they are not numbers here
  // and every caller reports them where it reports a wrong type, with file, line and key.
  if (auto f = node.as_floating_point(); f && std::isfinite(f->get())) return f->get();
  return std::nullopt;
}

namespace {
void missing(ReaderContext& ctx, const toml::table& table, std::string_view key,
             const std::string& path, const std::string& expected) {
  ctx.error(ctx.spot(table), key_path(path, key),
            "missing required key (expected " + expected + ")");
}
void wrong_type(ReaderContext& ctx, const toml::node& node, std::string_view key,
                const std::string& path, const std::string& expected) {
  ctx.error(node, key_path(path, key),
            "expected " + expected + ", found " + type_name(node) + " " + show(node));
}
}  // namespace

std::optional<double> read_number(ReaderContext& ctx, const toml::table& table,
                                  std::string_view key, const std::string& path, bool required) {
  const toml::node* node = table.get(key);
  if (!node) {
    if (required) missing(ctx, table, key, path, "a number");
    return std::nullopt;
  }
  auto value = number_of(*node);
  if (!value) wrong_type(ctx, *node, key, path, "a number");
  return value;
}

std::optional<std::vector<double>> read_number_array(ReaderContext& ctx, const toml::node& node,
                                                     const std::string& key) {
  return read_array_entries(
      ctx, node, key, [](ReaderContext& c, const toml::node& element, const std::string& at) {
        auto v = number_of(element);
        if (!v) c.error(element, at, "expected a finite number, found " + show(element));
        return v;
      });
}

std::optional<long long> read_integer(ReaderContext& ctx, const toml::table& table,
                                      std::string_view key, const std::string& path,
                                      bool required) {
  const toml::node* node = table.get(key);
  if (!node) {
    if (required) missing(ctx, table, key, path, "an integer");
    return std::nullopt;
  }
  if (auto i = node->as_integer()) return i->get();
  wrong_type(ctx, *node, key, path, "an integer");
  return std::nullopt;
}

std::optional<bool> read_bool(ReaderContext& ctx, const toml::table& table, std::string_view key,
                              const std::string& path) {
  const toml::node* node = table.get(key);
  if (!node) return std::nullopt;
  if (auto b = node->as_boolean()) return b->get();
  wrong_type(ctx, *node, key, path, "true or false");
  return std::nullopt;
}

std::optional<double> read_calendar_time(ReaderContext& ctx, const toml::table& table,
                                         std::string_view key, const std::string& path,
                                         bool required) {
  const toml::node* node = table.get(key);
  if (!node) {
    if (required) missing(ctx, table, key, path, "a date such as 2021-03-01");
    return std::nullopt;
  }
  std::string text;
  if (auto s = node->as_string()) {
    text = s->get();
  } else if (auto d = node->as_date()) {
    std::ostringstream out;
    out << d->get();
    text = out.str();
  } else if (auto dt = node->as_date_time()) {
    if (dt->get().offset) {
      ctx.error(*node, key_path(path, key),
                "value " + show(*node) +
                    " has a time-zone offset; give a local date-time "
                    "without one (model times carry no time zone)");
      return std::nullopt;
    }
    std::ostringstream out;
    out << dt->get().date << 'T' << dt->get().time;
    text = out.str();
  } else {
    wrong_type(ctx, *node, key, path, "a date such as 2021-03-01");
    return std::nullopt;
  }
  // TOML times may carry fractions of a second; whole seconds are kept.
  if (text.size() > 19 && text[19] == '.') text.resize(19);
  if (auto seconds = parse_calendar_time(text)) return seconds;
  ctx.error(*node, key_path(path, key),
            "value " + show(*node) +
                " is not a calendar date (expected YYYY-MM-DD, optionally with Thh:mm or "
                "Thh:mm:ss, a day that exists)");
  return std::nullopt;
}

std::optional<std::string> read_string(ReaderContext& ctx, const toml::table& table,
                                       std::string_view key, const std::string& path,
                                       bool required) {
  const toml::node* node = table.get(key);
  if (!node) {
    if (required) missing(ctx, table, key, path, "a string");
    return std::nullopt;
  }
  if (auto s = node->as_string()) return s->get();
  wrong_type(ctx, *node, key, path, "a string");
  return std::nullopt;
}

std::optional<std::string> read_choice(ReaderContext& ctx, const toml::table& table,
                                       std::string_view key, const std::string& path,
                                       std::initializer_list<std::string_view> allowed) {
  auto value = read_string(ctx, table, key, path, false);
  if (!value) return std::nullopt;
  if (std::find(allowed.begin(), allowed.end(), *value) != allowed.end()) return value;
  std::string message = "unknown value \"" + *value + "\"; allowed: " + list_words(allowed);
  if (auto guess = closest_word(*value, allowed)) message += " (did you mean \"" + *guess + "\"?)";
  ctx.error(*table.get(key), key_path(path, key), message);
  return std::nullopt;
}

}  // namespace aquiledger
