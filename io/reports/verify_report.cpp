#include "io/reports/verify_report.hpp"

#include <fmt/format.h>

#include <system_error>

#include "io/files/atomic_file.hpp"
#include "io/files/output_error.hpp"
#include "io/reports/html_report.hpp"
#include "io/reports/vega_charts.hpp"

namespace aquiledger {

namespace {

std::string number(double v) { return fmt::format("{:.3g}", v); }

bool is_time_axis(const VerificationCurve& c) { return c.x_label.rfind("time", 0) == 0; }

}  // namespace

std::string verification_table_header() {
  return fmt::format("{:<16} {:<34} {:<66} {:>11} {:>11} {:>9} {:>6}  {}\n", "benchmark", "source",
                     "quantity compared", "error", "tolerance", "error/tol", "result", "time") +
         std::string(170, '-') + "\n";
}

std::string verification_table_row(const VerificationResult& r) {
  const std::string unit = r.unit == "-" ? "" : " " + r.unit;
  return fmt::format(
      "{:<16} {:<34} {:<66} {:>11} {:>11} {:>9.4f} {:>6}  {:.1f} s\n", r.name, r.source, r.quantity,
      number(r.largest_error) + unit, number(r.tolerance) + unit,
      r.tolerance > 0 ? r.largest_error / r.tolerance : 0.0, r.passed ? "pass" : "FAIL", r.seconds);
}

std::string verification_curve_csv(const VerificationCurve& c) {
  std::string out =
      is_time_axis(c) ? "t,numerical,analytical,error\n" : "x,numerical,analytical,error\n";
  for (std::size_t i = 0; i < c.x.size(); ++i)
    out += fmt::format("{},{},{},{}\n", c.x[i], c.numerical[i], c.analytical[i],
                       c.numerical[i] - c.analytical[i]);
  return out;
}

void write_verification_results(const std::filesystem::path& folder,
                                const std::vector<VerificationResult>& results) {
  std::error_code ec;
  std::filesystem::create_directories(folder, ec);
  if (ec) throw OutputError("cannot create " + folder.string() + ": " + ec.message());
  check_output_folder_writable(folder);

  std::string summary =
      "benchmark,source,quantity,unit,largest_error,tolerance,points,passed,seconds\n";
  HtmlReport page("aquiledger verification: numerical against analytical solutions");
  std::vector<std::vector<std::string>> rows;
  for (const VerificationResult& r : results) {
    summary += fmt::format("{},\"{}\",\"{}\",{},{},{},{},{},{:.3f}\n", r.name, r.source, r.quantity,
                           r.unit, r.largest_error, r.tolerance, r.points,
                           r.passed ? "true" : "false", r.seconds);
    rows.push_back({r.name, r.source, r.quantity, number(r.largest_error), number(r.tolerance),
                    r.unit, std::to_string(r.points), r.passed ? "pass" : "fail"});
  }
  page.add_paragraph(
      "Each benchmark builds its own model in memory (metres and days) and compares the "
      "simulated values with a closed-form solution from the literature. The error and the "
      "tolerance are those of the compared point where error / tolerance is largest.");
  page.add_table({"benchmark", "source", "quantity compared", "largest error", "tolerance", "unit",
                  "points", "result"},
                 rows, 7);
  for (const VerificationResult& r : results) {
    page.add_heading(r.title + " (" + r.source + ")");
    for (const VerificationCurve& c : r.curves) {
      write_file_atomically(folder / (c.name + ".csv"), verification_curve_csv(c));
      const bool log_x = is_time_axis(c) && c.x.size() > 20;
      std::vector<double> error(c.x.size());
      for (std::size_t i = 0; i < c.x.size(); ++i) error[i] = c.numerical[i] - c.analytical[i];
      page.add_chart(c.title + " (" + c.name + ".csv)",
                     line_chart_spec({{"analytical", c.x, c.analytical, SeriesStyle::line},
                                      {"aquiledger", c.x, c.numerical, SeriesStyle::points}},
                                     {c.x_label, log_x}, {c.y_label, false}, 620, 260));
      const std::size_t open = c.y_label.rfind('(');
      const std::string unit_open = open == std::string::npos ? "" : c.y_label.substr(open);
      page.add_chart(c.title + ": numerical minus analytical",
                     line_chart_spec({{"error", c.x, error, SeriesStyle::line}}, {c.x_label, log_x},
                                     {"error " + unit_open, false}, 620, 140));
    }
  }
  write_file_atomically(folder / "summary.csv", summary);
  page.write(folder / "verify.html");
}

}  // namespace aquiledger
