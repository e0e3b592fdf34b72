#include "classify/log_sum_exp.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <vector>

namespace chute {
namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

TEST(LogSumExpTest, EqualsTheDirectFormulaOnSmallValues) {
  std::vector<double> x = {-1.0, 0.5, 2.0};
  EXPECT_NEAR(LogSumExp(x), std::log(std::exp(-1.0) + std::exp(0.5) + std::exp(2.0)), 1e-15);
}

TEST(LogSumExpTest, DoesNotOverflowOrUnderflow) {
  std::vector<double> big = {1000.0, 1000.0};
  EXPECT_NEAR(LogSumExp(big), 1000.0 + std::log(2.0), 1e-12);
  std::vector<double> small = {-5000.0, -5000.0 - std::log(3.0)};
  EXPECT_NEAR(LogSumExp(small), -5000.0 + std::log(1.0 + 1.0 / 3.0), 1e-12);
}

TEST(LogSumExpTest, MinusInfinityContributesNothing) {
  std::vector<double> x = {-kInf, 0.0};
  EXPECT_DOUBLE_EQ(LogSumExp(x), 0.0);
  std::vector<double> all = {-kInf, -kInf};
  EXPECT_EQ(LogSumExp(all), -kInf);
  EXPECT_EQ(LogSumExp(std::vector<double>{}), -kInf);
}

}  // namespace
}  // namespace chute
