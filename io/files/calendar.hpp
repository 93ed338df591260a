#pragma once
// Calendar dates and times (ISO 8601) and the model's time units. A calendar time is held as
// seconds since 1970-01-01T00:00:00 on the proleptic Gregorian calendar, without time zones
// or leap seconds: the day arithmetic of C++20's <chrono> (sys_days, year_month_day).
#include <optional>
#include <string>
#include <string_view>

#include "solver/model.hpp"

namespace aquiledger {

/// A calendar time read from text that may carry a UTC offset.
struct ZonedCalendarTime {
  double seconds = 0.0;     ///< since 1970-01-01, converted to UTC when an offset was given
  bool has_offset = false;  ///< the text gave Z or +hh:mm / -hh:mm
};

/// Parses ISO 8601 "YYYY-MM-DD", optionally followed by "T" (or "t", or one space) and
/// "hh:mm", "hh:mm:ss" or "hh:mm:ss.fff", then optionally "Z" or an offset "+hh:mm" /
/// "-hh:mm" (years 1 to 9999). nullopt when the text is not such a date or the day or time
/// does not exist (2023-02-29, 2024-04-31, 25:00).
std::optional<ZonedCalendarTime> parse_zoned_calendar_time(std::string_view text);

/// As parse_zoned_calendar_time without a UTC offset (model times carry no zone): nullopt
/// for a text with one.
std::optional<double> parse_calendar_time(std::string_view text);

/// True when the text starts like a date ("1999-" ...): for messages and for telling a date
/// column from a time column.
bool looks_like_date(std::string_view text);

/// "YYYY-MM-DD", with "Thh:mm:ss" appended when the time is not midnight (seconds rounded to
/// the nearest whole second).
std::string format_calendar_time(double seconds);

/// Seconds in one of the model's time units: s, min, h, d, and yr the Julian year of
/// 365.25 days (the IAU's astronomical year; a calendar year has 365 or 366 days, so a model
/// in years with a start date maps times to dates to within a day). nullopt for another unit.
std::optional<double> seconds_per_time_unit(std::string_view unit);

/// The calendar time `months` whole months after `seconds`: the same day of the month and
/// time of day, or the month's last day when it has no such day (2021-01-31 + 1 month =
/// 2021-02-28).
double add_calendar_months(double seconds, int months);

/// Calendar time of model time 0 and the length of the model's time unit.
struct CalendarClock {
  double start = 0.0;  ///< seconds since 1970-01-01
  double seconds_per_unit = 86400.0;
  double model_time(double calendar_seconds) const {
    return (calendar_seconds - start) / seconds_per_unit;
  }
  double calendar_time(double model_time) const { return start + model_time * seconds_per_unit; }
  std::string date_of(double model_time) const {
    return format_calendar_time(calendar_time(model_time));
  }
};

/// The model's clock when it gives a start date (Model::start_date), else nullopt.
std::optional<CalendarClock> model_clock(const Model& model);

}  // namespace aquiledger
