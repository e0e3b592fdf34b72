#include "classify/prior.h"

#include <gtest/gtest.h>

namespace chute {
namespace {

std::vector<QueueCounts> Queues() {
  return {{"a", 60, 0, std::nullopt}, {"b", 30, 0, std::nullopt}, {"c", 10, 0, std::nullopt}};
}

// Maximum-likelihood prior N_c / N: Manning, Raghavan & Schütze,
// Introduction to Information Retrieval, 2008, §13.2, eq. 13.5.
TEST(PriorTest, LearnedPriorIsTheShareOfDocuments) {
  auto p = ComputePriors(Queues(), PriorMode::kLearned);
  EXPECT_DOUBLE_EQ(p[0], 0.6);
  EXPECT_DOUBLE_EQ(p[1], 0.3);
  EXPECT_DOUBLE_EQ(p[2], 0.1);
}

TEST(PriorTest, UniformPriorIgnoresDocumentCounts) {
  auto p = ComputePriors(Queues(), PriorMode::kUniform);
  for (double v : p) EXPECT_DOUBLE_EQ(v, 1.0 / 3.0);
}

TEST(PriorTest, HandSetPriorKeepsItsValueAndOthersShareTheRestByDocuments) {
  auto q = Queues();
  q[2].set_prior = 0.5;
  auto p = ComputePriors(q, PriorMode::kLearned);
  EXPECT_DOUBLE_EQ(p[2], 0.5);
  EXPECT_DOUBLE_EQ(p[0], 0.5 * 60.0 / 90.0);
  EXPECT_DOUBLE_EQ(p[1], 0.5 * 30.0 / 90.0);
}

TEST(PriorTest, HandSetPriorWithUniformRest) {
  auto q = Queues();
  q[0].set_prior = 0.2;
  auto p = ComputePriors(q, PriorMode::kUniform);
  EXPECT_DOUBLE_EQ(p[0], 0.2);
  EXPECT_DOUBLE_EQ(p[1], 0.4);
  EXPECT_DOUBLE_EQ(p[2], 0.4);
}

TEST(PriorTest, AllMassSetByHandLeavesZeroForTheRest) {
  auto q = Queues();
  q[0].set_prior = 0.7;
  q[1].set_prior = 0.3;
  auto p = ComputePriors(q, PriorMode::kLearned);
  EXPECT_DOUBLE_EQ(p[2], 0.0);
}

}  // namespace
}  // namespace chute
