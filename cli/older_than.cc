#include "cli/older_than.h"

#include <cstdint>

namespace chute {

namespace {

bool IsDigit(char c) { return c >= '0' && c <= '9'; }

// Reads n digits at s[*at], advancing *at.
bool Digits(std::string_view s, size_t* at, size_t n, int64_t* v) {
  if (*at + n > s.size()) return false;
  *v = 0;
  for (size_t i = 0; i < n; ++i) {
    char c = s[*at + i];
    if (!IsDigit(c)) return false;
    *v = *v * 10 + (c - '0');
  }
  *at += n;
  return true;
}

bool Expect(std::string_view s, size_t* at, char c) {
  if (*at >= s.size() || s[*at] != c) return false;
  ++*at;
  return true;
}

bool IsLeap(int64_t y) { return (y % 4 == 0 && y % 100 != 0) || y % 400 == 0; }

int64_t DaysInMonth(int64_t y, int64_t m) {
  static constexpr int64_t kDays[] = {31, 28, 31, 30, 31, 30,
                                      31, 31, 30, 31, 30, 31};
  return m == 2 && IsLeap(y) ? 29 : kDays[m - 1];
}

// Days from 1970-01-01 to y-m-d in the proleptic Gregorian calendar
// (H. Hinnant, "chrono-Compatible Low-Level Date Algorithms", 2013,
// days_from_civil; recalled from memory, checked by older_than_test.cc
// against dates counted with Python's datetime).
int64_t DaysFromCivil(int64_t y, int64_t m, int64_t d) {
  y -= m <= 2;
  const int64_t era = (y >= 0 ? y : y - 399) / 400;
  const int64_t yoe = y - era * 400;
  const int64_t doy = (153 * (m > 2 ? m - 3 : m + 9) + 2) / 5 + d - 1;
  const int64_t doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
  return era * 146097 + doe - 719468;
}

// Seconds since the epoch of an RFC 3339 date-time, or false.
bool ParseDateTime(std::string_view s, int64_t* seconds) {
  size_t at = 0;
  int64_t year, month, day, hour, minute, second;
  if (!Digits(s, &at, 4, &year) || !Expect(s, &at, '-') ||
      !Digits(s, &at, 2, &month) || !Expect(s, &at, '-') ||
      !Digits(s, &at, 2, &day)) {
    return false;
  }
  if (at >= s.size() || (s[at] != 'T' && s[at] != 't')) return false;
  ++at;
  if (!Digits(s, &at, 2, &hour) || !Expect(s, &at, ':') ||
      !Digits(s, &at, 2, &minute) || !Expect(s, &at, ':') ||
      !Digits(s, &at, 2, &second)) {
    return false;
  }
  bool fraction = false;
  if (at < s.size() && s[at] == '.') {
    ++at;
    size_t first = at;
    while (at < s.size() && IsDigit(s[at])) fraction |= s[at++] != '0';
    if (at == first) return false;
  }
  int64_t offset = 0;
  if (at < s.size() && (s[at] == 'Z' || s[at] == 'z')) {
    ++at;
  } else if (at < s.size() && (s[at] == '+' || s[at] == '-')) {
    const int64_t sign = s[at++] == '-' ? -1 : 1;
    int64_t oh, om;
    if (!Digits(s, &at, 2, &oh) || !Expect(s, &at, ':') ||
        !Digits(s, &at, 2, &om) || oh > 23 || om > 59) {
      return false;
    }
    offset = sign * (oh * 3600 + om * 60);
  } else {
    return false;
  }
  if (at != s.size()) return false;
  if (month < 1 || month > 12 || day < 1 || day > DaysInMonth(year, month) ||
      hour > 23 || minute > 59 || second > 60) {
    return false;
  }
  // Local time = UTC + offset (RFC 3339, section 4.2).
  *seconds = DaysFromCivil(year, month, day) * 86400 + hour * 3600 +
             minute * 60 + second - offset + (fraction ? 1 : 0);
  return true;
}

std::string FormatUtc(int64_t seconds) {
  std::time_t t = static_cast<std::time_t>(seconds);
  std::tm tm;
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

}  // namespace

bool ParseOlderThan(std::string_view arg, std::time_t now, std::string* cutoff,
                    std::string* why) {
  int64_t when = 0;
  size_t digits = 0;
  while (digits < arg.size() && IsDigit(arg[digits])) ++digits;
  if (digits > 0 && digits + 1 == arg.size() &&
      (arg.back() == 'd' || arg.back() == 'h' || arg.back() == 'm')) {
    if (digits > 12) {
      *why =
          "'" + std::string(arg) + "' is too long an age (at most 12 digits)";
      return false;
    }
    int64_t n = 0;
    size_t at = 0;
    Digits(arg, &at, digits, &n);
    const int64_t unit = arg.back() == 'd'   ? 86400
                         : arg.back() == 'h' ? 3600
                                             : 60;
    // n * unit fits: n < 10^12, unit <= 86400 < 10^5, product < 2^63.
    when = static_cast<int64_t>(now) - n * unit;
  } else if (!ParseDateTime(arg, &when)) {
    *why = "'" + std::string(arg) +
           "' is neither an age such as 400d, 12h or 30m nor an RFC 3339 time "
           "such "
           "as 2025-01-31T00:00:00Z";
    return false;
  } else if (when > static_cast<int64_t>(now)) {
    *why = std::string(arg) + " is in the future";
    return false;
  }
  *cutoff = FormatUtc(when < 0 ? 0 : when);
  return true;
}

}  // namespace chute
