#include "classify/threshold_sweep.h"

#include <gtest/gtest.h>

#include <vector>

namespace chute {
namespace {

std::vector<Prediction> Make(const std::vector<std::pair<double, bool>>& confidence_right) {
  std::vector<Prediction> out;
  for (const auto& [c, right] : confidence_right) {
    Prediction p;
    p.truth = 0;
    p.predicted = right ? 0 : 1;
    p.confidence = c;
    p.probabilities = {right ? c : 1 - c, right ? 1 - c : c};
    out.push_back(p);
  }
  return out;
}

// Six documents, worked by hand; accuracy among the automatic ones is not
// monotone in the threshold:
//   t in [0, 0.50]:    6 documents, 4 right, 0.667
//   t in [0.51, 0.62]: 5, 4 right, 0.8
//   t in [0.63, 0.75]: 4, 3 right, 0.75
//   t in [0.76, 0.90]: 3, all right
//   t in [0.91, 0.97]: 2, all right
//   t in [0.98, 1.00]: 1 (confidence 1), right
const std::vector<std::pair<double, bool>> kCase = {{0.50, false}, {0.62, true}, {0.75, false},
                                                    {0.90, true},  {0.97, true}, {1.0, true}};

TEST(ThresholdSweepTest, SharesAndAccuracyOnTheGrid) {
  const std::vector<SweepPoint> s = SweepThresholds(Make(kCase));
  ASSERT_EQ(s.size(), 101u);
  for (int h = 0; h <= 100; ++h) {
    EXPECT_EQ(s[h].hundredths, h);
    EXPECT_EQ(s[h].threshold, h / 100.0);
  }
  EXPECT_EQ(s[0].documents, 6);
  EXPECT_EQ(s[50].documents, 6);
  EXPECT_EQ(s[51].documents, 5);
  EXPECT_DOUBLE_EQ(*s[51].accuracy, 0.8);
  EXPECT_EQ(s[75].documents, 4);
  EXPECT_DOUBLE_EQ(*s[75].accuracy, 0.75);
  EXPECT_EQ(s[76].documents, 3);
  EXPECT_DOUBLE_EQ(s[76].auto_share, 0.5);
  EXPECT_EQ(s[100].documents, 1);
  EXPECT_DOUBLE_EQ(*s[100].accuracy, 1.0);
  EXPECT_DOUBLE_EQ(*s[0].accuracy, 4.0 / 6);
}

TEST(ThresholdSweepTest, RecommendationNeedsEveryHigherPointToReachTheTarget) {
  const std::vector<SweepPoint> s = SweepThresholds(Make(kCase));
  // 0.8: t = 0.51 reaches it, but 0.63-0.75 do not; the lowest t from
  // which every point reaches 0.8 is 0.76.
  ThresholdRecommendation r = RecommendThreshold(s, 0.8);
  ASSERT_TRUE(r.point.has_value());
  EXPECT_EQ(r.point->hundredths, 76);
  EXPECT_EQ(r.point->documents, 3);
  EXPECT_DOUBLE_EQ(r.point->auto_share, 0.5);
  // 0.7: every point from 0.51 up reaches it; 0.50 does not.
  r = RecommendThreshold(s, 0.7);
  ASSERT_TRUE(r.point.has_value());
  EXPECT_EQ(r.point->hundredths, 51);
  EXPECT_EQ(r.point->documents, 5);
  // 0.6: every point reaches it.
  EXPECT_EQ(RecommendThreshold(s, 0.6).point->hundredths, 0);
}

TEST(ThresholdSweepTest, PointsWithoutDocumentsNeitherMeetNorBreakTheTarget) {
  // Nothing reaches 0.96 and above; a wrong document at 0.95.
  const auto s = SweepThresholds(Make({{0.6, true}, {0.8, true}, {0.95, false}}));
  EXPECT_FALSE(s[96].accuracy.has_value());
  EXPECT_EQ(s[100].documents, 0);
  // The empty top of the grid is skipped; 0.95 misses the target, so no
  // threshold is recommended.
  EXPECT_FALSE(RecommendThreshold(s, 0.9).point.has_value());
  // With the wrong document lower down, the recommendation is the lowest
  // point above it, and it routes documents.
  const auto t = SweepThresholds(Make({{0.6, false}, {0.8, true}, {0.9, true}}));
  const ThresholdRecommendation r = RecommendThreshold(t, 0.99);
  ASSERT_TRUE(r.point.has_value());
  EXPECT_EQ(r.point->hundredths, 61);
  EXPECT_EQ(r.point->documents, 2);
}

// The grid is computed from integers: a confidence of exactly 0.29 counts
// at t = 0.29, though 0.01 added 29 times is a little above 0.29.
TEST(ThresholdSweepTest, GridHasNoFloatDrift) {
  double drifted = 0;
  for (int i = 0; i < 29; ++i) drifted += 0.01;
  ASSERT_GT(drifted, 0.29);
  const auto s = SweepThresholds(Make({{0.29, true}}));
  EXPECT_EQ(s[29].documents, 1);
  EXPECT_EQ(s[30].documents, 0);
}

TEST(ThresholdSweepTest, NoDocuments) {
  const auto s = SweepThresholds({});
  EXPECT_EQ(s[0].documents, 0);
  EXPECT_EQ(s[0].auto_share, 0.0);
  EXPECT_FALSE(RecommendThreshold(s, 0.5).point.has_value());
}

}  // namespace
}  // namespace chute
