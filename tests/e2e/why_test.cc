// End-to-end tests of `chute why`: the built binary, in temporary folders.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <nlohmann/json.hpp>
#include <set>

#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

using nlohmann::json;

class WhyTest : public ::testing::Test {
 protected:
  RunResult Chute(std::vector<std::string> args, const std::string& input = "") {
    return RunChute(args, dir_.path(), input);
  }
  void InitStore() {
    RunResult r = Chute({"init", "--db", "s.db"});
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  // Manning, Raghavan & Schütze, Introduction to Information Retrieval
  // (2008), ch. 13, Example 13.1 (Table 13.1), as files: documents 1-3 in
  // China, document 4 not, test document d5.
  void LearnExample131() {
    InitStore();
    dir_.Write("l/china/1.txt", "Chinese Beijing Chinese");
    dir_.Write("l/china/2.txt", "Chinese Chinese Shanghai");
    dir_.Write("l/china/3.txt", "Chinese Macao");
    dir_.Write("l/not-china/4.txt", "Tokyo Japan Chinese");
    dir_.Write("d5.txt", "Chinese Chinese Chinese Tokyo Japan");
    RunResult r = Chute({"learn", "--db", "s.db", "--tree", "l"});
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  std::vector<json> JsonLines(const RunResult& r) {
    std::vector<json> out;
    for (const std::string& line : Lines(r.out)) out.push_back(json::parse(line));
    return out;
  }
  TempDir dir_;
};

// Σ contributions + prior share, in long double.
double SharesSum(const json& j) {
  long double sum = j["prior_share"].get<double>();
  for (const json& t : j["terms"]) sum += t["contribution"].get<double>();
  return static_cast<double>(sum);
}

bool WithinBound(double got, double gap) {
  return std::fabs(got - gap) <= 1e-9 * std::max(1.0, std::fabs(gap));
}

// Manning, Raghavan & Schütze (2008), ch. 13, Example 13.1, checked by hand
// through the built binary: for d5, chosen China against not-China, the
// prior share is log(3/4) − log(1/4) = log 3; Chinese contributes
// 3·(log(3/7) − log(2/9)); Tokyo and Japan each log(1/14) − log(2/9); all of
// it sums to log((81/268912) / (8/59049)), the log ratio of the book's two
// unnormalised scores.
TEST_F(WhyTest, Example131ThroughTheBinary) {
  LearnExample131();
  RunResult r = Chute({"why", "--db", "s.db", "d5.txt", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::vector<json> lines = JsonLines(r);
  ASSERT_EQ(lines.size(), 1u);
  const json& j = lines[0];
  std::set<std::string> keys;
  for (const auto& [k, v] : j.items()) keys.insert(k);
  EXPECT_EQ(keys, (std::set<std::string>{"file", "queue", "runner_up", "score_gap", "prior_share",
                                         "posteriors", "terms", "ignored"}));
  EXPECT_EQ(j["file"], "d5.txt");
  EXPECT_EQ(j["queue"], "china");
  EXPECT_EQ(j["runner_up"], "not-china");
  EXPECT_NEAR(j["prior_share"].get<double>(), std::log(3.0), 1e-15);
  ASSERT_EQ(j["terms"].size(), 3u);
  EXPECT_EQ(j["terms"][0]["term"], "chinese");
  EXPECT_EQ(j["terms"][0]["count"], 3);
  EXPECT_NEAR(j["terms"][0]["contribution"].get<double>(),
              3.0 * (std::log(3.0 / 7.0) - std::log(2.0 / 9.0)), 1e-14);
  EXPECT_EQ(j["terms"][1]["term"], "japan");
  EXPECT_EQ(j["terms"][2]["term"], "tokyo");
  for (int i : {1, 2}) {
    EXPECT_EQ(j["terms"][i]["count"], 1);
    EXPECT_NEAR(j["terms"][i]["contribution"].get<double>(),
                std::log(1.0 / 14.0) - std::log(2.0 / 9.0), 1e-15);
  }
  const double by_hand = std::log((81.0 / 268912.0) / (8.0 / 59049.0));
  EXPECT_NEAR(SharesSum(j), by_hand, 1e-14);
  EXPECT_NEAR(j["score_gap"].get<double>(), by_hand, 1e-14);
  EXPECT_TRUE(j["ignored"].empty());
  ASSERT_EQ(j["posteriors"].size(), 2u);
  const double c = 81.0 / 268912.0, n = 8.0 / 59049.0;
  EXPECT_EQ(j["posteriors"][0]["queue"], "china");
  EXPECT_NEAR(j["posteriors"][0]["posterior"].get<double>(), c / (c + n), 1e-14);
  EXPECT_EQ(j["posteriors"][1]["queue"], "not-china");
  EXPECT_NEAR(j["posteriors"][1]["posterior"].get<double>(), n / (c + n), 1e-14);
}

TEST_F(WhyTest, TopLimitsEachSide) {
  LearnExample131();
  RunResult r = Chute({"why", "--db", "s.db", "d5.txt", "--format", "jsonl", "--top", "1"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  json j = json::parse(Lines(r.out).at(0));
  // One towards China, then one towards not-China (japan before tokyo: their
  // pulls are equal, so by term).
  ASSERT_EQ(j["terms"].size(), 2u);
  EXPECT_EQ(j["terms"][0]["term"], "chinese");
  EXPECT_GT(j["terms"][0]["contribution"].get<double>(), 0);
  EXPECT_EQ(j["terms"][1]["term"], "japan");
  EXPECT_LT(j["terms"][1]["contribution"].get<double>(), 0);
  EXPECT_EQ(Chute({"why", "--db", "s.db", "d5.txt", "--top", "0"}).exit_code, 2);
}

TEST_F(WhyTest, ExplainsSeveralFilesAndStandardInputInOrder) {
  LearnExample131();
  dir_.Write("in/b.txt", "Tokyo Japan");
  dir_.Write("in/a.txt", "Beijing Macao");
  RunResult r =
      Chute({"why", "--db", "s.db", "d5.txt", "in", "-", "--format", "jsonl"}, "Shanghai Tokyo");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::vector<json> lines = JsonLines(r);
  ASSERT_EQ(lines.size(), 4u);
  EXPECT_EQ(lines[0]["file"], "d5.txt");
  EXPECT_EQ(lines[1]["file"], "in/a.txt");
  EXPECT_EQ(lines[2]["file"], "in/b.txt");
  EXPECT_EQ(lines[3]["file"], "-");
  EXPECT_EQ(lines[1]["queue"], "china");
  EXPECT_EQ(lines[2]["queue"], "not-china");
  // Standard input: Shanghai pulls towards China, Tokyo towards not-China.
  ASSERT_EQ(lines[3]["terms"].size(), 2u);
  EXPECT_EQ(lines[3]["terms"][0]["term"], "shanghai");
  EXPECT_EQ(lines[3]["terms"][1]["term"], "tokyo");
  for (const json& j : lines) EXPECT_TRUE(WithinBound(SharesSum(j), j["score_gap"]));
}

TEST_F(WhyTest, UnknownTermsAreListedAsIgnoredWithTheirCounts) {
  LearnExample131();
  dir_.Write("d6.txt", "Chinese Osaka Kyoto Osaka Tokyo");
  RunResult r = Chute({"why", "--db", "s.db", "d6.txt", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  json j = json::parse(Lines(r.out).at(0));
  EXPECT_EQ(j["ignored"], json::parse(R"([{"term":"osaka","count":2},{"term":"kyoto","count":1}])"));
  for (const json& t : j["terms"]) EXPECT_NE(t["term"], "osaka");
  EXPECT_TRUE(WithinBound(SharesSum(j), j["score_gap"]));
}

TEST_F(WhyTest, NoKnownTermsLeavesThePriorAlone) {
  LearnExample131();
  RunResult r = Chute({"why", "--db", "s.db", "-", "--format", "jsonl"}, "Osaka, 2026.");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  json j = json::parse(Lines(r.out).at(0));
  EXPECT_EQ(j["queue"], "china");
  EXPECT_TRUE(j["terms"].empty());
  EXPECT_EQ(j["ignored"].size(), 2u);
  EXPECT_EQ(j["score_gap"], j["prior_share"]);
  RunResult table = Chute({"why", "--db", "s.db", "-"}, "Osaka, 2026.");
  EXPECT_NE(table.out.find("No term of this document is known to the model"), std::string::npos)
      << table.out;
}

TEST_F(WhyTest, BadFilesAreReportedAndTheRestExplained) {
  LearnExample131();
  RunResult r = Chute({"why", "--db", "s.db", "missing.txt", "d5.txt", "--format", "jsonl"});
  EXPECT_EQ(r.exit_code, 3);
  EXPECT_EQ(Lines(r.out).size(), 1u);
  EXPECT_EQ(r.err.rfind("chute why: missing.txt: ", 0), 0u) << r.err;
  EXPECT_EQ(Lines(r.err).size(), 1u);
  dir_.Write("binary.bin", std::string("a\0b", 3));
  RunResult all_bad = Chute({"why", "--db", "s.db", "missing.txt", "binary.bin"});
  EXPECT_EQ(all_bad.exit_code, 1);
  EXPECT_TRUE(all_bad.out.empty());
  EXPECT_EQ(Lines(all_bad.err).size(), 2u);
  EXPECT_EQ(Chute({"why", "--db", "s.db"}).exit_code, 2);
  EXPECT_EQ(Chute({"why", "--db", "s.db", "d5.txt", "--format", "yaml"}).exit_code, 2);
}

TEST_F(WhyTest, StoreWithoutDocumentsIsAFailure) {
  InitStore();
  dir_.Write("d.txt", "text");
  RunResult r = Chute({"why", "--db", "s.db", "d.txt"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_NE(r.err.find("learned no documents"), std::string::npos) << r.err;
  EXPECT_EQ(Chute({"why", "--db", "absent.db", "d.txt"}).exit_code, 1);
}

TEST_F(WhyTest, SingleQueueHasNoRunnerUp) {
  InitStore();
  dir_.Write("l/only/1.txt", "harbour dues");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  RunResult r = Chute({"why", "--db", "s.db", "-", "--format", "jsonl"}, "harbour crane");
  ASSERT_EQ(r.exit_code, 0) << r.err;
  json j = json::parse(Lines(r.out).at(0));
  EXPECT_EQ(j["queue"], "only");
  EXPECT_TRUE(j["runner_up"].is_null());
  EXPECT_TRUE(j["score_gap"].is_null());
  EXPECT_TRUE(j["prior_share"].is_null());
  EXPECT_TRUE(j["terms"].empty());
  EXPECT_EQ(j["ignored"], json::parse(R"([{"term":"crane","count":1}])"));
  EXPECT_EQ(j["posteriors"][0]["posterior"], 1.0);
  RunResult table = Chute({"why", "--db", "s.db", "-"}, "harbour crane");
  EXPECT_NE(table.out.find("only queue the model can route to"), std::string::npos) << table.out;
  RunResult csv = Chute({"why", "--db", "s.db", "-", "--format", "csv"}, "harbour crane");
  EXPECT_EQ(Lines(csv.out), (std::vector<std::string>{
                                "file,queue,runner_up,kind,term,count,contribution",
                                "-,only,,prior,,,", "-,only,,ignored,crane,1,"}));
}

TEST_F(WhyTest, CsvHasTheDocumentedHeaderAndOneRowPerTerm) {
  LearnExample131();
  dir_.Write("d6.txt", "Chinese Chinese Chinese Tokyo Japan Osaka");
  RunResult r = Chute({"why", "--db", "s.db", "d6.txt", "--format", "csv"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::vector<std::string> lines = Lines(r.out);
  ASSERT_EQ(lines.size(), 6u);
  EXPECT_EQ(lines[0], "file,queue,runner_up,kind,term,count,contribution");
  EXPECT_EQ(lines[1].rfind("d6.txt,china,not-china,toward_queue,chinese,3,1.97", 0), 0u);
  EXPECT_EQ(lines[2].rfind("d6.txt,china,not-china,toward_runner_up,japan,1,-1.13", 0), 0u);
  EXPECT_EQ(lines[3].rfind("d6.txt,china,not-china,toward_runner_up,tokyo,1,-1.13", 0), 0u);
  EXPECT_EQ(lines[4].rfind("d6.txt,china,not-china,prior,,,1.09", 0), 0u);
  EXPECT_EQ(lines[5], "d6.txt,china,not-china,ignored,osaka,1,");
  // The contribution column (terms and prior) sums to the score gap.
  long double sum = 0;
  for (size_t i = 1; i <= 4; ++i) sum += std::stod(lines[i].substr(lines[i].rfind(',') + 1));
  EXPECT_NEAR(static_cast<double>(sum), std::log((81.0 / 268912.0) / (8.0 / 59049.0)), 1e-14);
}

TEST_F(WhyTest, TableExplainsInPlainWords) {
  LearnExample131();
  dir_.Write("d6.txt", "Chinese Chinese Chinese Tokyo Japan Osaka");
  RunResult r = Chute({"why", "--db", "s.db", "d6.txt"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  // The text with line breaks and runs of spaces made single spaces, so that
  // wrapping and column widths do not matter.
  std::string flat;
  for (char c : r.out) {
    if (c == '\n') c = ' ';
    if (c != ' ' || flat.empty() || flat.back() != ' ') flat += c;
  }
  for (const char* part :
       {"== d6.txt", "Routed to china, with confidence 0.690", "queue posterior china 0.690",
        "not-china 0.310", "Terms that pulled most towards china: term count pull chinese 3 +1.970",
        "Terms that pulled most towards not-china, the runner-up: term count pull japan 1 -1.135 "
        "tokyo 1 -1.135",
        "The prior (how common each queue is) pulled +1.099 towards china.",
        "Ignored, never learned by the model (1 term, 1 time): osaka.",
        "Pulls are in log-odds units (natural logarithm). The pulls of all 3 different known "
        "terms plus the prior's share add up to the score gap of 0.799 between china and "
        "not-china: for this document the model finds china 2.22 times as likely as not-china."}) {
    EXPECT_NE(flat.find(part), std::string::npos) << part << "\n" << r.out;
  }
}

// On the demo scenario (corpora/port-authority, 476 labelled documents in 8
// queues), every inbox document's shares, with --top large enough to list
// every known term, sum to the score gap; the posteriors are those `route`
// prints, and the gap agrees with route's log posteriors.
TEST_F(WhyTest, SharesSumToTheGapOnTheDemoInbox) {
  InitStore();
  const std::string corpus = std::string(CHUTE_SOURCE_DIR) + "/corpora/port-authority";
  RunResult learn = Chute({"learn", "--db", "s.db", "--tree", corpus + "/labelled"});
  ASSERT_EQ(learn.exit_code, 0) << learn.err;
  RunResult why = Chute(
      {"why", "--db", "s.db", corpus + "/inbox", "--format", "jsonl", "--top", "1000000"});
  ASSERT_EQ(why.exit_code, 0) << why.err;
  RunResult route =
      Chute({"route", "--db", "s.db", corpus + "/inbox", "--format", "jsonl", "--top", "100"});
  ASSERT_EQ(route.exit_code, 0) << route.err;
  std::vector<json> explained = JsonLines(why), routed = JsonLines(route);
  ASSERT_EQ(explained.size(), 96u);
  ASSERT_EQ(routed.size(), explained.size());
  size_t with_ignored = 0;
  for (size_t i = 0; i < explained.size(); ++i) {
    const json& e = explained[i];
    const json& r = routed[i];
    ASSERT_EQ(e["file"], r["file"]);
    EXPECT_EQ(e["queue"], r["queue"]);
    EXPECT_EQ(e["runner_up"], r["top"][1]["queue"]);
    ASSERT_EQ(e["posteriors"].size(), 8u);
    for (size_t q = 0; q < 8; ++q) {
      EXPECT_EQ(e["posteriors"][q]["queue"], r["top"][q]["queue"]);
      EXPECT_EQ(e["posteriors"][q]["posterior"], r["top"][q]["posterior"]);
    }
    const double gap = e["score_gap"].get<double>();
    EXPECT_TRUE(WithinBound(SharesSum(e), gap)) << e["file"] << ": " << SharesSum(e) << " vs "
                                                << gap;
    const double route_gap =
        r["top"][0]["log_posterior"].get<double>() - r["top"][1]["log_posterior"].get<double>();
    EXPECT_TRUE(WithinBound(route_gap, gap)) << e["file"];
    // Positive pulls first, largest first; then negative, most negative first.
    const json& terms = e["terms"];
    for (size_t t = 1; t < terms.size(); ++t) {
      const double a = terms[t - 1]["contribution"], b = terms[t]["contribution"];
      if (a > 0 && b > 0) {
        EXPECT_GE(a, b);
      }
      if (a < 0 && b < 0) {
        EXPECT_LE(a, b);
      }
      EXPECT_FALSE(a < 0 && b > 0);
    }
    with_ignored += e["ignored"].empty() ? 0 : 1;
  }
  EXPECT_GT(with_ignored, 0u);  // the inbox has words the labelled set lacks
}

}  // namespace
}  // namespace chute::testing
