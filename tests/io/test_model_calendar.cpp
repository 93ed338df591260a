// Inputs at a basin's scale (docs/model-format.md, "Calendar time", "Time series from CSV
// files", "Feature tables"): the calendar arithmetic against facts of the Gregorian calendar
// and Python's datetime, periods by dates, per-period values from CSV series, feature tables,
// and every misuse refused with the file, line and key.
#include <cmath>
#include <filesystem>
#include <fstream>

#include "io/files/calendar.hpp"
#include "io/model_file/time_series.hpp"
#include "io/results/result_tables.hpp"
#include "solver/simulation.hpp"
#include "tests/io/reader_test_support.hpp"
#include "tests/io/small_model.hpp"
#include "tests/support/budget_observer.hpp"

using namespace reader_test;
using namespace aquiledger;

namespace {

/// A scratch folder for one test's CSV files, removed when the test program exits (one per
/// process: two tests of one name may run at once); the model is read as if it were model.toml
/// here.
std::filesystem::path scratch(const std::string& name) {
  return aquiledger::testing::scratch_folder("calendar-" + name);
}

void write(const std::filesystem::path& file, const std::string& text) {
  std::ofstream(file) << text;
}

ReadResult read_in(const std::filesystem::path& dir, const std::string& text) {
  return read_model_text(text, dir / "model.toml");
}

/// An error naming `key` in `file` at `line` whose message holds every fragment.
bool error_at(const ReadResult& r, const std::filesystem::path& file, int line,
              const std::string& key, std::initializer_list<std::string> fragments) {
  for (const auto& d : r.diagnostics) {
    if (d.severity != Severity::error || d.key != key || d.line != line) continue;
    if (std::filesystem::path(d.file).filename() != file.filename()) continue;
    bool all = true;
    for (const auto& f : fragments) all = all && d.message.find(f) != std::string::npos;
    if (all) return true;
  }
  return false;
}

/// The base model with a start date (a function: edit() checks with Catch2, which is not
/// running while statics are made).
std::string dated_model() {
  return edit(base_model(), "time_unit = \"d\"", "time_unit = \"d\"\nstart_date = 2021-01-01");
}

/// The base model with a start date and its two periods replaced by `periods`.
std::string with_periods(const std::string& periods) {
  const std::string dated = dated_model();
  const auto at = dated.find("[[period]]");
  return dated.substr(0, at) + periods;
}

const std::string monthly_2021 =
    "[[period]]\nname = \"m\"\nevery = \"month\"\nuntil = 2022-01-01\nsteps = 2\n";

void expect_refused(const ReadResult& r, const std::filesystem::path& file, int line,
                    const std::string& key, std::initializer_list<std::string> fragments) {
  INFO(all_messages(r));
  CHECK_FALSE(r.ok());
  CHECK(error_at(r, file, line, key, fragments));
}

}  // namespace

// --- the calendar ---------------------------------------------------------------------------

TEST_CASE("calendar: days since 1970 as Python's datetime counts them", "[calendar]") {
  // (date(2000, 3, 1) - date(1970, 1, 1)).days == 11017 and (date(1999, 12, 31) - ...) ==
  // 10956, computed with Python 3.11's datetime module (proleptic Gregorian).
  CHECK(parse_calendar_time("1970-01-01") == 0.0);
  CHECK(parse_calendar_time("2000-03-01") == 11017.0 * 86400.0);
  CHECK(parse_calendar_time("1999-12-31") == 10956.0 * 86400.0);
  CHECK(parse_calendar_time("2000-03-01T06:30") == 11017.0 * 86400.0 + 6.5 * 3600.0);
  CHECK(parse_calendar_time("2000-03-01 06:30:15") == 11017.0 * 86400.0 + 6.5 * 3600.0 + 15.0);
  CHECK(format_calendar_time(11017.0 * 86400.0) == "2000-03-01");
  CHECK(format_calendar_time(11017.0 * 86400.0 + 6.5 * 3600.0) == "2000-03-01T06:30:00");
  CHECK(format_calendar_time(-86400.0) == "1969-12-31");
}

