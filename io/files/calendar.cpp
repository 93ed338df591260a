#include "io/files/calendar.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>

namespace aquiledger {

namespace {

constexpr double seconds_per_day = 86400.0;

/// Digits [at, at + n) of text as a number; nullopt when any is not a digit.
std::optional<int> digits(std::string_view text, std::size_t at, std::size_t n) {
  if (at + n > text.size()) return std::nullopt;
  int v = 0;
  for (std::size_t i = at; i < at + n; ++i) {
    if (text[i] < '0' || text[i] > '9') return std::nullopt;
    v = 10 * v + (text[i] - '0');
  }
  return v;
}

double day_start(std::chrono::year_month_day ymd) {
  const std::chrono::sys_days days{ymd};
  return static_cast<double>(days.time_since_epoch().count()) * seconds_per_day;
}

}  // namespace

std::optional<ZonedCalendarTime> parse_zoned_calendar_time(std::string_view text) {
  const auto b = text.find_first_not_of(" \t\r"), e = text.find_last_not_of(" \t\r");
  if (b == std::string_view::npos) return std::nullopt;
  text = text.substr(b, e - b + 1);
  const auto y = digits(text, 0, 4), m = digits(text, 5, 2), d = digits(text, 8, 2);
  if (!y || !m || !d || text[4] != '-' || text[7] != '-' || *y < 1) return std::nullopt;
  const std::chrono::year_month_day ymd{std::chrono::year{*y},
                                        std::chrono::month{static_cast<unsigned>(*m)},
                                        std::chrono::day{static_cast<unsigned>(*d)}};
  if (!ymd.ok()) return std::nullopt;
  ZonedCalendarTime out{day_start(ymd), false};
  if (text.size() == 10) return out;
  if (text[10] != 'T' && text[10] != 't' && text[10] != ' ') return std::nullopt;
  const auto hh = digits(text, 11, 2), mm = digits(text, 14, 2);
  if (!hh || !mm || text[13] != ':' || *hh > 23 || *mm > 59) return std::nullopt;
  out.seconds += 3600.0 * *hh + 60.0 * *mm;
  std::size_t at = 16;
  if (at < text.size() && text[at] == ':') {
    const auto ss = digits(text, at + 1, 2);
    if (!ss || *ss > 59) return std::nullopt;
    out.seconds += *ss;
    at += 3;
    if (at < text.size() && text[at] == '.') {
      ++at;
      if (at >= text.size() || text[at] < '0' || text[at] > '9') return std::nullopt;
      for (double scale = 0.1; at < text.size() && text[at] >= '0' && text[at] <= '9';
           ++at, scale /= 10.0)
        out.seconds += (text[at] - '0') * scale;
    }
  }
  if (at == text.size()) return out;
  if ((text[at] == 'Z' || text[at] == 'z') && at + 1 == text.size()) {
    out.has_offset = true;
    return out;
  }
  if ((text[at] == '+' || text[at] == '-') && at + 6 == text.size() && text[at + 3] == ':') {
    const auto oh = digits(text, at + 1, 2), om = digits(text, at + 4, 2);
    if (!oh || !om || *oh > 23 || *om > 59) return std::nullopt;
    out.seconds -= (3600.0 * *oh + 60.0 * *om) * (text[at] == '+' ? 1.0 : -1.0);
    out.has_offset = true;
    return out;
  }
  return std::nullopt;
}

std::optional<double> parse_calendar_time(std::string_view text) {
  const auto t = parse_zoned_calendar_time(text);
  if (!t || t->has_offset) return std::nullopt;
  return t->seconds;
}

bool looks_like_date(std::string_view text) {
  const auto b = text.find_first_not_of(" \t\r");
  if (b == std::string_view::npos) return false;
  text = text.substr(b);
  return digits(text, 0, 4) && text.size() > 4 && text[4] == '-';
}

std::string format_calendar_time(double seconds) {
  const double whole = std::round(seconds);
  const auto days = static_cast<long long>(std::floor(whole / seconds_per_day));
  const auto rest = static_cast<long long>(whole - static_cast<double>(days) * seconds_per_day);
  const std::chrono::year_month_day ymd{std::chrono::sys_days{std::chrono::days{days}}};
  char text[32];
  std::snprintf(text, sizeof text, "%04d-%02u-%02u", static_cast<int>(ymd.year()),
                static_cast<unsigned>(ymd.month()), static_cast<unsigned>(ymd.day()));
  std::string out = text;
  if (rest != 0) {
    std::snprintf(text, sizeof text, "T%02lld:%02lld:%02lld", rest / 3600, rest / 60 % 60,
                  rest % 60);
    out += text;
  }
  return out;
}

std::optional<double> seconds_per_time_unit(std::string_view unit) {
  if (unit == "s") return 1.0;
  if (unit == "min") return 60.0;
  if (unit == "h") return 3600.0;
  if (unit == "d") return seconds_per_day;
  if (unit == "yr") return 365.25 * seconds_per_day;
  return std::nullopt;
}

double add_calendar_months(double seconds, int months) {
  const auto days = static_cast<long long>(std::floor(seconds / seconds_per_day));
  const double time_of_day = seconds - static_cast<double>(days) * seconds_per_day;
  const std::chrono::year_month_day ymd{std::chrono::sys_days{std::chrono::days{days}}};
  const std::chrono::year_month shifted =
      std::chrono::year_month{ymd.year(), ymd.month()} + std::chrono::months{months};
  const std::chrono::year_month_day_last last{shifted.year(),
                                              std::chrono::month_day_last{shifted.month()}};
  const std::chrono::day day = std::min(ymd.day(), last.day());
  return day_start({shifted.year(), shifted.month(), day}) + time_of_day;
}

std::optional<CalendarClock> model_clock(const Model& model) {
  if (!model.start_date) return std::nullopt;
  return CalendarClock{*model.start_date, seconds_per_time_unit(model.time_unit).value_or(86400.0)};
}

}  // namespace aquiledger
