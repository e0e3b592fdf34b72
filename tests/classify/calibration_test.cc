#include "classify/calibration.h"

#include <gtest/gtest.h>

#include <cmath>
#include <vector>

namespace chute {
namespace {

Prediction Make(uint32_t truth, std::vector<double> probabilities) {
  Prediction p;
  p.truth = truth;
  p.probabilities = std::move(probabilities);
  for (uint32_t q = 0; q < p.probabilities.size(); ++q) {
    if (p.probabilities[q] > p.probabilities[p.predicted]) p.predicted = q;
  }
  p.confidence = p.probabilities[p.predicted];
  return p;
}

// Four documents, two queues, worked by hand:
//   1: true 0, (0.8, 0.2)  chosen 0, right,  confidence 0.8
//   2: true 1, (0.6, 0.4)  chosen 0, wrong,  confidence 0.6
//   3: true 1, (0, 1)      chosen 1, right,  confidence 1
//   4: true 0, (0, 1)      chosen 1, wrong,  confidence 1
// Log loss with clipping to [ε, 1−ε], ε = 2^−52, and renormalisation (the
// convention of scikit-learn 1.2.1's sklearn.metrics.log_loss): each row
// still sums to 1, so it is (−log 0.8 − log 0.4 − log(1−ε) − log ε) / 4.
// Brier (Brier 1950, Monthly Weather Review 78(1)), Σ_q (p − y)² per
// document: 0.04+0.04, 0.36+0.36, 0, 1+1; mean 2.8/4 = 0.7.
// Reliability (Guo et al. 2017, ICML, §2: B_m = ((m−1)/M, m/M]):
// 0.6 in bin (0.5, 0.6], 0.8 in (0.7, 0.8], 1 and 1 in (0.9, 1];
// ECE = 1/4·|0 − 0.6| + 1/4·|1 − 0.8| + 2/4·|0.5 − 1| = 0.45.
TEST(CalibrationTest, HandWorkedCase) {
  const std::vector<Prediction> ps = {Make(0, {0.8, 0.2}), Make(1, {0.6, 0.4}),
                                      Make(1, {0.0, 1.0}), Make(0, {0.0, 1.0})};
  const Calibration c = ComputeCalibration(ps);
  const double eps = std::ldexp(1.0, -52);
  EXPECT_EQ(kLogLossEpsilon, eps);
  EXPECT_NEAR(*c.log_loss,
              (-std::log(0.8) - std::log(0.4) - std::log(1 - eps) - std::log(eps)) / 4, 1e-15);
  EXPECT_NEAR(*c.brier, 0.7, 1e-15);
  EXPECT_NEAR(*c.ece, 0.45, 1e-15);
  ASSERT_EQ(c.reliability.size(), 10u);
  for (int m = 0; m < 10; ++m) {
    EXPECT_DOUBLE_EQ(c.reliability[m].low, m / 10.0);
    EXPECT_DOUBLE_EQ(c.reliability[m].high, (m + 1) / 10.0);
    const int64_t expected = m == 5 ? 1 : m == 7 ? 1 : m == 9 ? 2 : 0;
    EXPECT_EQ(c.reliability[m].count, expected) << "bin " << m;
    EXPECT_EQ(c.reliability[m].accuracy.has_value(), expected > 0);
  }
  EXPECT_DOUBLE_EQ(*c.reliability[5].mean_confidence, 0.6);
  EXPECT_DOUBLE_EQ(*c.reliability[5].accuracy, 0.0);
  EXPECT_DOUBLE_EQ(*c.reliability[7].accuracy, 1.0);
  EXPECT_DOUBLE_EQ(*c.reliability[9].mean_confidence, 1.0);
  EXPECT_DOUBLE_EQ(*c.reliability[9].accuracy, 0.5);
}

// A true queue with posterior 0 (the model could not route to it) costs
// −log ε after clipping and renormalising, never infinity.
TEST(CalibrationTest, ZeroPosteriorOfTheTrueQueueIsClipped) {
  const Calibration c = ComputeCalibration(std::vector<Prediction>{Make(2, {0.5, 0.5, 0.0})});
  const double eps = std::ldexp(1.0, -52);
  EXPECT_NEAR(*c.log_loss, -std::log(eps / (0.5 + 0.5 + eps)), 1e-12);
  EXPECT_NEAR(*c.brier, 0.25 + 0.25 + 1.0, 1e-15);
}

// The bin edges are numpy.linspace(0, 1, 11) (m × 0.1 in double, so 0.3's
// edge is 0.30000000000000004), and numpy.searchsorted(side="left") puts a
// confidence equal to an edge in the lower bin, as
// sklearn.calibration.calibration_curve (scikit-learn 1.2.1) does.
TEST(CalibrationTest, EdgeValuesFallAsInScikitLearn) {
  EXPECT_EQ(ReliabilityBinOf(0.0), 0);
  EXPECT_EQ(ReliabilityBinOf(0.1), 0);
  EXPECT_EQ(ReliabilityBinOf(std::nextafter(0.1, 1.0)), 1);
  EXPECT_EQ(ReliabilityBinOf(0.3), 2);
  EXPECT_EQ(ReliabilityBinOf(0.30000000000000004), 2);
  EXPECT_EQ(ReliabilityBinOf(std::nextafter(0.30000000000000004, 1.0)), 3);
  EXPECT_EQ(ReliabilityBinOf(0.5), 4);
  EXPECT_EQ(ReliabilityBinOf(0.95), 9);
  EXPECT_EQ(ReliabilityBinOf(1.0), 9);
}

TEST(CalibrationTest, NoDocumentsGiveNoFigures) {
  const Calibration c = ComputeCalibration({});
  EXPECT_FALSE(c.log_loss.has_value());
  EXPECT_FALSE(c.brier.has_value());
  EXPECT_FALSE(c.ece.has_value());
  EXPECT_EQ(c.reliability.size(), 10u);
}

}  // namespace
}  // namespace chute
