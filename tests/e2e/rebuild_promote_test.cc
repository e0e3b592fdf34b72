// chute rebuild, candidates and chute promote, end to end: a rebuild gives
// the model a fresh store learned with the new settings would have (route
// output compared number for number), refuses what it cannot do without
// kept text, and the promotion gate lets a better candidate through and
// stops a worse one.
#include <gtest/gtest.h>

#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

using nlohmann::json;

// Words of each queue, and a few every queue uses.
const std::vector<std::string> kBerthWords = {
    "berth",   "pier",  "vessel", "mooring", "arrival", "reserve",
    "nights",  "quay",  "tide",   "pilot",   "anchor",  "slot",
    "captain", "ferry", "dock",   "schedule"};
const std::vector<std::string> kBillingWords = {
    "invoice", "dues",   "payment", "refund",  "fee",     "statement",
    "amount",  "credit", "overdue", "account", "receipt", "tax",
    "balance", "charge", "bank",    "transfer"};
const std::vector<std::string> kShared = {"the",  "harbour", "please",
                                          "2026", "office",  "of"};

// A letter of `words` from a queue's pool (and shared words), the same for
// the same seed (a linear congruential generator, common practice).
std::string Letter(const std::vector<std::string>& pool, unsigned seed,
                   int words = 12) {
  uint32_t x = seed * 2654435761u + 12345u;
  std::string out;
  for (int i = 0; i < words; ++i) {
    x = x * 1664525u + 1013904223u;
    const std::vector<std::string>& from = (x >> 24) % 4 == 0 ? kShared : pool;
    out += (i ? " " : "") + from[(x >> 8) % from.size()];
  }
  return out + ".\n";
}

class RebuildPromoteTest : public ::testing::Test {
 protected:
  RunResult Chute(const std::vector<std::string>& args) {
    return RunChute(args, dir_.path());
  }

  void Ok(const std::vector<std::string>& args) {
    RunResult r = Chute(args);
    ASSERT_EQ(r.exit_code, 0) << r.err << r.out;
  }

  // ROOT/berths and ROOT/billing with n letters each, and an inbox.
  void WriteTree(const std::string& root, int n) {
    for (int i = 0; i < n; ++i) {
      dir_.Write(root + "/berths/b" + std::to_string(i) + ".txt",
                 Letter(kBerthWords, 100 + i));
      dir_.Write(root + "/billing/i" + std::to_string(i) + ".txt",
                 Letter(kBillingWords, 500 + i));
    }
    for (int i = 0; i < 6; ++i) {
      dir_.Write("inbox/berth" + std::to_string(i) + ".txt",
                 Letter(kBerthWords, 900 + i, 8));
      dir_.Write("inbox/bill" + std::to_string(i) + ".txt",
                 Letter(kBillingWords, 950 + i, 8));
    }
  }

  // Each routed document's file and top posteriors, as printed.
  std::vector<std::string> Routes(const std::string& db) {
    RunResult r = Chute(
        {"route", "--db", db, "inbox", "--format", "jsonl", "--top", "5"});
    EXPECT_EQ(r.exit_code, 0) << r.err;
    std::vector<std::string> out;
    for (const std::string& line : Lines(r.out)) {
      json row = json::parse(line);
      out.push_back(row["file"].dump() + row["top"].dump());
    }
    return out;
  }

  std::string Queues(const std::string& db) {
    RunResult r = Chute({"queues", "--db", db, "--format", "jsonl"});
    EXPECT_EQ(r.exit_code, 0) << r.err;
    return r.out;
  }

  // A store made with `settings` that learned `root`.
  void Fresh(const std::string& db, const std::string& root,
             const std::vector<std::string>& settings) {
    std::vector<std::string> args = {"init", "--db", db};
    args.insert(args.end(), settings.begin(), settings.end());
    Ok(args);
    Ok({"learn", "--db", db, "--tree", root});
  }

  TempDir dir_;
};

