#include "classify/metrics.h"

#include <gtest/gtest.h>

#include <vector>

namespace chute {
namespace {

std::vector<Prediction> Make(const std::vector<std::pair<uint32_t, uint32_t>>& truth_routed,
                             size_t labels) {
  std::vector<Prediction> out;
  for (const auto& [t, r] : truth_routed) {
    Prediction p;
    p.truth = t;
    p.predicted = r;
    p.confidence = 1.0;
    p.probabilities.assign(labels, 0.0);
    p.probabilities[r] = 1.0;
    out.push_back(p);
  }
  return out;
}

std::vector<std::pair<uint32_t, uint32_t>> Repeat(uint32_t t, uint32_t r, int n) {
  return std::vector<std::pair<uint32_t, uint32_t>>(n, {t, r});
}

// A small case worked by hand with the definitions of Manning, Raghavan &
// Schütze, Introduction to Information Retrieval (2008), §13.6:
// "Macroaveraging computes a simple average over classes. Microaveraging
// pools per-document decisions across classes, and then computes an
// effectiveness measure on the pooled contingency table" (quoted from
// memory). Ten documents, three queues A, B, C; rows true:
//        routed A  B  C
//   A          3  1  0     support 4
//   B          1  2  1     support 4
//   C          1  0  1     support 2
// routed:      5  3  2
// precision A 3/5, B 2/3, C 1/2; recall A 3/4, B 1/2, C 1/2;
// F1 = 2TP/(2TP+FP+FN): A 6/9, B 4/7, C 2/4.
// macro P = (3/5 + 2/3 + 1/2)/3 = 53/90, macro R = (3/4 + 1/2 + 1/2)/3 = 7/12,
// macro F1 = (2/3 + 4/7 + 1/2)/3 = 73/126;
// weighted P = (4·3/5 + 4·2/3 + 2·1/2)/10 = 91/150, weighted R = 6/10;
// pooled table: TP 6, FP 4, FN 4, so micro P = R = F1 = 6/10 = accuracy.
TEST(MetricsTest, HandWorkedCaseAfterManningSection13_6) {
  std::vector<std::pair<uint32_t, uint32_t>> tr;
  for (auto part : {Repeat(0, 0, 3), Repeat(0, 1, 1), Repeat(1, 0, 1), Repeat(1, 1, 2),
                    Repeat(1, 2, 1), Repeat(2, 0, 1), Repeat(2, 2, 1)}) {
    tr.insert(tr.end(), part.begin(), part.end());
  }
  const ClassificationMetrics m = ComputeClassificationMetrics(Make(tr, 3), 3);
  EXPECT_EQ(m.confusion, (std::vector<std::vector<int64_t>>{{3, 1, 0}, {1, 2, 1}, {1, 0, 1}}));
  EXPECT_EQ(m.documents, 10);
  EXPECT_EQ(m.correct, 6);
  EXPECT_DOUBLE_EQ(*m.accuracy, 0.6);
  const double p[] = {3.0 / 5, 2.0 / 3, 1.0 / 2}, r[] = {3.0 / 4, 1.0 / 2, 1.0 / 2},
               f[] = {6.0 / 9, 4.0 / 7, 2.0 / 4};
  const int64_t support[] = {4, 4, 2}, routed[] = {5, 3, 2};
  for (int q = 0; q < 3; ++q) {
    EXPECT_EQ(m.per_queue[q].support, support[q]);
    EXPECT_EQ(m.per_queue[q].routed, routed[q]);
    EXPECT_DOUBLE_EQ(*m.per_queue[q].precision, p[q]);
    EXPECT_DOUBLE_EQ(*m.per_queue[q].recall, r[q]);
    EXPECT_DOUBLE_EQ(*m.per_queue[q].f1, f[q]);
  }
  EXPECT_DOUBLE_EQ(*m.macro.precision, 53.0 / 90);
  EXPECT_DOUBLE_EQ(*m.macro.recall, 7.0 / 12);
  EXPECT_DOUBLE_EQ(*m.macro.f1, 73.0 / 126);
  EXPECT_EQ(m.macro.precision_left_out + m.macro.recall_left_out + m.macro.f1_left_out, 0);
  EXPECT_DOUBLE_EQ(*m.weighted.precision, 91.0 / 150);
  EXPECT_DOUBLE_EQ(*m.weighted.recall, 0.6);
  EXPECT_DOUBLE_EQ(*m.micro.precision, 0.6);
  EXPECT_DOUBLE_EQ(*m.micro.recall, 0.6);
  EXPECT_DOUBLE_EQ(*m.micro.f1, 0.6);
}

// Undefined figures stay undefined and are left out of the averages, which
// say how many were left out. Queues A, B, C: two documents of A and one of
// B, all routed to A; nothing routed to B; C has no document at all.
// A: P 2/3, R 1, F1 4/5. B: P undefined, R 0, F1 = 0/(0+0+1) = 0.
// C: P, R and F1 undefined.
TEST(MetricsTest, UndefinedFiguresAreLeftOutOfAveragesAndCounted) {
  const ClassificationMetrics m =
      ComputeClassificationMetrics(Make({{0, 0}, {0, 0}, {1, 0}}, 3), 3);
  EXPECT_DOUBLE_EQ(*m.per_queue[0].precision, 2.0 / 3);
  EXPECT_DOUBLE_EQ(*m.per_queue[0].recall, 1.0);
  EXPECT_DOUBLE_EQ(*m.per_queue[0].f1, 0.8);
  EXPECT_FALSE(m.per_queue[1].precision.has_value());
  EXPECT_DOUBLE_EQ(*m.per_queue[1].recall, 0.0);
  EXPECT_DOUBLE_EQ(*m.per_queue[1].f1, 0.0);
  EXPECT_FALSE(m.per_queue[2].precision.has_value());
  EXPECT_FALSE(m.per_queue[2].recall.has_value());
  EXPECT_FALSE(m.per_queue[2].f1.has_value());

  EXPECT_DOUBLE_EQ(*m.macro.precision, 2.0 / 3);
  EXPECT_EQ(m.macro.precision_left_out, 2);
  EXPECT_DOUBLE_EQ(*m.macro.recall, 0.5);
  EXPECT_EQ(m.macro.recall_left_out, 1);
  EXPECT_DOUBLE_EQ(*m.macro.f1, 0.4);
  EXPECT_EQ(m.macro.f1_left_out, 1);
  EXPECT_DOUBLE_EQ(*m.weighted.precision, 2.0 / 3);
  EXPECT_EQ(m.weighted.precision_left_out, 2);
  EXPECT_DOUBLE_EQ(*m.weighted.recall, 2.0 / 3);  // weighted recall = accuracy
  EXPECT_DOUBLE_EQ(*m.accuracy, 2.0 / 3);
}

TEST(MetricsTest, NoDocumentsGiveNoFigures) {
  const ClassificationMetrics m = ComputeClassificationMetrics({}, 2);
  EXPECT_FALSE(m.accuracy.has_value());
  EXPECT_FALSE(m.macro.precision.has_value());
  EXPECT_EQ(m.macro.precision_left_out, 2);
  EXPECT_FALSE(m.micro.f1.has_value());
}

}  // namespace
}  // namespace chute
