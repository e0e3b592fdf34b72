// Tests of the Wilson score interval (classify/wilson_interval.h) against
// published worked examples and its defining properties. The check against
// statsmodels on many (k, n) is tests/reference/wilson_statsmodels.py.
#include "classify/wilson_interval.h"

#include <gtest/gtest.h>

#include <cmath>

namespace chute {
namespace {

// R. G. Newcombe, "Two-sided confidence intervals for the single
// proportion: comparison of seven methods", Statistics in Medicine 17,
// 1998, Table I, method 3 (score interval without continuity correction),
// given there to 4 decimals. The values are recalled from memory; Debian's
// statsmodels 0.13.5, proportion_confint(k, n, method='wilson'), gives the
// same to 4 decimals (0.25529 .. 0.36621, 0.06239 .. 0.16049, 0 .. 0.16113,
// 0.00611 .. 0.17176).
TEST(WilsonIntervalTest, MatchesNewcombeTableOne) {
  struct Case {
    int64_t k, n;
    double low, high;
  };
  for (const Case& c : {Case{81, 263, 0.2553, 0.3662}, Case{15, 148, 0.0624, 0.1605},
                        Case{0, 20, 0.0000, 0.1611}, Case{1, 29, 0.0061, 0.1718}}) {
    const auto w = WilsonInterval(c.k, c.n);
    ASSERT_TRUE(w.has_value());
    EXPECT_NEAR(w->low, c.low, 0.00005) << c.k << "/" << c.n;
    EXPECT_NEAR(w->high, c.high, 0.00005) << c.k << "/" << c.n;
    EXPECT_DOUBLE_EQ(w->estimate, static_cast<double>(c.k) / static_cast<double>(c.n));
  }
}

// The README's example: 47 of 50 audited decisions right. statsmodels
// 0.13.5 gives 0.8378290831116182 .. 0.979385029651026.
TEST(WilsonIntervalTest, FortySevenOfFifty) {
  const auto w = WilsonInterval(47, 50);
  ASSERT_TRUE(w.has_value());
  EXPECT_DOUBLE_EQ(w->estimate, 0.94);
  EXPECT_NEAR(w->low, 0.8378290831116182, 1e-12);
  EXPECT_NEAR(w->high, 0.979385029651026, 1e-12);
}

TEST(WilsonIntervalTest, NoTrialsGiveNoInterval) {
  EXPECT_FALSE(WilsonInterval(0, 0).has_value());
}

TEST(WilsonIntervalTest, EndsAreExactAtNoneAndAll) {
  for (int64_t n : {1, 2, 7, 100, 100000}) {
    const auto none = WilsonInterval(0, n);
    const auto all = WilsonInterval(n, n);
    EXPECT_EQ(none->low, 0.0);
    EXPECT_GT(none->high, 0.0);
    EXPECT_EQ(all->high, 1.0);
    EXPECT_LT(all->low, 1.0);
    // Symmetry: k of n and n - k of n mirror each other around 1/2.
    EXPECT_NEAR(none->high, 1 - all->low, 1e-15);
  }
}

// With k = 0 the upper bound has the closed form z²/(n + z²) (common
// practice: put p̂ = 0 into the formula).
TEST(WilsonIntervalTest, UpperBoundAtZeroHasItsClosedForm) {
  for (int64_t n : {1, 5, 20, 1000}) {
    const double z2 = kZ95 * kZ95;
    EXPECT_NEAR(WilsonInterval(0, n)->high, z2 / (static_cast<double>(n) + z2), 1e-15) << n;
  }
}

TEST(WilsonIntervalTest, ContainsTheEstimateAndNarrowsWithMoreTrials) {
  double width = 1;
  for (int64_t n : {10, 100, 1000, 10000}) {
    const auto w = WilsonInterval(n * 3 / 10, n);
    EXPECT_LT(w->low, w->estimate);
    EXPECT_GT(w->high, w->estimate);
    EXPECT_LT(w->high - w->low, width);
    width = w->high - w->low;
  }
  // A wider z gives a wider interval.
  const auto narrow = WilsonInterval(30, 100, 1.0);
  const auto wide = WilsonInterval(30, 100, 2.5);
  EXPECT_LT(wide->low, narrow->low);
  EXPECT_GT(wide->high, narrow->high);
}

}  // namespace
}  // namespace chute
