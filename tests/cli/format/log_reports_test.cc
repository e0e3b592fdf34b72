// Tests of the writers of evaluate --from-log (production_report.h) and
// drift (drift_report.h): the sentences, and JSON and CSV that read back.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include "cli/format/drift_report.h"
#include "cli/format/production_report.h"

namespace chute {
namespace {

using nlohmann::json;

DecisionCounts Audited(int64_t right, int64_t reviewed, int64_t drawn) {
  DecisionCounts c;
  c.decisions = drawn * 10;
  c.audit_drawn = drawn;
  c.audit_reviewed = reviewed;
  c.audit_correct = right;
  c.audit_unknown = drawn - reviewed;
  c.precision = WilsonInterval(right, reviewed);
  return c;
}

// 47 of 50: Wilson 0.8378 .. 0.9794 (statsmodels 0.13.5, see
// tests/classify/wilson_interval_test.cc), rounded to 0.84 and 0.98.
TEST(ProductionReportTest, PrecisionInPlainWords) {
  EXPECT_EQ(PrecisionSentence("permits", Audited(47, 50, 60), 0.95),
            "Of 50 audited decisions for permits, 47 were right: precision 0.94, between 0.84 "
            "and 0.98 with 95% confidence.");
  EXPECT_EQ(PrecisionSentence("", Audited(1, 1, 1), 0.95).substr(0, 46),
            "Of 1 audited decision in all, 1 was right: pre");
  EXPECT_EQ(PrecisionSentence("claims", Audited(0, 0, 3), 0.95),
            "No audited decision for claims has been reviewed yet (3 drawn): no precision.");
}

TEST(ProductionReportTest, JsonAndCsvHoldTheFiguresOrNothing) {
  ProductionReport r;
  r.store = "s.db";
  r.generated_at = "2026-12-02T08:00:00Z";
  r.chute_version = "test";
  r.figures.total = Audited(3, 4, 5);
  r.figures.queues = {{"claims", Audited(0, 0, 1)}, {"per,mits", Audited(3, 4, 4)}};
  const json j = json::parse(ProductionJson(r));
  EXPECT_EQ(j["since"], nullptr);
  EXPECT_EQ(j["total"]["audit_unknown"], 1);
  EXPECT_EQ(j["total"]["precision"], 0.75);
  EXPECT_EQ(j["per_queue"][0]["precision_low"], nullptr);
  EXPECT_EQ(j["per_queue"][1]["queue"], "per,mits");
  EXPECT_EQ(j["per_queue"][1]["precision_high"].get<double>(), WilsonInterval(3, 4)->high);
  const auto files = ProductionCsvFiles(r);
  ASSERT_EQ(files.size(), 2u);
  EXPECT_EQ(files[0].first, "per_queue.csv");
  // The unreviewed queue has empty precision fields; a comma in a name is quoted.
  EXPECT_NE(files[0].second.find("\r\nclaims,10,0,0,0,0,1,0,0,1,0,0,0,,,\r\n"),
            std::string::npos)
      << files[0].second;
  EXPECT_NE(files[0].second.find("\r\n\"per,mits\",40,"), std::string::npos);
  const std::string html = ProductionHtml(r);
  EXPECT_NE(html.find("Of 4 audited decisions for per,mits, 3 were right"), std::string::npos);
}

TEST(DriftReportTest, SentencesNameTheFigureAndItsBaseline) {
  EXPECT_EQ(DriftSentence({"2026-11-30", DriftFigure::kHeldShare, "", 0.41, 0.12}),
            "On 2026-11-30, 41.0% of documents went to review, against 12.0% over the period.");
  EXPECT_EQ(DriftSentence({"2026-11-30", DriftFigure::kQueueShare, "permits", 0.5, 0.25}),
            "On 2026-11-30, 50.0% of documents went to permits, against 25.0% of the documents "
            "the model learned.");
  EXPECT_EQ(DriftSentence({"2026-11-30", DriftFigure::kMeanConfidence, "", 0.714, 0.881}),
            "On 2026-11-30, the mean confidence was 0.71, against 0.88 over the period.");
  EXPECT_EQ(DriftSentence({"2026-11-30", DriftFigure::kUnknownShare, "", 0.18, 0.06}),
            "On 2026-11-30, 18.0% of terms were unknown to the model, against 6.0% over the "
            "period.");
}

TEST(DriftReportTest, JsonlAndCsvCarryEveryDayAndFlag) {
  LoggedDecision a;
  a.time = "2026-11-30T01:00:00Z";
  a.queue = "permits";
  a.confidence = 0.5;
  a.held = "threshold";
  LoggedDecision b = a;
  b.time = "2026-12-01T01:00:00Z";
  b.held = "";
  b.terms = 4;
  b.unknown_terms = 1;
  const std::vector<LoggedDecision> log = {a, b};
  const std::vector<std::pair<std::string, int64_t>> ledger = {{"claims", 1}, {"permits", 1}};
  const DriftReport r = ComputeDrift(log, ledger, DriftOptions{0.3, 1});
  const std::string jsonl = DriftJsonl(r);
  const json first = json::parse(jsonl.substr(0, jsonl.find('\n')));
  EXPECT_EQ(first["unknown_share"], nullptr);  // no terms that day
  EXPECT_EQ(first["unknown_share_baseline"], 0.25);
  EXPECT_EQ(first["queues"][1]["share"], 1.0);
  // permits 1.0 against 0.5 learned; held 1.0 against 0.5.
  EXPECT_EQ(first["changes"].size(), 3u);  // claims 0 vs 0.5 too
  const std::string csv = DriftCsv(r);
  EXPECT_NE(csv.find("2026-11-30,1,held_share,,1,0.5,true\r\n"), std::string::npos) << csv;
  EXPECT_NE(csv.find("2026-11-30,1,unknown_share,,,0.25,false\r\n"), std::string::npos) << csv;
  EXPECT_NE(csv.find("2026-12-01,1,queue_share,claims,0,0.5,true\r\n"), std::string::npos) << csv;
}

}  // namespace
}  // namespace chute
