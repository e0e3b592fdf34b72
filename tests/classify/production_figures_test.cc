// Tests of the production figures (classify/production_figures.h): counts
// and audit precision of a small log, worked out by hand.
#include "classify/production_figures.h"

#include <gtest/gtest.h>

#include <vector>

namespace chute {
namespace {

LoggedDecision D(std::string queue, std::string held, std::string review,
                 std::string reviewed_queue, std::string time = "2026-11-30T08:00:00Z") {
  LoggedDecision d;
  d.time = std::move(time);
  d.queue = std::move(queue);
  d.confidence = 0.9;
  d.held = std::move(held);
  d.review = std::move(review);
  d.reviewed_queue = std::move(reviewed_queue);
  return d;
}

std::vector<LoggedDecision> Log() {
  return {
      D("permits", "audit", "moved", "permits"),                       // audit, right
      D("permits", "audit", "moved", "claims"),                        // audit, wrong
      D("permits", "audit", "", "", "2026-11-29T08:00:00Z"),           // audit, unknown
      D("permits", "", "moved", "claims"),                             // a correction
      D("claims", "threshold", "moved", "claims"),                     // guess confirmed
      D("claims", "threshold", "moved", "permits"),                    // a correction
      D("claims", "", "left", "claims", "2026-12-01T08:00:00Z"),       // left in place
      D("claims", "no_terms", "", ""),                                 // still in review
      D("claims", "min_documents", "", ""),                            // still in review
      D("claims", "audit", "moved", "claims"),                         // audit, right
  };
}

TEST(ProductionFiguresTest, CountsEveryKindOfDecision) {
  const std::vector<LoggedDecision> log = Log();
  const ProductionFigures f = ComputeProductionFigures(log);
  const DecisionCounts& t = f.total;
  EXPECT_EQ(t.decisions, 10);
  EXPECT_EQ(t.routed, 2);
  EXPECT_EQ(t.held_threshold, 2);
  EXPECT_EQ(t.held_no_terms, 1);
  EXPECT_EQ(t.held_min_documents, 1);
  EXPECT_EQ(t.audit_drawn, 4);
  EXPECT_EQ(t.audit_reviewed, 3);
  EXPECT_EQ(t.audit_correct, 2);
  EXPECT_EQ(t.audit_unknown, 1);
  EXPECT_EQ(t.corrections, 2);
  EXPECT_EQ(t.held_confirmed, 1);
  EXPECT_EQ(t.left_confirmed, 1);
  EXPECT_EQ(f.first_time, "2026-11-29T08:00:00Z");
  EXPECT_EQ(f.last_time, "2026-12-01T08:00:00Z");
}

// Precision counts only reviewed audit documents: 2 of 3 in all, 1 of 2
// for permits, 1 of 1 for claims. The unreviewed audit document of permits
// is not counted as right.
TEST(ProductionFiguresTest, PrecisionComesFromReviewedAuditDocumentsOnly) {
  const std::vector<LoggedDecision> log = Log();
  const ProductionFigures f = ComputeProductionFigures(log);
  ASSERT_TRUE(f.total.precision.has_value());
  EXPECT_DOUBLE_EQ(f.total.precision->estimate, 2.0 / 3.0);
  EXPECT_EQ(f.total.precision->low, WilsonInterval(2, 3)->low);
  EXPECT_EQ(f.total.precision->high, WilsonInterval(2, 3)->high);

  ASSERT_EQ(f.queues.size(), 2u);
  EXPECT_EQ(f.queues[0].queue, "claims");
  EXPECT_EQ(f.queues[0].counts.decisions, 6);
  EXPECT_EQ(f.queues[0].counts.audit_reviewed, 1);
  EXPECT_DOUBLE_EQ(f.queues[0].counts.precision->estimate, 1.0);
  EXPECT_EQ(f.queues[0].counts.precision->high, 1.0);
  EXPECT_EQ(f.queues[0].counts.corrections, 1);
  EXPECT_EQ(f.queues[1].queue, "permits");
  EXPECT_EQ(f.queues[1].counts.decisions, 4);
  EXPECT_EQ(f.queues[1].counts.audit_drawn, 3);
  EXPECT_EQ(f.queues[1].counts.audit_unknown, 1);
  EXPECT_DOUBLE_EQ(f.queues[1].counts.precision->estimate, 0.5);
  EXPECT_EQ(f.queues[1].counts.corrections, 1);
}

TEST(ProductionFiguresTest, NoReviewedAuditMeansNoPrecision) {
  const std::vector<LoggedDecision> log = {D("permits", "audit", "", ""),
                                           D("permits", "", "", "")};
  const ProductionFigures f = ComputeProductionFigures(log);
  EXPECT_FALSE(f.total.precision.has_value());
  EXPECT_EQ(f.total.audit_unknown, 1);
  EXPECT_FALSE(ComputeProductionFigures({}).total.precision.has_value());
}

}  // namespace
}  // namespace chute
