// End-to-end tests of `chute terms`: the built binary on a small store.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>
#include <set>
#include <string>
#include <vector>

#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

using nlohmann::json;

class TermsTest : public ::testing::Test {
 protected:
  RunResult Chute(std::vector<std::string> args) { return RunChute(args, dir_.path()); }
  RunResult Terms(std::vector<std::string> extra) {
    std::vector<std::string> args = {"terms", "--db", "s.db"};
    args.insert(args.end(), extra.begin(), extra.end());
    return Chute(args);
  }
  // Occurrences per queue:
  //   claims (2 documents, 13 terms): damage 5, hull 5, the 3
  //   berths (2 documents, 11 terms): berth 5, the 4, hull 1, mooring 1
  //   fees   (2 documents,  9 terms): invoice 5, the 2, damage 1, fee 1
  void LearnSmallStore() {
    ASSERT_EQ(Chute({"init", "--db", "s.db"}).exit_code, 0);
    dir_.Write("l/claims/1.txt", "damage damage hull hull hull the the");
    dir_.Write("l/claims/2.txt", "damage damage damage hull hull the");
    dir_.Write("l/berths/1.txt", "berth berth berth the the the hull");
    dir_.Write("l/berths/2.txt", "berth berth mooring the");
    dir_.Write("l/fees/1.txt", "invoice invoice invoice the damage");
    dir_.Write("l/fees/2.txt", "invoice invoice fee the");
    RunResult learn = Chute({"learn", "--db", "s.db", "--tree", "l"});
    ASSERT_EQ(learn.exit_code, 0) << learn.err;
  }
  static std::vector<json> Records(const std::string& out) {
    std::vector<json> r;
    for (const std::string& line : Lines(out)) r.push_back(json::parse(line));
    return r;
  }
  static std::set<std::string> Keys(const json& j) {
    std::set<std::string> k;
    for (auto it = j.begin(); it != j.end(); ++it) k.insert(it.key());
    return k;
  }
  static bool OneLine(const std::string& s) { return !s.empty() && s.find('\n') == s.size() - 1; }
  TempDir dir_;
};