TEST_F(RebuildPromoteTest,
       SmoothingChangesWithoutKeptTextAndMatchesAFreshStore) {
  WriteTree("lab", 6);
  Fresh("a.db", "lab", {"--keep-text", "off"});
  RunResult r = Chute(
      {"rebuild", "--db", "a.db", "--alpha", "0.25", "--prior", "uniform"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("version"), std::string::npos) << r.out;
  Fresh("b.db", "lab",
        {"--keep-text", "off", "--alpha", "0.25", "--prior", "uniform"});
  EXPECT_EQ(Routes("a.db"), Routes("b.db"));
  Ok({"check", "--db", "a.db"});
}

TEST_F(RebuildPromoteTest, RefusesATokenizingChangeWithoutKeptText) {
  WriteTree("lab", 4);
  Fresh("a.db", "lab", {"--keep-text", "off"});
  const std::vector<std::string> before = Routes("a.db");
  RunResult r = Chute({"rebuild", "--db", "a.db", "--bigrams", "on"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_NE(r.err.find("8 of 8 learned documents have no kept text"),
            std::string::npos)
      << r.err;
  EXPECT_EQ(Lines(r.err).size(), 1u) << r.err;
  EXPECT_EQ(Routes("a.db"), before);
  Ok({"check", "--db", "a.db"});
}

TEST_F(RebuildPromoteTest,
       TokenizingRebuildEqualsAFreshStoreWithTheNewSettings) {
  WriteTree("lab", 8);
  Fresh("a.db", "lab", {});
  const std::vector<std::string> old_routes = Routes("a.db");
  RunResult r =
      Chute({"rebuild", "--db", "a.db", "--bigrams", "on", "--numbers", "fold",
             "--min-length", "2", "--alpha", "0.5", "--threads", "2"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("recounted 16 documents"), std::string::npos) << r.out;
  Fresh("b.db", "lab",
        {"--bigrams", "on", "--numbers", "fold", "--min-length", "2", "--alpha",
         "0.5"});
  EXPECT_EQ(Routes("a.db"), Routes("b.db"));
  EXPECT_NE(Routes("a.db"), old_routes);
  EXPECT_EQ(Queues("a.db"), Queues("b.db"));
  Ok({"check", "--db", "a.db"});
  // Learning goes on with the new settings.
  dir_.Write("more/berths/late.txt", Letter(kBerthWords, 77));
  Ok({"learn", "--db", "a.db", "--tree", "more"});
  Ok({"learn", "--db", "b.db", "--tree", "more"});
  EXPECT_EQ(Routes("a.db"), Routes("b.db"));
  Ok({"check", "--db", "a.db"});
}

TEST_F(RebuildPromoteTest, ACandidateCatchesUpWithLearningBeforeItIsPromoted) {
  WriteTree("lab", 6);
  Fresh("a.db", "lab", {});
  const std::vector<std::string> old_routes = Routes("a.db");
  RunResult r =
      Chute({"rebuild", "--db", "a.db", "--bigrams", "on", "--candidate"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(Routes("a.db"), old_routes);  // the current model did not change
  // Learned after the candidate was made: the promotion recounts it.
  dir_.Write("more/billing/late.txt", Letter(kBillingWords, 78));
  Ok({"learn", "--db", "a.db", "--tree", "more"});
  r = Chute({"promote", "--db", "a.db", "--force"});
  ASSERT_EQ(r.exit_code, 0) << r.err << r.out;
  Fresh("b.db", "lab", {"--bigrams", "on"});
  Ok({"learn", "--db", "b.db", "--tree", "more"});
  EXPECT_EQ(Routes("a.db"), Routes("b.db"));
  Ok({"check", "--db", "a.db"});
  r = Chute({"promote", "--db", "a.db"});
  EXPECT_EQ(r.exit_code, 1);  // the candidate is gone
  EXPECT_NE(r.err.find("no candidate"), std::string::npos) << r.err;
}

TEST_F(RebuildPromoteTest, RefusesSettingsUnderWhichADocumentHasNoTerm) {
  WriteTree("lab", 3);
  Fresh("a.db", "lab", {});
  const std::vector<std::string> before = Routes("a.db");
  RunResult r = Chute(
      {"rebuild", "--db", "a.db", "--min-length", "40", "--max-length", "64"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_NE(r.err.find("would have no term under the new settings"),
            std::string::npos)
      << r.err;
  EXPECT_EQ(Routes("a.db"), before);
  Ok({"check", "--db", "a.db"});
}

TEST_F(RebuildPromoteTest,
       ADocumentForgottenMeanwhileLeavesTheRecountedCandidate) {
  WriteTree("lab", 6);
  Fresh("a.db", "lab", {});
  Ok({"rebuild", "--db", "a.db", "--bigrams", "on", "--numbers", "fold",
      "--candidate"});
  Ok({"forget", "--db", "a.db", "lab/billing/i2.txt"});
  RunResult r = Chute({"promote", "--db", "a.db", "--force"});
  ASSERT_EQ(r.exit_code, 0) << r.err << r.out;
  std::filesystem::remove(dir_.path() + "/lab/billing/i2.txt");
  Fresh("b.db", "lab", {"--bigrams", "on", "--numbers", "fold"});
  EXPECT_EQ(Routes("a.db"), Routes("b.db"));
  EXPECT_EQ(Queues("a.db"), Queues("b.db"));
  Ok({"check", "--db", "a.db"});
}

TEST_F(RebuildPromoteTest, RollbackAndAtVersionReachBackAcrossATokenizingRebuild) {
  WriteTree("lab", 6);
  Fresh("a.db", "lab", {});
  RunResult r = Chute({"versions", "--db", "a.db", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const std::string before = std::to_string(json::parse(Lines(r.out).back())["version"].get<int>());
  const std::vector<std::string> old_routes = Routes("a.db");
  Ok({"rebuild", "--db", "a.db", "--bigrams", "on", "--min-length", "2"});
  ASSERT_NE(Routes("a.db"), old_routes);
  r = Chute({"route", "--db", "a.db", "inbox", "--format", "jsonl", "--top", "5", "--at-version",
             before});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::vector<std::string> at;
  for (const std::string& line : Lines(r.out)) {
    json row = json::parse(line);
    at.push_back(row["file"].dump() + row["top"].dump());
  }
  EXPECT_EQ(at, old_routes);
  r = Chute({"rollback", "--db", "a.db", before});
  ASSERT_EQ(r.exit_code, 0) << r.err << r.out;
  EXPECT_NE(r.out.find("the same as version " + before), std::string::npos) << r.out;
  EXPECT_EQ(Routes("a.db"), old_routes);
  Ok({"check", "--db", "a.db"});
}

// Berth letters learned under billing by mistake; a reviewer's corrections
// go into a candidate.
class GateTest : public RebuildPromoteTest {
 protected:
  void SetUp() override {
    WriteTree("lab", 16);
    for (int i = 0; i < 10; ++i) {
      dir_.Write("wrong/billing/x" + std::to_string(i) + ".txt",
                 Letter(kBerthWords, 300 + i));
    }
    Fresh("a.db", "lab", {});
    Ok({"learn", "--db", "a.db", "--tree", "wrong"});
  }
  void WriteCorrections(const std::string& name,
                        const std::vector<std::string>& lines) {
    std::string csv = "path,queue\n";
    for (const std::string& l : lines) csv += l + "\n";
    dir_.Write(name, csv);
  }
};

TEST_F(GateTest, PromotesACandidateOfGoodCorrections) {
  std::vector<std::string> lines;
  for (int i = 0; i < 10; ++i)
    lines.push_back("wrong/billing/x" + std::to_string(i) + ".txt,berths");
  WriteCorrections("fixes.csv", lines);
  const std::string before = Queues("a.db");
  RunResult r = Chute({"correct", "--db", "a.db", "fixes.csv", "--candidate"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(Queues("a.db"), before);  // only the candidate has them
  r = Chute({"promote", "--db", "a.db", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err << r.out;
  json gate = json::parse(r.out);
  EXPECT_EQ(gate["decision"], "promoted");
  EXPECT_EQ(gate["held_out"], 5);  // half of its own corrections at most
  EXPECT_EQ(gate["held_out_from"], "corrections");
  EXPECT_GE(gate["candidate_figures"]["macro_f1"].get<double>(),
            gate["current"]["macro_f1"].get<double>() - 0.01);
  // The model now has the corrections, as a store that learned them so.
  for (int i = 0; i < 10; ++i) {
    dir_.Write("right/berths/x" + std::to_string(i) + ".txt",
               Letter(kBerthWords, 300 + i));
  }
  Fresh("b.db", "lab", {});
  Ok({"learn", "--db", "b.db", "--tree", "right"});
  EXPECT_EQ(Routes("a.db"), Routes("b.db"));
  Ok({"check", "--db", "a.db"});
}

TEST_F(GateTest, RefusesACandidateThatLowersARecallAndForceOverrides) {
  // Twelve genuine berth letters moved to billing (bad), then the newest
  // five corrections put five mislearned letters right: those five are held
  // out, and the candidate, which lost most berth letters, misses them.
  std::vector<std::string> lines;
  for (int i = 0; i < 12; ++i)
    lines.push_back("lab/berths/b" + std::to_string(i) + ".txt,billing");
  for (int i = 0; i < 5; ++i)
    lines.push_back("wrong/billing/x" + std::to_string(i) + ".txt,berths");
  WriteCorrections("fixes.csv", lines);
  Ok({"correct", "--db", "a.db", "fixes.csv", "--candidate"});
  const std::vector<std::string> before = Routes("a.db");
  RunResult r = Chute({"promote", "--db", "a.db", "--hold-out", "5"});
  EXPECT_EQ(r.exit_code, 4) << r.err << r.out;
  EXPECT_NE(r.out.find("blocks"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("not promoted"), std::string::npos) << r.out;
  EXPECT_EQ(Routes("a.db"), before);
  // The refused figures stay with the candidate.
  r = Chute({"promote", "--db", "a.db", "--show"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("\"decision\":\"refused\""), std::string::npos) << r.out;
  r = Chute({"promote", "--db", "a.db", "--hold-out", "5", "--force",
             "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err << r.out;
  json gate = json::parse(r.out);
  EXPECT_EQ(gate["decision"], "forced");
  EXPECT_NE(gate["blocked_by"].size(), 0u);
  EXPECT_NE(Routes("a.db"), before);
  Ok({"check", "--db", "a.db"});
}

}  // namespace
}  // namespace chute::testing
