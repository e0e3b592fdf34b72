// The folder workflow end to end with route --into: route an inbox into
// folders with an audit sample, move files as reviewers would, learn the
// moves with correct --from-folders, then read the production figures and
// the drift report.
#include <gtest/gtest.h>

#include <filesystem>
#include <map>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

namespace fs = std::filesystem;
using nlohmann::json;

class ReviewRouteTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_.Write("learn/permits/p1.txt", "building permit for a garage extension");
    dir_.Write("learn/permits/p2.txt", "permit to build a porch and a fence");
    dir_.Write("learn/permits/p3.txt", "planning permit application for a shed");
    dir_.Write("learn/claims/c1.txt", "insurance claim for storm damage to the roof");
    dir_.Write("learn/claims/c2.txt", "claim for water damage in the kitchen");
    dir_.Write("learn/claims/c3.txt", "hail damage claim for a car");
    ASSERT_EQ(Chute({"init", "--db", "s.db"}).exit_code, 0);
    RunResult learned = Chute({"learn", "--db", "s.db", "--tree", "learn"});
    ASSERT_EQ(learned.exit_code, 0) << learned.err;
  }

  RunResult Chute(std::vector<std::string> args) { return RunChute(args, dir_.path()); }

  // Routes inbox/ into routed/ and returns each decision by file name.
  std::map<std::string, json> RouteInbox(const std::string& audit_share) {
    RunResult r = Chute({"route", "--db", "s.db", "inbox", "--into", "routed", "--move",
                         "--audit-share", audit_share, "--audit-seed", "7", "--format", "jsonl",
                         "--by", "test"});
    EXPECT_EQ(r.exit_code, 0) << r.err;
    std::map<std::string, json> out;
    for (const std::string& line : Lines(r.out)) {
      const json d = json::parse(line);
      out[fs::path(d["source"].get<std::string>()).filename().string()] = d;
    }
    return out;
  }

  // Moves a routed document (its destination) into DEST/<folder>/.
  void MoveInto(const json& decision, const std::string& folder) {
    const fs::path from = decision["destination"].get<std::string>();
    fs::create_directories(dir_.path() + "/routed/" + folder);
    fs::rename(from, dir_.path() + "/routed/" + folder + "/" + from.filename().string());
  }

  TempDir dir_;
};

TEST_F(ReviewRouteTest, AuditSampleReviewedByMovingFilesGivesPrecision) {
  dir_.Write("inbox/a.txt", "permit for a garage and a porch");
  dir_.Write("inbox/b.txt", "storm damage claim for the roof");
  dir_.Write("inbox/c.txt", "permit application for a fence");
  dir_.Write("inbox/d.txt", "water damage claim, kitchen");
  // An audit share of 1: every document that would be routed automatically
  // goes to review as audit.
  std::map<std::string, json> d = RouteInbox("1");
  ASSERT_EQ(d.size(), 4u);
  for (const auto& [name, decision] : d) {
    ASSERT_EQ(decision["held"], "audit") << name;
    ASSERT_NE(decision["destination"].get<std::string>().find("/_review/"), std::string::npos);
  }
  // Reviewers: a and b into the queue chute chose; c into the other queue;
  // d stays in review.
  MoveInto(d["a.txt"], d["a.txt"]["queue"]);
  MoveInto(d["b.txt"], d["b.txt"]["queue"]);
  const std::string other = d["c.txt"]["queue"] == "permits" ? "claims" : "permits";
  MoveInto(d["c.txt"], other);

  RunResult c = Chute({"correct", "--db", "s.db", "--from-folders", "routed", "--format", "jsonl"});
  ASSERT_EQ(c.exit_code, 0) << c.err;
  const json total = json::parse(Lines(c.out).back());
  EXPECT_EQ(total, json::parse(R"({"queue":null,"corrected":1,"confirmed":2,"skipped":1})"));

  RunResult e = Chute({"evaluate", "--db", "s.db", "--from-log", "--json", "p.json"});
  ASSERT_EQ(e.exit_code, 0) << e.err;
  const json p = json::parse(ReadBytes(dir_.path() + "/p.json"));
  EXPECT_EQ(p["total"]["decisions"], 4);
  EXPECT_EQ(p["total"]["audit_drawn"], 4);
  EXPECT_EQ(p["total"]["audit_reviewed"], 3);
  EXPECT_EQ(p["total"]["audit_correct"], 2);
  EXPECT_EQ(p["total"]["audit_unknown"], 1);
  EXPECT_DOUBLE_EQ(p["total"]["precision"].get<double>(), 2.0 / 3.0);

  // The moves were learned: c is now a document of the other queue.
  RunResult again = Chute({"correct", "--db", "s.db", "--from-folders", "routed", "--format",
                           "jsonl"});
  EXPECT_EQ(json::parse(Lines(again.out).back()),
            json::parse(R"({"queue":null,"corrected":0,"confirmed":0,"skipped":1})"));
}

TEST_F(ReviewRouteTest, ConfirmAfterAndDriftOnRoutedDocuments) {
  dir_.Write("inbox/a.txt", "permit for a garage and a porch");
  dir_.Write("inbox/b.txt", "storm damage claim for the roof");
  dir_.Write("inbox/c.txt", "hail damage claim for the car");
  std::map<std::string, json> d = RouteInbox("0");
  ASSERT_EQ(d.size(), 3u);
  for (const auto& [name, decision] : d) ASSERT_TRUE(decision["held"].is_null()) << name;
  const std::string other = d["c.txt"]["queue"] == "permits" ? "claims" : "permits";
  MoveInto(d["c.txt"], other);
  // 0m: every decision is old enough; a and b are confirmed, c corrected.
  RunResult c = Chute({"correct", "--db", "s.db", "--from-folders", "routed", "--confirm-after",
                       "0m", "--format", "jsonl"});
  ASSERT_EQ(c.exit_code, 0) << c.err;
  EXPECT_EQ(json::parse(Lines(c.out).back()),
            json::parse(R"({"queue":null,"corrected":1,"confirmed":2,"skipped":0})"));

  RunResult drift = Chute({"drift", "--db", "s.db", "--since", "1d", "--format", "jsonl"});
  ASSERT_EQ(drift.exit_code, 0) << drift.err;
  // One day, or two when the test ran across midnight UTC.
  int64_t decisions = 0;
  for (const std::string& line : Lines(drift.out)) {
    const json day = json::parse(line);
    decisions += day["decisions"].get<int64_t>();
    EXPECT_EQ(day["held_share"], 0);
    EXPECT_EQ(day["held_share_baseline"], 0);
  }
  EXPECT_EQ(decisions, 3) << drift.out;
}

}  // namespace
}  // namespace chute::testing