TEST_CASE("calendar: the Gregorian leap-year rule and days that do not exist", "[calendar]") {
  // Every fourth year is a leap year, except centuries not divisible by 400 (Gregorian
  // calendar, 1582; a fact of the calendar).
  CHECK(parse_calendar_time("2024-02-29"));
  CHECK(parse_calendar_time("2000-02-29"));
  CHECK_FALSE(parse_calendar_time("1900-02-29"));
  CHECK_FALSE(parse_calendar_time("2023-02-29"));
  CHECK_FALSE(parse_calendar_time("2021-04-31"));
  CHECK_FALSE(parse_calendar_time("2021-13-01"));
  CHECK_FALSE(parse_calendar_time("2021-01-01T24:00"));
  CHECK_FALSE(parse_calendar_time("21-01-01"));
  CHECK_FALSE(parse_calendar_time("2021/01/01"));
  CHECK(looks_like_date("2021-01-01"));
  CHECK_FALSE(looks_like_date("12.5"));
}

TEST_CASE("calendar: months added keep the day or take the month's last", "[calendar]") {
  const double jan31 = *parse_calendar_time("2021-01-31");
  CHECK(format_calendar_time(add_calendar_months(jan31, 1)) == "2021-02-28");
  CHECK(format_calendar_time(add_calendar_months(*parse_calendar_time("2024-01-31"), 1)) ==
        "2024-02-29");
  CHECK(format_calendar_time(add_calendar_months(jan31, 3)) == "2021-04-30");
  CHECK(format_calendar_time(add_calendar_months(jan31, 12)) == "2022-01-31");
  CHECK(format_calendar_time(add_calendar_months(jan31, -2)) == "2020-11-30");
  CHECK(seconds_per_time_unit("yr") == 365.25 * 86400.0);
  CHECK_FALSE(seconds_per_time_unit("week"));
}

TEST_CASE("held values: the period mean and the start value of a step series", "[calendar]") {
  // A value holds from its time to the next: 500 on [0, 10), 800 on [10, 20), 0 after.
  const std::vector<double> t = {0.0, 10.0, 20.0}, v = {500.0, 800.0, 0.0};
  CHECK(held_mean(t, v, 0.0, 10.0) == 500.0);
  CHECK(held_mean(t, v, 5.0, 15.0) == Approx(650.0).epsilon(1e-15));
  CHECK(held_mean(t, v, 5.0, 40.0) == Approx((2500.0 + 8000.0) / 35.0).epsilon(1e-15));
  CHECK(held_value(t, v, 9.999) == 500.0);
  CHECK(held_value(t, v, 10.0) == 800.0);
  CHECK(held_value(t, v, 99.0) == 0.0);
}

// --- periods by dates -----------------------------------------------------------------------

