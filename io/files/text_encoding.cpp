#include "io/files/text_encoding.hpp"

#include <fmt/format.h>

#include <cmath>
#include <iterator>

namespace aquiledger {

std::string csv_text(std::string_view text) {
  if (text.find_first_of(",\"\r\n") == std::string_view::npos) return std::string(text);
  std::string quoted = "\"";
  for (char ch : text) {
    if (ch == '"') quoted += '"';
    quoted += ch;
  }
  quoted += '"';
  return quoted;
}

namespace {

std::string json_literal(std::string_view text, bool for_html) {
  std::string out = "\"";
  for (unsigned char ch : text) {
    switch (ch) {
      case '"':
        out += "\\\"";
        break;
      case '\\':
        out += "\\\\";
        break;
      case '\b':
        out += "\\b";
        break;
      case '\f':
        out += "\\f";
        break;
      case '\n':
        out += "\\n";
        break;
      case '\r':
        out += "\\r";
        break;
      case '\t':
        out += "\\t";
        break;
      default:
        if (ch < 0x20 || (for_html && ch == '<'))
          fmt::format_to(std::back_inserter(out), "\\u{:04x}", static_cast<unsigned>(ch));
        else
          out += static_cast<char>(ch);
    }
  }
  out += '"';
  return out;
}

}  // namespace

std::string json_string(std::string_view text) { return json_literal(text, false); }

std::string json_string_for_html(std::string_view text) { return json_literal(text, true); }

std::string json_number(double v) { return std::isfinite(v) ? fmt::format("{}", v) : "null"; }

}  // namespace aquiledger