TEST_F(TermsTest, LogOddsJsonlHasExactlyTheDocumentedFields) {
  LearnSmallStore();
  RunResult r = Terms({"--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(r.err, "");
  std::vector<json> recs = Records(r.out);
  ASSERT_EQ(recs.size(), 4u);  // damage, hull; berth; invoice (count >= 5)
  const std::set<std::string> fields = {"queue",    "term",     "count", "rate_in",
                                        "rate_out", "log_odds", "z"};
  for (const json& j : recs) EXPECT_EQ(Keys(j), fields) << j;
  // Queues by name, then best first.
  EXPECT_EQ(recs[0]["queue"], "berths");
  EXPECT_EQ(recs[0]["term"], "berth");
  EXPECT_EQ(recs[1]["queue"], "claims");
  EXPECT_EQ(recs[2]["queue"], "claims");
  EXPECT_GE(recs[1]["z"].get<double>(), recs[2]["z"].get<double>());
  EXPECT_EQ(recs[3]["queue"], "fees");
  EXPECT_EQ(recs[3]["term"], "invoice");
  // hull: 5 of the 13 terms of claims, 1 of the 20 elsewhere.
  for (const json& j : recs) {
    EXPECT_GT(j["z"].get<double>(), 0);
    EXPECT_GT(j["log_odds"].get<double>(), 0);
    if (j["term"] == "hull") {
      EXPECT_EQ(j["count"], 5);
      EXPECT_DOUBLE_EQ(j["rate_in"].get<double>(), 10000.0 * 5 / 13);
      EXPECT_DOUBLE_EQ(j["rate_out"].get<double>(), 10000.0 * 1 / 20);
    }
  }
}

TEST_F(TermsTest, ChiSquareAndMutualInformationHaveAScoreField) {
  LearnSmallStore();
  const std::set<std::string> fields = {"queue", "term", "count", "rate_in", "rate_out", "score"};
  for (const char* method : {"chi2", "mi"}) {
    SCOPED_TRACE(method);
    RunResult r = Terms({"--format", "jsonl", "--method", method, "--min-count", "1"});
    ASSERT_EQ(r.exit_code, 0) << r.err;
    std::vector<json> recs = Records(r.out);
    ASSERT_FALSE(recs.empty());
    for (const json& j : recs) {
      EXPECT_EQ(Keys(j), fields) << j;
      EXPECT_GT(j["score"].get<double>(), 0);
      // "the" is in every document: tied to no queue.
      EXPECT_NE(j["term"], "the");
    }
  }
}

TEST_F(TermsTest, CsvHeadersNameTheJsonFields) {
  LearnSmallStore();
  RunResult lo = Terms({"--format", "csv"});
  ASSERT_EQ(lo.exit_code, 0) << lo.err;
  auto lines = Lines(lo.out);
  ASSERT_EQ(lines.size(), 5u);
  EXPECT_EQ(lines[0], "queue,term,count,rate_in,rate_out,log_odds,z");
  EXPECT_EQ(lines[1].rfind("berths,berth,5,", 0), 0u) << lines[1];
  RunResult mi = Terms({"--format", "csv", "--method", "mi"});
  ASSERT_EQ(mi.exit_code, 0) << mi.err;
  EXPECT_EQ(Lines(mi.out).at(0), "queue,term,count,rate_in,rate_out,score");
}

// The occurrences of chi2 and mi are summed from the ledger, those of
// log-odds read from the store's counts: the two must agree.
TEST_F(TermsTest, LedgerAndStoreCountsAgree) {
  LearnSmallStore();
  RunResult lo = Terms({"--format", "jsonl", "--min-count", "1", "--top", "100"});
  RunResult chi =
      Terms({"--format", "jsonl", "--min-count", "1", "--top", "100", "--method", "chi2"});
  ASSERT_EQ(lo.exit_code, 0);
  ASSERT_EQ(chi.exit_code, 0);
  int matched = 0;
  for (const json& a : Records(lo.out)) {
    for (const json& b : Records(chi.out)) {
      if (a["queue"] == b["queue"] && a["term"] == b["term"]) {
        ++matched;
        EXPECT_EQ(a["count"], b["count"]);
        EXPECT_EQ(a["rate_in"], b["rate_in"]);
        EXPECT_EQ(a["rate_out"], b["rate_out"]);
      }
    }
  }
  EXPECT_GE(matched, 4);
}

TEST_F(TermsTest, QueueOptionListsOnlyThatQueue) {
  LearnSmallStore();
  RunResult r = Terms({"--format", "jsonl", "--queue", "claims", "--min-count", "1"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::vector<json> recs = Records(r.out);
  ASSERT_EQ(recs.size(), 2u);  // damage and hull; "the" is rarer here than elsewhere
  for (const json& j : recs) EXPECT_EQ(j["queue"], "claims");
}

TEST_F(TermsTest, MinCountLeavesOutRarerTermsAndTopCutsTheList) {
  LearnSmallStore();
  RunResult r = Terms({"--format", "jsonl", "--min-count", "1", "--top", "100"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::set<std::string> terms;
  for (const json& j : Records(r.out))
    terms.insert(j["queue"].get<std::string>() + "/" + j["term"].get<std::string>());
  EXPECT_TRUE(terms.count("berths/mooring")) << "count 1 is listed with --min-count 1";
  EXPECT_TRUE(terms.count("fees/fee"));
  RunResult five = Terms({"--format", "jsonl", "--min-count", "5"});
  for (const json& j : Records(five.out)) EXPECT_GE(j["count"].get<int>(), 5);
  RunResult six = Terms({"--format", "jsonl", "--min-count", "6"});
  EXPECT_EQ(six.exit_code, 0);
  EXPECT_EQ(six.out, "");
  RunResult top1 = Terms({"--format", "jsonl", "--top", "1", "--queue", "claims"});
  EXPECT_EQ(Records(top1.out).size(), 1u);
}

TEST_F(TermsTest, TableExplainsTheNumbersInPlainWords) {
  LearnSmallStore();
  RunResult r = Terms({"--min-count", "6"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("How to read:"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("claims: 2 documents, 13 terms"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("(no term is seen at least 6 times here"), std::string::npos);
  RunResult lo = Terms({"--queue", "claims"});
  EXPECT_NE(lo.out.find("per 10,000 here"), std::string::npos) << lo.out;
  EXPECT_NE(lo.out.find("hull"), std::string::npos) << lo.out;
  RunResult chi = Terms({"--queue", "claims", "--method", "chi2"});
  EXPECT_NE(chi.out.find("chi-square"), std::string::npos) << chi.out;
  EXPECT_NE(chi.out.find("2 of 2"), std::string::npos) << chi.out;  // damage: both claims
}

TEST_F(TermsTest, UnknownQueueIsAOneLineErrorAndExit1) {
  LearnSmallStore();
  RunResult r = Terms({"--queue", "claimz"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_EQ(r.out, "");
  EXPECT_TRUE(OneLine(r.err)) << r.err;
  EXPECT_NE(r.err.find("no queue named 'claimz'"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("berths, claims, fees"), std::string::npos) << r.err;
}

TEST_F(TermsTest, EmptyStoreShowsNothingAndSaysWhy) {
  ASSERT_EQ(Chute({"init", "--db", "s.db"}).exit_code, 0);
  for (const char* method : {"log-odds", "chi2", "mi"}) {
    SCOPED_TRACE(method);
    RunResult r = Terms({"--format", "jsonl", "--method", method});
    EXPECT_EQ(r.exit_code, 0);
    EXPECT_EQ(r.out, "");
    EXPECT_TRUE(OneLine(r.err)) << r.err;
    EXPECT_NE(r.err.find("fewer than two queues have learned documents"), std::string::npos);
  }
  RunResult csv = Terms({"--format", "csv"});
  EXPECT_EQ(csv.exit_code, 0);
  EXPECT_EQ(Lines(csv.out),
            std::vector<std::string>{"queue,term,count,rate_in,rate_out,log_odds,z"});
  EXPECT_EQ(Terms({"--queue", "claims"}).exit_code, 1);
}

TEST_F(TermsTest, OneQueueHasNothingToCompareWith) {
  ASSERT_EQ(Chute({"init", "--db", "s.db"}).exit_code, 0);
  dir_.Write("l/only/1.txt", "alpha alpha alpha alpha alpha beta");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  RunResult r = Terms({"--format", "jsonl", "--queue", "only", "--min-count", "1"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_EQ(r.out, "");
  EXPECT_NE(r.err.find("fewer than two queues"), std::string::npos) << r.err;
}

TEST_F(TermsTest, BadOptionValuesAreUsageErrors) {
  LearnSmallStore();
  for (std::vector<std::string> bad :
       std::vector<std::vector<std::string>>{{"--top", "0"},
                                             {"--min-count", "0"},
                                             {"--min-count", "x"},
                                             {"--method", "pmi"},
                                             {"--prior-strength", "0"},
                                             {"--prior-strength", "inf"},
                                             {"--format", "xml"}}) {
    RunResult r = Terms(bad);
    EXPECT_EQ(r.exit_code, 2) << bad[0] << " " << bad[1];
    EXPECT_EQ(r.out, "");
  }
}

TEST_F(TermsTest, MissingStoreFails) {
  RunResult r = Terms({});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_TRUE(OneLine(r.err)) << r.err;
}

TEST_F(TermsTest, PriorStrengthChangesTheLogOddsButNotTheCounts) {
  LearnSmallStore();
  RunResult weak = Terms({"--format", "jsonl", "--queue", "claims", "--prior-strength", "1"});
  RunResult strong = Terms({"--format", "jsonl", "--queue", "claims", "--prior-strength", "5000"});
  ASSERT_EQ(weak.exit_code, 0);
  ASSERT_EQ(strong.exit_code, 0);
  json w = Records(weak.out).at(0), s = Records(strong.out).at(0);
  EXPECT_EQ(w["count"], s["count"]);
  // A stronger prior pulls the estimate towards the overall rate.
  EXPECT_GT(w["log_odds"].get<double>(), s["log_odds"].get<double>());
}

}  // namespace
}  // namespace chute::testing