TEST_CASE("periods: monthly runs follow the calendar's month lengths", "[calendar][reader]") {
  const auto r = read(with_periods(monthly_2021));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& p = r.model->periods;
  REQUIRE(p.size() == 12);
  // 2021 is not a leap year: 31 28 31 30 31 30 31 31 30 31 30 31 days (365).
  const double days[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  for (std::size_t i = 0; i < 12; ++i) CHECK(p[i].length == days[i]);
  CHECK(p[0].name == "m 2021-01");
  CHECK(p[11].name == "m 2021-12");
  CHECK(p[5].steps == 2);
  REQUIRE(r.model->start_date);
  CHECK(*r.model->start_date == 18628.0 * 86400.0);  // Python: (date(2021,1,1)-date(1970,1,1)).days
}

TEST_CASE("periods: end dates, counted runs and a run cut at its until date",
          "[calendar][reader]") {
  const auto r = read(
      with_periods("[[period]]\nname = \"spin-up\"\nend = 2021-03-01\nsteps = 3\n"
                   "[[period]]\nname = \"season\"\nlength = 10.0\ncount = 3\nsteps = 2\n"
                   "[[period]]\nname = \"y\"\nevery = \"year\"\nuntil = 2023-07-01\nsteps = 2\n"
                   "[[period]]\nname = \"w\"\nevery = \"week\"\ncount = 2\nsteps = 2\n"));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& p = r.model->periods;
  REQUIRE(p.size() == 1 + 3 + 3 + 2);
  CHECK(p[0].length == 59.0);  // January 31 + February 28
  CHECK(p[1].name == "season 1");
  CHECK(p[3].name == "season 3");
  CHECK(p[3].length == 10.0);
  // From 2021-03-31 (day 89): years to 2022-03-31, 2023-03-31, then cut at 2023-07-01.
  CHECK(p[4].name == "y 2021");
  CHECK(p[4].length == 365.0);
  CHECK(p[5].length == 365.0);
  CHECK(p[6].length == 92.0);  // 2023-03-31 to 2023-07-01: 1 + 30 + 31 + 30 days
  CHECK(p[7].length == 7.0);
  CHECK(p[8].name == "w 2023-07-08");
}

TEST_CASE("periods in years: a Julian year per model year", "[calendar][reader]") {
  const auto r = read(edit(with_periods(monthly_2021), "time_unit = \"d\"", "time_unit = \"yr\""));
  INFO(all_messages(r));
  REQUIRE(r.ok());
  CHECK(r.model->periods[0].length == Approx(31.0 / 365.25).epsilon(1e-15));
}

// --- series ---------------------------------------------------------------------------------

TEST_CASE("series: a well's rate is the mean of its log over each period", "[calendar][reader]") {
  const auto dir = scratch("mean");
  write(dir / "pumping.csv",
        "date,north,stage\n2020-12-01,500,5.0\n2021-03-15,800,6.0\n2021-09-01,0,7.0\n");
  const std::string text =
      with_periods(monthly_2021) +
      "[[well]]\nname = \"north\"\nx = 15.0\ny = 15.0\n"
      "pumping_rate = { series = \"pumping.csv\", column = \"north\" }\n"
      "[[fixed_head]]\nname = \"edge\"\ncells = [[1, 1]]\n"
      "head = { series = \"pumping.csv\", column = \"stage\", rule = \"start\" }\n";
  const auto r = read_in(dir, text);
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const Well& w = r.model->wells.at(0);
  CHECK(w.rate.at(0, 0) == 500.0);
  // March: 14 days at 500 and 17 at 800 over 31 days.
  CHECK(w.rate.at(2, 0) == Approx((14.0 * 500.0 + 17.0 * 800.0) / 31.0).epsilon(1e-14));
  CHECK(w.rate.at(7, 0) == 800.0);
  CHECK(w.rate.at(8, 0) == 0.0);
  const FixedHead& f = r.model->fixed_heads.at(0);
  CHECK(f.head.at(2, 0) == 5.0);  // in force on 2021-03-01
  CHECK(f.head.at(3, 0) == 6.0);
  CHECK(f.head.at(8, 0) == 7.0);
  // The file is an input of the model (checkpoints fingerprint it).
  CHECK(std::find(r.model->input_files.begin(), r.model->input_files.end(), dir / "pumping.csv") !=
        r.model->input_files.end());
}

TEST_CASE("series: a time column in model units and measured heads by date", "[calendar][reader]") {
  const auto dir = scratch("time");
  write(dir / "q.csv", "time,q\n0,100\n15,300\n");
  write(dir / "bore.csv", "date,head\n2021-01-11,8.5\n2021-02-01T12:00,8.25\n");
  const std::string text =
      with_periods(monthly_2021) +
      "[[well]]\nname = \"w\"\nx = 15.0\ny = 15.0\npumping_rate = { series = \"q.csv\", column "
      "= \"q\" }\n[[observation]]\nname = \"bore\"\nx = 25.0\ny = 15.0\nmeasured = "
      "\"bore.csv\"\n";
  const auto r = read_in(dir, text);
  INFO(all_messages(r));
  REQUIRE(r.ok());
  CHECK(r.model->wells[0].rate.at(0, 0) == Approx((15.0 * 100.0 + 16.0 * 300.0) / 31.0));
  const auto& m = r.model->observations[0].measured;
  REQUIRE(m.size() == 2);
  CHECK(m[0].time == 10.0);
  CHECK(m[1].time == 31.5);
  CHECK(m[1].head == 8.25);
}

TEST_CASE("series: a 30-year monthly model from CSV series runs and its budget closes",
          "[calendar][reader]") {
  // 360 calendar months (1995-2024, 10958 days: 22 common years of 365 days and 8 leap years
  // of 366), a pumping log with a value per month and a recharge series per season.
  const auto dir = scratch("thirty");
  std::string pumping = "date,supply\n", recharge = "date,rain\n";
  for (int year = 1995; year < 2025; ++year)
    for (int month = 1; month <= 12; ++month) {
      const std::string date =
          std::to_string(year) + "-" + (month < 10 ? "0" : "") + std::to_string(month) + "-01";
      pumping += date + "," + std::to_string(20 + (year * 7 + month * 3) % 11) + "\n";
      if (month % 3 == 1) recharge += date + "," + (month < 6 ? "0.002" : "0.0") + "\n";
    }
  write(dir / "pumping.csv", pumping);
  write(dir / "recharge.csv", recharge);
  std::string text =
      edit(base_model(), "time_unit = \"d\"", "time_unit = \"d\"\nstart_date = 1995-01-01");
  text = text.substr(0, text.find("[[period]]")) +
         "[[period]]\nname = \"month\"\nevery = \"month\"\nuntil = 2025-01-01\nsteps = 2\n"
         "[[well]]\nname = \"supply\"\nx = 15.0\ny = 15.0\n"
         "pumping_rate = { series = \"pumping.csv\", column = \"supply\" }\n"
         "[[recharge]]\nname = \"rain\"\nrate = { series = \"recharge.csv\", column = \"rain\" }\n"
         "[[fixed_head]]\nname = \"edge\"\ncells = [[1, 1], [2, 1], [3, 1]]\nhead = 9.0\n";
  const auto r = read_in(dir, text);
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const Model& model = *r.model;
  REQUIRE(model.periods.size() == 360);
  double days = 0.0;
  for (const Period& p : model.periods) days += p.length;
  CHECK(days == 10958.0);
  test::BudgetObserver observer(model, false);
  const RunResult run = run_simulation(model, observer);
  REQUIRE(run.converged);
  CHECK(observer.steps.size() == 720);
  // Every step's budget closes below 1e-6 percent (the observer checks each step; model
  // format contract); the pumped volume is the log's, month by month.
  CHECK(observer.max_imbalance < 1e-6);
  double logged = 0.0;
  for (std::size_t p = 0; p < 360; ++p)
    logged += model.wells[0].rate.at(p, 0) * model.periods[p].length;
  CHECK(observer.cumulative[BudgetComponent::well].out == Approx(logged).epsilon(1e-12));
}

TEST_CASE("outputs: dates beside times with a start date, none without", "[calendar]") {
  const auto r = read(with_periods(monthly_2021));
  REQUIRE(r.ok());
  const BudgetTableLayout layout = budget_table_layout(*r.model);
  REQUIRE(layout.clock);
  BudgetPeriodRow row;
  row.period = 2;
  row.name = "m 2021-02";
  row.start = 31.0;
  row.end = 59.0;
  const std::string text = balance_periods_csv({row}, layout.clock);
  CHECK(text.rfind("period,period_name,start,end,into_aquifer,out_of_aquifer,imbalance_percent,"
                   "start_date,end_date\n",
                   0) == 0);
  CHECK(text.find(",2021-02-01,2021-03-01\n") != std::string::npos);
  const auto plain = read(base_model());
  REQUIRE(plain.ok());
  CHECK_FALSE(budget_table_layout(*plain.model).clock);
  CHECK(balance_periods_csv({row}).find("date") == std::string::npos);
}

// --- feature tables -------------------------------------------------------------------------

TEST_CASE("feature tables: wells and bores from CSV files", "[calendar][reader]") {
  const auto dir = scratch("tables");
  write(dir / "wells.csv", "name,x,y,pumping_rate\nnorth,15,15,\n\"east, new\",35,5,120\n");
  write(dir / "pumping.csv", "date,north\n2020-01-01,400\n");
  write(dir / "bores.csv", "x,y,name\n5,25,b1\n25,25,b2\n");
  write(dir / "levels.csv", "date,b1,b2\n2021-01-11,8.9,\n2021-01-21,8.8,8.7\n");
  const std::string text = with_periods(monthly_2021) +
                           "[[well]]\ntable = \"wells.csv\"\npumping_rate = { series = "
                           "\"pumping.csv\" }\n[[well]]\nname = \"single\"\nx = 5.0\ny = 5.0\n"
                           "pumping_rate = 1.0\n[[observation]]\ntable = \"bores.csv\"\n"
                           "measured_series = \"levels.csv\"\n";
  const auto r = read_in(dir, text);
  INFO(all_messages(r));
  REQUIRE(r.ok());
  const auto& w = r.model->wells;
  REQUIRE(w.size() == 3);
  CHECK(w[0].name == "north");
  CHECK(w[0].rate.at(4, 0) == 400.0);
  CHECK(w[1].name == "east, new");
  CHECK(w[1].cell.value == 2 * 4 + 3);  // (35, 5): south row, east column
  CHECK(w[1].rate.at(0, 0) == 120.0);
  CHECK(w[2].name == "single");
  const auto& o = r.model->observations;
  REQUIRE(o.size() == 2);
  CHECK(o[0].measured.size() == 2);
  CHECK(o[1].measured.size() == 1);
  CHECK(o[1].measured[0].time == 20.0);
}

// --- misuse: each refused with the file, the line and the key -------------------------------

TEST_CASE("bad calendar 01: start_date not a day that exists", "[calendar][errors]") {
  const std::string text =
      edit(dated_model(), "start_date = 2021-01-01", "start_date = \"2021-02-30\"");
  expect_refused(read(text), "inline.toml", line_of(text, "start_date"), "[model].start_date",
                 {"not a calendar date", "2021-02-30"});
}
TEST_CASE("bad calendar 02: start_date with a time-zone offset", "[calendar][errors]") {
  const std::string text =
      edit(dated_model(), "start_date = 2021-01-01", "start_date = 2021-01-01T00:00:00+02:00");
  expect_refused(read(text), "inline.toml", line_of(text, "start_date"), "[model].start_date",
                 {"time-zone offset"});
}
TEST_CASE("bad calendar 03: start_date a number", "[calendar][errors]") {
  const std::string text = edit(dated_model(), "start_date = 2021-01-01", "start_date = 2021");
  expect_refused(read(text), "inline.toml", line_of(text, "start_date"), "[model].start_date",
                 {"a date such as"});
}
TEST_CASE("bad calendar 04: a period end without a start date", "[calendar][errors]") {
  const std::string text = edit(base_model(), "length = 10.0", "end = 2021-03-01");
  expect_refused(read(text), "inline.toml", line_of(text, "end = "), "[[period]] \"first\".end",
                 {"give [model].start_date"});
}
TEST_CASE("bad calendar 05: a period end before its start", "[calendar][errors]") {
  const std::string text = with_periods(
      "[[period]]\nname = \"a\"\nend = 2021-03-01\n[[period]]\nname = \"b\"\nend = 2021-02-01\n");
  expect_refused(read(text), "inline.toml", line_of(text, "end = 2021-02-01"),
                 "[[period]] \"b\".end", {"not after the period's start 2021-03-01"});
}
TEST_CASE("bad calendar 06: length and end together", "[calendar][errors]") {
  const std::string text = with_periods("[[period]]\nlength = 5.0\nend = 2021-02-01\n");
  expect_refused(read(text), "inline.toml", line_of(text, "end = "), "[[period]] #1.end",
                 {"either length or end"});
}
TEST_CASE("bad calendar 07: every without until or count", "[calendar][errors]") {
  const std::string text = with_periods("[[period]]\nevery = \"month\"\n");
  expect_refused(read(text), "inline.toml", line_of(text, "every"), "[[period]] #1.every",
                 {"until", "count"});
}
TEST_CASE("bad calendar 08: every a step the calendar does not know", "[calendar][errors]") {
  const std::string text = with_periods("[[period]]\nevery = \"fortnight\"\ncount = 2\n");
  expect_refused(read(text), "inline.toml", line_of(text, "every"), "[[period]] #1.every",
                 {"fortnight", "month"});
}
TEST_CASE("bad calendar 09: every with both until and count", "[calendar][errors]") {
  const std::string text =
      with_periods("[[period]]\nevery = \"month\"\nuntil = 2022-01-01\ncount = 3\n");
  expect_refused(read(text), "inline.toml", line_of(text, "every"), "[[period]] #1.every",
                 {"not both"});
}
TEST_CASE("bad calendar 10: until before the run starts", "[calendar][errors]") {
  const std::string text = with_periods("[[period]]\nevery = \"month\"\nuntil = 2020-06-01\n");
  expect_refused(read(text), "inline.toml", line_of(text, "until"), "[[period]] #1.until",
                 {"not after the run's start 2021-01-01"});
}
TEST_CASE("bad calendar 11: count of no periods", "[calendar][errors]") {
  const std::string text = with_periods("[[period]]\nlength = 5.0\ncount = 0\n");
  expect_refused(read(text), "inline.toml", line_of(text, "count"), "[[period]] #1.count",
                 {"from 1 to"});
}
TEST_CASE("bad calendar 12: until without every", "[calendar][errors]") {
  const std::string text = with_periods("[[period]]\nlength = 5.0\nuntil = 2022-01-01\n");
  expect_refused(read(text), "inline.toml", line_of(text, "until"), "[[period]] #1.until",
                 {"goes with every"});
}

namespace {
/// The dated base model with one well whose rate is `rate`, read in `dir`.
ReadResult well_with(const std::filesystem::path& dir, const std::string& rate) {
  return read_in(dir, with_periods(monthly_2021) +
                          "[[well]]\nname = \"w\"\nx = 15.0\ny = 15.0\npumping_rate = " + rate +
                          "\n");
}
const std::string series_key = "[[well]] \"w\".pumping_rate";
int rate_line() {
  return line_of(
      with_periods(monthly_2021) + "[[well]]\nname = \"w\"\nx = 15.0\ny = 15.0\npumping_rate",
      "pumping_rate");
}
}  // namespace

TEST_CASE("bad series 01: a missing file", "[calendar][errors]") {
  const auto dir = scratch("bad01");
  expect_refused(well_with(dir, "{ series = \"none.csv\", column = \"q\" }"), "model.toml",
                 rate_line(), series_key + ".series", {"cannot open time-series file"});
}
TEST_CASE("bad series 02: a first column that is neither time nor date", "[calendar][errors]") {
  const auto dir = scratch("bad02");
  write(dir / "q.csv", "day,q\n0,1\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", column = \"q\" }"), "q.csv", 1,
                 series_key + ".series", {"first column is 'day'"});
}
TEST_CASE("bad series 03: dates without a start date", "[calendar][errors]") {
  const auto dir = scratch("bad03");
  write(dir / "q.csv", "date,q\n2021-01-01,1\n");
  const std::string text = base_model() +
                           "[[well]]\nname = \"w\"\nx = 15.0\ny = 15.0\npumping_rate = { series "
                           "= \"q.csv\", column = \"q\" }\n";
  expect_refused(read_in(dir, text), "q.csv", 1, series_key + ".series",
                 {"needs a calendar", "start_date"});
}
TEST_CASE("bad series 04: a date that does not exist, on its line", "[calendar][errors]") {
  const auto dir = scratch("bad04");
  write(dir / "q.csv", "date,q\n2021-01-01,1\n\n2021-02-29,2\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", column = \"q\" }"), "q.csv", 4,
                 series_key + ".series", {"'2021-02-29' is not a date"});
}
TEST_CASE("bad series 05: times that do not increase", "[calendar][errors]") {
  const auto dir = scratch("bad05");
  write(dir / "q.csv", "date,q\n2021-01-01,1\n2021-03-01,2\n2021-02-01,3\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", column = \"q\" }"), "q.csv", 4,
                 series_key + ".series", {"not after the row before"});
}
TEST_CASE("bad series 06: a value that is not a number", "[calendar][errors]") {
  const auto dir = scratch("bad06");
  write(dir / "q.csv", "date,q\n2021-01-01,1\n2021-02-01,lots\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", column = \"q\" }"), "q.csv", 3,
                 series_key + ".series", {"column 'q'", "'lots' is not a number"});
}
TEST_CASE("bad series 07: a column the file does not have", "[calendar][errors]") {
  const auto dir = scratch("bad07");
  write(dir / "q.csv", "date,q,r\n2021-01-01,1,2\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", column = \"s\" }"), "model.toml",
                 rate_line(), series_key + ".column", {"no column 's'", "columns: q, r"});
}
TEST_CASE("bad series 08: a series that starts after the first period", "[calendar][errors]") {
  const auto dir = scratch("bad08");
  write(dir / "q.csv", "date,q\n2021-02-01,1\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", column = \"q\" }"), "model.toml",
                 rate_line(), series_key + ".column", {"starts at 2021-02-01", "2021-01-01"});
}
TEST_CASE("bad series 09: a value the key's rule refuses", "[calendar][errors]") {
  const auto dir = scratch("bad09");
  write(dir / "c.csv", "date,c\n2021-01-01,5\n2021-06-01,-1\n");
  const std::string text = with_periods(monthly_2021) +
                           "[[drain]]\nname = \"d\"\ncells = [[1, 2]]\nelevation = 1.0\n"
                           "conductance = { series = \"c.csv\", column = \"c\" }\n";
  expect_refused(read_in(dir, text), "model.toml", line_of(text, "conductance"),
                 "[[drain]] \"d\".conductance", {"period 6 takes -1", "expected >= 0"});
}
TEST_CASE("bad series 10: a row with too few cells", "[calendar][errors]") {
  const auto dir = scratch("bad10");
  write(dir / "q.csv", "date,q,r\n2021-01-01,1,2\n2021-02-01,1\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", column = \"q\" }"), "q.csv", 3,
                 series_key + ".series", {"2 cells; the header has 3"});
}
TEST_CASE("bad series 11: an aggregation rule that does not exist", "[calendar][errors]") {
  const auto dir = scratch("bad11");
  write(dir / "q.csv", "date,q\n2021-01-01,1\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", column = \"q\", rule = \"median\" }"),
                 "model.toml", rate_line(), series_key + ".rule", {"median", "mean"});
}
TEST_CASE("bad series 12: a misspelt key of a series", "[calendar][errors]") {
  const auto dir = scratch("bad12");
  write(dir / "q.csv", "date,q\n2021-01-01,1\n");
  expect_refused(well_with(dir, "{ series = \"q.csv\", colum = \"q\" }"), "model.toml", rate_line(),
                 series_key + ".colum", {"did you mean 'column'"});
}
TEST_CASE("bad series 13: measured heads by date without a start date", "[calendar][errors]") {
  const auto dir = scratch("bad13");
  write(dir / "bore.csv", "time,head\n1.0,8.0\n2021-01-11,8.5\n");
  const std::string text = base_model() +
                           "[[observation]]\nname = \"b\"\nx = 15.0\ny = 15.0\nmeasured = "
                           "\"bore.csv\"\n";
  expect_refused(read_in(dir, text), "bore.csv", 3, "[[observation]] \"b\".measured",
                 {"is a date", "start_date"});
}

