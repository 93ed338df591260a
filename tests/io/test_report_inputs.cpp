// The small readers and writers behind the HTML report: CSV as RFC 4180 defines it, JSON
// strings as RFC 8259 defines them.
#include <catch2/catch.hpp>
#include <cmath>

#include "io/files/csv_table.hpp"
#include "io/files/output_error.hpp"
#include "io/files/read_error.hpp"
#include "io/reports/html_report.hpp"
#include "io/reports/results_report.hpp"
#include "io/reports/vega_charts.hpp"

using namespace aquiledger;

TEST_CASE("CSV reader follows RFC 4180 quoting", "[report]") {
  // RFC 4180 section 2: fields with commas, quotes or line breaks are quoted; a quote inside
  // is doubled; CRLF ends a record.
  const CsvTable t =
      parse_csv("name,value\r\n\"a, b\",1.5\r\n\"say \"\"hi\"\"\",nan\r\n\"two\nlines\",-2e3\r\n");
  REQUIRE(t.header == std::vector<std::string>{"name", "value"});
  REQUIRE(t.rows.size() == 3);
  CHECK(t.texts("name") == std::vector<std::string>{"a, b", "say \"hi\"", "two\nlines"});
  const std::vector<double> v = t.numbers("value");
  CHECK(v[0] == 1.5);
  CHECK(std::isnan(v[1]));
  CHECK(v[2] == -2000.0);
  CHECK(t.numbers("missing").empty());
}

TEST_CASE("JSON strings are escaped and read back as RFC 8259 defines", "[report]") {
  // RFC 8259 section 7: quotation mark, reverse solidus and control characters are escaped,
  // with the two-character form where the RFC has one (\n) and \u00XX otherwise.
  CHECK(vega_json_string("a\"b\\c\n") == "\"a\\\"b\\\\c\\n\"");
  CHECK(vega_json_string(std::string("\x01")) == "\"\\u0001\"");
  // "<" is written as \u003c so inlined JSON cannot close a script element (HTML 5,
  // "restrictions for contents of script elements").
  CHECK(vega_json_string("</script>") == "\"\\u003c/script>\"");
  CHECK(vega_json_number(NAN) == "null");
  CHECK(vega_json_number(0.1) == "0.1");  // shortest round-trip form
  const std::string json =
      "{\n  \"model_file\": \"cases/a \\\"b\\\".toml\",\n  \"failure\": null\n}";
  CHECK(json_text_value(json, "model_file") == "cases/a \"b\".toml");
  CHECK(json_text_value(json, "failure").empty());
  CHECK(json_text_value(json, "absent").empty());
}

TEST_CASE("a missing Vega library is reported with the package to install", "[report]") {
  // The report must open offline, so it cannot fall back to a network copy: without
  // Debian's libjs-vega it fails with a message naming the file and the package.
  try {
    load_vega_library("/nonexistent/vega");
    FAIL("no error for a missing Vega library");
  } catch (const ReadError& e) {
    const std::string message = e.what();
    CHECK(message.find("/nonexistent/vega/vega-util.min.js") != std::string::npos);
    CHECK(message.find("libjs-vega") != std::string::npos);
  }
}
