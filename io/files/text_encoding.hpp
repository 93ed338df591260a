#pragma once
// Text in the result files' encodings: CSV fields (RFC 4180) and JSON literals (RFC 8259).
// Every writer of CSV or JSON (tables, summary.json, the sources files, chart specifications)
// encodes through these.
#include <string>
#include <string_view>

namespace aquiledger {

/// A CSV text field, quoted as RFC 4180 asks only when it holds a comma, a quote or a line
/// break (a quote inside is doubled).
std::string csv_text(std::string_view text);

/// A JSON string literal (RFC 8259 section 7): quote, backslash and control characters
/// escaped (\n, \t ... where JSON has a short form, \u00XX otherwise); other bytes (UTF-8)
/// pass through.
std::string json_string(std::string_view text);

/// json_string with '<' written as \u003c as well, so that the literal can stand inside an
/// HTML <script> element ("</script>" cannot end it early).
std::string json_string_for_html(std::string_view text);

/// The shortest text that reads back to the same double (fmt's "{}"); JSON has no NaN or
/// infinity, so those become null.
std::string json_number(double v);

}  // namespace aquiledger