namespace {
ReadResult wells_from(const std::filesystem::path& dir, const std::string& csv,
                      const std::string& extra = "") {
  write(dir / "wells.csv", csv);
  return read_in(dir, with_periods(monthly_2021) + "[[well]]\ntable = \"wells.csv\"\n" + extra);
}
const std::string table_key = "[[well]] #1.table";
}  // namespace

TEST_CASE("bad table 01: a feature table without an x column", "[calendar][errors]") {
  const auto dir = scratch("tab01");
  expect_refused(wells_from(dir, "name,east,y,pumping_rate\nw,15,15,1\n"), "wells.csv", 1,
                 table_key, {"no column 'x'"});
}
TEST_CASE("bad table 02: a column the section does not know", "[calendar][errors]") {
  const auto dir = scratch("tab02");
  expect_refused(wells_from(dir, "name,x,y,rate\nw,15,15,1\n"), "wells.csv", 1, table_key,
                 {"column 'rate' is not one of name, x, y, pumping_rate"});
}
TEST_CASE("bad table 03: a name used by a well of the model file", "[calendar][errors]") {
  const auto dir = scratch("tab03");
  expect_refused(wells_from(dir, "name,x,y,pumping_rate\na,5,5,1\nsingle,15,15,1\n",
                            "[[well]]\nname = \"single\"\nx = 5.0\ny = 5.0\npumping_rate = 1.0\n"),
                 "wells.csv", 3, table_key, {"'single' is already used"});
}
TEST_CASE("bad table 04: a point outside the grid, on its line", "[calendar][errors]") {
  const auto dir = scratch("tab04");
  expect_refused(wells_from(dir, "name,x,y,pumping_rate\na,5,5,1\nb,55,5,1\n"), "wells.csv", 3,
                 table_key, {"column 'x'", "(55, 5) of 'b' lies outside the grid"});
}
TEST_CASE("bad table 05: a coordinate that is not a number", "[calendar][errors]") {
  const auto dir = scratch("tab05");
  expect_refused(wells_from(dir, "name,x,y,pumping_rate\na,5,five,1\n"), "wells.csv", 2, table_key,
                 {"column 'y'", "'five' is not a number"});
}
TEST_CASE("bad table 06: a rate that is not a number", "[calendar][errors]") {
  const auto dir = scratch("tab06");
  expect_refused(wells_from(dir, "name,x,y,pumping_rate\na,5,5,high\n"), "wells.csv", 2, table_key,
                 {"column 'pumping_rate'", "'high' is not a number"});
}
TEST_CASE("bad table 07: a well without any rate", "[calendar][errors]") {
  const auto dir = scratch("tab07");
  expect_refused(wells_from(dir, "name,x,y,pumping_rate\na,5,5,\n"), "wells.csv", 2, table_key,
                 {"well 'a' has no rate"});
}
TEST_CASE("bad table 08: an empty name", "[calendar][errors]") {
  const auto dir = scratch("tab08");
  expect_refused(wells_from(dir, "name,x,y,pumping_rate\n,5,5,1\n"), "wells.csv", 2, table_key,
                 {"column 'name'", "empty"});
}
TEST_CASE("bad table 09: a table entry that also gives a point", "[calendar][errors]") {
  const auto dir = scratch("tab09");
  write(dir / "wells.csv", "name,x,y,pumping_rate\na,5,5,1\n");
  const std::string text =
      with_periods(monthly_2021) + "[[well]]\ntable = \"wells.csv\"\nx = 5.0\n";
  expect_refused(read_in(dir, text), "model.toml", line_of(text, "x = 5.0"), "[[well]] #1.x",
                 {"takes names and points from its file"});
}
TEST_CASE("bad table 10: a missing feature table", "[calendar][errors]") {
  const auto dir = scratch("tab10");
  const std::string text = with_periods(monthly_2021) + "[[well]]\ntable = \"none.csv\"\n";
  expect_refused(read_in(dir, text), "model.toml", line_of(text, "table"), table_key,
                 {"cannot open feature table"});
}
TEST_CASE("bad table 11: a bore with readings in two places", "[calendar][errors]") {
  const auto dir = scratch("tab11");
  write(dir / "bores.csv", "name,x,y,measured\nb1,5,25,b1.csv\n");
  write(dir / "b1.csv", "time,head\n1,8\n");
  write(dir / "levels.csv", "time,b1\n1,8\n");
  const std::string text = with_periods(monthly_2021) +
                           "[[observation]]\ntable = \"bores.csv\"\nmeasured_series = "
                           "\"levels.csv\"\n";
  expect_refused(read_in(dir, text), "bores.csv", 2, "[[observation]] #1.table",
                 {"bore 'b1' has measured heads in its own file and in column 'b1'"});
}
TEST_CASE("bad table 12: measured_series for a single bore", "[calendar][errors]") {
  const auto dir = scratch("tab12");
  const std::string text = with_periods(monthly_2021) +
                           "[[observation]]\nname = \"b\"\nx = 5.0\ny = 5.0\nmeasured_series = "
                           "\"levels.csv\"\n";
  expect_refused(read_in(dir, text), "model.toml", line_of(text, "measured_series"),
                 "[[observation]] \"b\".measured_series", {"goes with a table of bores"});
}
TEST_CASE("bad table 13: a table with a header only", "[calendar][errors]") {
  const auto dir = scratch("tab13");
  expect_refused(wells_from(dir, "name,x,y\n"), "wells.csv", 1, table_key, {"no rows"});
}
