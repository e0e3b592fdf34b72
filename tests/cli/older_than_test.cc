// Tests of purge's cutoff (cli/older_than.h): ages and RFC 3339 times, table
// driven, against a fixed "now".
#include "cli/older_than.h"

#include <gtest/gtest.h>

#include <string>

namespace chute {
namespace {

// 2026-12-02T04:33:13Z: 20789 days after 1970-01-01, plus 4:33:13. The
// expected times below were counted with Python's datetime module.
constexpr std::time_t kNow =
    std::time_t{20789} * 86400 + 4 * 3600 + 33 * 60 + 13;

std::string Cutoff(const std::string& arg) {
  std::string cutoff, why;
  EXPECT_TRUE(ParseOlderThan(arg, kNow, &cutoff, &why)) << arg << ": " << why;
  return cutoff;
}

std::string Why(const std::string& arg) {
  std::string cutoff = "untouched", why;
  EXPECT_FALSE(ParseOlderThan(arg, kNow, &cutoff, &why)) << arg;
  EXPECT_EQ(cutoff, "untouched") << arg;
  EXPECT_EQ(why.find('\n'), std::string::npos);
  return why;
}

TEST(OlderThanTest, AgesCountBackFromNow) {
  EXPECT_EQ(Cutoff("0m"), "2026-12-02T04:33:13Z");
  EXPECT_EQ(Cutoff("30m"), "2026-12-02T04:03:13Z");
  EXPECT_EQ(Cutoff("5h"), "2026-12-01T23:33:13Z");
  EXPECT_EQ(Cutoff("1d"), "2026-12-01T04:33:13Z");
  // The forms --since and --confirm-after are documented with.
  EXPECT_EQ(Cutoff("24h"), "2026-12-01T04:33:13Z");
  EXPECT_EQ(Cutoff("7d"), "2026-11-25T04:33:13Z");
  EXPECT_EQ(Cutoff("30d"), "2026-11-02T04:33:13Z");
  EXPECT_EQ(Cutoff("90m"), "2026-12-02T03:03:13Z");
  EXPECT_EQ(Cutoff("48h"), Cutoff("2d"));
  EXPECT_EQ(Cutoff("1440m"), Cutoff("1d"));
  // 2026-12-02 minus 400 days, across the end of February 2026 (no leap
  // day): 2025-10-28.
  EXPECT_EQ(Cutoff("400d"), "2025-10-28T04:33:13Z");
  EXPECT_EQ(Cutoff("0400d"), "2025-10-28T04:33:13Z");
  // Further back than 1970: the epoch (nothing was learned before it).
  EXPECT_EQ(Cutoff("999999999999d"), "1970-01-01T00:00:00Z");
}

TEST(OlderThanTest, Rfc3339TimesAreTurnedIntoUtc) {
  EXPECT_EQ(Cutoff("2025-01-31T00:00:00Z"), "2025-01-31T00:00:00Z");
  EXPECT_EQ(Cutoff("2025-01-31t10:20:30z"), "2025-01-31T10:20:30Z");
  EXPECT_EQ(Cutoff("2025-01-31T00:30:00+01:00"), "2025-01-30T23:30:00Z");
  EXPECT_EQ(Cutoff("2025-01-31T23:30:00-05:30"), "2025-02-01T05:00:00Z");
  EXPECT_EQ(Cutoff("2024-02-29T12:00:00Z"),
            "2024-02-29T12:00:00Z");  // leap year
  EXPECT_EQ(Cutoff("2000-02-29T12:00:00Z"),
            "2000-02-29T12:00:00Z");  // 400-year rule
  // A fraction rounds up: entries learned at 09:30:00 are before 09:30:00.25.
  EXPECT_EQ(Cutoff("2025-01-31T09:30:00.25Z"), "2025-01-31T09:30:01Z");
  EXPECT_EQ(Cutoff("2025-01-31T09:30:00.000Z"), "2025-01-31T09:30:00Z");
  // A leap second is the next second.
  EXPECT_EQ(Cutoff("2016-12-31T23:59:60Z"), "2017-01-01T00:00:00Z");
  EXPECT_EQ(Cutoff("1969-07-20T20:17:40Z"), "1970-01-01T00:00:00Z");
  EXPECT_EQ(Cutoff("2026-12-02T04:33:13Z"), "2026-12-02T04:33:13Z");  // now
}

TEST(OlderThanTest, OtherFormsAreRefusedWithTheReason) {
  const std::string form = "neither an age such as 400d";
  for (const char* bad : {"",
                          "d",
                          "400",
                          "400 d",
                          "-4d",
                          "4w",
                          "4D",
                          "1.5d",
                          "400dd",
                          "400d ",
                          "2025-01-31",
                          "2025-01-31T00:00:00",
                          "2025-01-31 00:00:00Z",
                          "2025-1-31T00:00:00Z",
                          "2025-01-31T00:00Z",
                          "2025-01-31T00:00:00.Z",
                          "2025-01-31T00:00:00+0100",
                          "2025-01-31T00:00:00+24:00",
                          "2025-13-01T00:00:00Z",
                          "2025-00-01T00:00:00Z",
                          "2025-02-29T00:00:00Z",
                          "1900-02-29T00:00:00Z",
                          "2025-04-31T00:00:00Z",
                          "2025-01-31T24:00:00Z",
                          "2025-01-31T23:60:00Z",
                          "2025-01-31T23:59:61Z",
                          "yesterday"}) {
    EXPECT_NE(Why(bad).find(form), std::string::npos) << bad;
  }
  EXPECT_NE(Why("1234567890123d").find("at most 12 digits"), std::string::npos);
}

TEST(OlderThanTest, TimesAfterNowAreRefused) {
  EXPECT_EQ(Why("2026-12-02T04:33:14Z"),
            "2026-12-02T04:33:14Z is in the future");
  EXPECT_EQ(Why("2099-01-01T00:00:00Z"),
            "2099-01-01T00:00:00Z is in the future");
}

}  // namespace
}  // namespace chute
