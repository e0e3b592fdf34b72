// Tests of the drift figures (classify/drift.h): exact figures of a small
// log worked out by hand in the comments.
#include "classify/drift.h"

#include <gtest/gtest.h>

#include <vector>

namespace chute {
namespace {

LoggedDecision At(std::string time, std::string queue, double confidence, std::string held,
                  int64_t terms, int64_t unknown) {
  LoggedDecision d;
  d.time = std::move(time);
  d.queue = std::move(queue);
  d.confidence = confidence;
  d.held = std::move(held);
  d.terms = terms;
  d.unknown_terms = unknown;
  return d;
}

// Ledger: permits 6, claims 4 learned documents (mix 0.6, 0.4).
// 2026-11-29: permits 0.9, permits 0.8, claims 0.7, claims 0.6 (held);
//             terms 10 each, unknown 1, 0, 1, 2.
// 2026-11-30: permits 0.5 (held), permits 0.5 (held), permits 0.9,
//             tenders 0.4 (held, no terms); terms 5, 5, 10, 0; unknown 5, 0, 0, 0.
// Given out of order: the days are sorted by date.
std::vector<LoggedDecision> Log() {
  return {At("2026-11-30T08:00:00Z", "permits", 0.5, "threshold", 5, 5),
          At("2026-11-29T23:59:59Z", "claims", 0.6, "threshold", 10, 2),
          At("2026-11-29T00:00:00Z", "permits", 0.9, "", 10, 1),
          At("2026-11-29T10:00:00Z", "permits", 0.8, "", 10, 0),
          At("2026-11-29T11:00:00Z", "claims", 0.7, "", 10, 1),
          At("2026-11-30T09:00:00Z", "permits", 0.5, "audit", 5, 0),
          At("2026-11-30T10:00:00Z", "permits", 0.9, "", 10, 0),
          At("2026-11-30T23:00:00Z", "tenders", 0.4, "no_terms", 0, 0)};
}

const std::vector<std::pair<std::string, int64_t>> kLedger = {{"permits", 6}, {"claims", 4}};

TEST(DriftTest, FiguresPerDayAndOverThePeriod) {
  const std::vector<LoggedDecision> log = Log();
  const DriftReport r = ComputeDrift(log, kLedger, DriftOptions{0.12, 4});
  ASSERT_EQ(r.queues, (std::vector<std::string>{"claims", "permits", "tenders"}));
  EXPECT_EQ(r.ledger_documents, 10);
  EXPECT_DOUBLE_EQ(r.ledger_share[0], 0.4);
  EXPECT_DOUBLE_EQ(r.ledger_share[1], 0.6);
  EXPECT_EQ(r.ledger_share[2], 0.0);

  // Period: 8 decisions; claims 2, permits 5, tenders 1; 4 held; confidence
  // 5.3 / 8 = 0.6625; unknown terms 9 of 60 = 0.15.
  EXPECT_EQ(r.period.decisions, 8);
  EXPECT_EQ(r.period.queue_decisions, (std::vector<int64_t>{2, 5, 1}));
  EXPECT_DOUBLE_EQ(r.period.queue_share[0], 0.25);
  EXPECT_DOUBLE_EQ(r.period.queue_share[1], 0.625);
  EXPECT_DOUBLE_EQ(r.period.queue_share[2], 0.125);
  EXPECT_DOUBLE_EQ(r.period.held_share, 0.5);
  EXPECT_DOUBLE_EQ(r.period.mean_confidence, 0.6625);
  EXPECT_EQ(r.period.terms, 60);
  EXPECT_EQ(r.period.unknown_terms, 9);
  EXPECT_DOUBLE_EQ(*r.period.unknown_share, 0.15);

  ASSERT_EQ(r.days.size(), 2u);
  const DriftFigures& first = r.days[0].figures;
  EXPECT_EQ(r.days[0].date, "2026-11-29");
  EXPECT_EQ(first.decisions, 4);
  EXPECT_EQ(first.queue_decisions, (std::vector<int64_t>{2, 2, 0}));
  EXPECT_DOUBLE_EQ(first.held_share, 0.25);
  EXPECT_DOUBLE_EQ(first.mean_confidence, 0.75);      // 3.0 / 4
  EXPECT_DOUBLE_EQ(*first.unknown_share, 0.1);         // 4 / 40
  const DriftFigures& second = r.days[1].figures;
  EXPECT_EQ(r.days[1].date, "2026-11-30");
  EXPECT_EQ(second.queue_decisions, (std::vector<int64_t>{0, 3, 1}));
  EXPECT_DOUBLE_EQ(second.queue_share[1], 0.75);
  EXPECT_DOUBLE_EQ(second.held_share, 0.75);
  EXPECT_DOUBLE_EQ(second.mean_confidence, 0.575);    // 2.3 / 4
  EXPECT_DOUBLE_EQ(*second.unknown_share, 0.25);       // 5 / 20
}

// With change 0.12: on 11-29 only the held share moved (0.25 against
// 0.5; the mix differs by 0.1, the confidence by 0.0875, the unknown share
// by 0.05). On 11-30 claims (0 against 0.4), permits (0.75 against 0.6),
// tenders (0.25 against 0) and the held share (0.75 against 0.5); the
// confidence (0.0875) and the unknown share (0.1) stay within 0.12.
TEST(DriftTest, FlagsFiguresThatMoveMoreThanTheSetAmount) {
  const std::vector<LoggedDecision> log = Log();
  const DriftReport r = ComputeDrift(log, kLedger, DriftOptions{0.12, 4});
  ASSERT_EQ(r.alerts.size(), 5u);
  EXPECT_EQ(r.alerts[0].date, "2026-11-29");
  EXPECT_EQ(r.alerts[0].figure, DriftFigure::kHeldShare);
  EXPECT_DOUBLE_EQ(r.alerts[0].value, 0.25);
  EXPECT_DOUBLE_EQ(r.alerts[0].baseline, 0.5);
  const char* queues[] = {"claims", "permits", "tenders"};
  const double values[] = {0, 0.75, 0.25};
  const double baselines[] = {0.4, 0.6, 0};
  for (int i = 0; i < 3; ++i) {
    const DriftAlert& a = r.alerts[static_cast<size_t>(i) + 1];
    EXPECT_EQ(a.date, "2026-11-30");
    EXPECT_EQ(a.figure, DriftFigure::kQueueShare);
    EXPECT_EQ(a.queue, queues[i]);
    EXPECT_DOUBLE_EQ(a.value, values[i]);
    EXPECT_DOUBLE_EQ(a.baseline, baselines[i]);
  }
  EXPECT_EQ(r.alerts[4].figure, DriftFigure::kHeldShare);
  EXPECT_DOUBLE_EQ(r.alerts[4].value, 0.75);

  // A smaller amount also flags the confidence and the unknown share of
  // 11-30 (0.0875 and 0.1 > 0.08) and the mix and confidence of 11-29.
  const DriftReport low = ComputeDrift(log, kLedger, DriftOptions{0.08, 4});
  int confidence = 0, unknown = 0;
  for (const DriftAlert& a : low.alerts) {
    confidence += a.figure == DriftFigure::kMeanConfidence;
    unknown += a.figure == DriftFigure::kUnknownShare;
  }
  EXPECT_EQ(confidence, 2);
  EXPECT_EQ(unknown, 1);
}

TEST(DriftTest, DaysWithFewDecisionsAreNotFlagged) {
  const std::vector<LoggedDecision> log = Log();
  EXPECT_TRUE(ComputeDrift(log, kLedger, DriftOptions{0.12, 5}).alerts.empty());
  EXPECT_EQ(ComputeDrift(log, kLedger, DriftOptions{0.12, 5}).days.size(), 2u);
}

TEST(DriftTest, NoDecisionsAndNoTerms) {
  const DriftReport empty = ComputeDrift({}, kLedger, DriftOptions{});
  EXPECT_TRUE(empty.days.empty());
  EXPECT_EQ(empty.period.decisions, 0);
  EXPECT_FALSE(empty.period.unknown_share.has_value());
  EXPECT_EQ(empty.queues.size(), 2u);

  // Only documents without terms: the unknown share is undefined, not 0.
  const std::vector<LoggedDecision> log = {At("2026-11-30T08:00:00Z", "a", 0.5, "no_terms", 0, 0)};
  const DriftReport r = ComputeDrift(log, {}, DriftOptions{0.1, 1});
  EXPECT_FALSE(r.days[0].figures.unknown_share.has_value());
  // Empty ledger: every learned share is 0; the day's mix (a: 1.0) moved.
  ASSERT_EQ(r.alerts.size(), 1u);
  EXPECT_EQ(r.alerts[0].queue, "a");
  EXPECT_DOUBLE_EQ(r.alerts[0].baseline, 0.0);
}

}  // namespace
}  // namespace chute
