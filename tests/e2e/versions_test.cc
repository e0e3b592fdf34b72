// chute versions, rollback and route --at-version, end to end: the fields
// other programs read, decisions that come back exactly, and the errors.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

using nlohmann::json;

class VersionsTest : public ::testing::Test {
 protected:
  RunResult Chute(std::vector<std::string> args, const std::string& input = "") {
    return RunChute(args, dir_.path(), input);
  }
  void SetUp() override {
    ASSERT_EQ(Chute({"init", "--db", "s.db", "--by", "setup"}).exit_code, 0);
    dir_.Write("l/berths/b1.txt", "berth booking for the vessel Aurora, pier 4");
    dir_.Write("l/berths/b2.txt", "please reserve a berth at pier 2 for two nights");
    dir_.Write("l/billing/i1.txt", "invoice 4471 unpaid, harbour dues for March");
    dir_.Write("l/billing/i2.txt", "dues statement and late fee on the invoice");
    dir_.Write("l/marina/m1.txt", "mooring buoy for a sailing yacht, marina pontoon");
    dir_.Write("inbox/1.txt", "invoice for the berth at pier 4");
    dir_.Write("inbox/2.txt", "marina pontoon mooring for a yacht, dues");
    RunResult r = Chute({"learn", "--db", "s.db", "--tree", "l", "--by", "clerk"});
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  std::vector<json> Versions() {
    RunResult r = Chute({"versions", "--db", "s.db", "--format", "jsonl"});
    EXPECT_EQ(r.exit_code, 0) << r.err;
    std::vector<json> out;
    for (const std::string& line : Lines(r.out)) out.push_back(json::parse(line));
    return out;
  }
  std::string Route(const std::vector<std::string>& extra = {}) {
    std::vector<std::string> args = {"route", "--db", "s.db", "inbox", "--format", "jsonl"};
    args.insert(args.end(), extra.begin(), extra.end());
    RunResult r = Chute(args);
    EXPECT_EQ(r.exit_code, 0) << r.err;
    return r.out;
  }
  TempDir dir_;
};

TEST_F(VersionsTest, VersionsJsonlHasTheDocumentedFields) {
  std::vector<json> v = Versions();
  ASSERT_EQ(v.size(), 2u);
  for (const json& j : v) {
    for (const char* key :
         {"version", "time", "command", "by", "added", "moved", "removed", "fingerprint"}) {
      EXPECT_TRUE(j.contains(key)) << key << " in " << j.dump();
    }
  }
  EXPECT_EQ(v[0]["version"], 1);
  EXPECT_EQ(v[0]["command"], "init");
  EXPECT_EQ(v[0]["by"], "setup");
  EXPECT_EQ(v[1]["command"], "learn");
  EXPECT_EQ(v[1]["by"], "clerk");
  EXPECT_EQ(v[1]["added"], 5);
  EXPECT_EQ(v[1]["fingerprint"].get<std::string>().size(), 64u);
  const std::string time = v[1]["time"];
  EXPECT_EQ(time.size(), 20u);  // RFC 3339 UTC, to the second
  EXPECT_EQ(time.back(), 'Z');
  RunResult csv = Chute({"versions", "--db", "s.db", "--format", "csv"});
  EXPECT_EQ(Lines(csv.out).at(0), "version,time,command,by,added,moved,removed,fingerprint");
}

TEST_F(VersionsTest, RouteCarriesTheModelVersionAndFingerprint) {
  std::vector<json> v = Versions();
  for (const std::string& line : Lines(Route())) {
    json j = json::parse(line);
    EXPECT_EQ(j["model_version"], v.back()["version"]);
    EXPECT_EQ(j["fingerprint"], v.back()["fingerprint"]);
  }
}

TEST_F(VersionsTest, RollbackRoutesExactlyAsTheVersionDidAndAtVersionAgrees) {
  const std::string before = Route();
  dir_.Write("fixes.csv", "path,queue\nl/berths/b1.txt,billing\nl/marina/m1.txt,berths\n");
  RunResult c = Chute({"correct", "--db", "s.db", "fixes.csv", "--by", "rev"});
  ASSERT_EQ(c.exit_code, 0) << c.err;
  dir_.Write("more/billing/i9.txt", "berth invoice berth invoice pier");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "more"}).exit_code, 0);
  const std::string after = Route();
  ASSERT_NE(WithoutModelVersion(after), WithoutModelVersion(before));
  // Read-only: the older model, and the store unchanged.
  EXPECT_EQ(Route({"--at-version", "2"}), before);
  EXPECT_EQ(Route(), after);
  ASSERT_EQ(Versions().size(), 4u);

  RunResult r = Chute({"rollback", "--db", "s.db", "2", "--by", "lead", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  json j = json::parse(r.out);
  EXPECT_EQ(j["version"], 5);
  EXPECT_EQ(j["rolled_back_to"], 2);
  EXPECT_EQ(j["moved"], 2);
  EXPECT_EQ(j["removed"], 1);
  EXPECT_EQ(j["same_as_target"], true);
  // Every decision as at version 2, to the last digit.
  EXPECT_EQ(WithoutModelVersion(Route()), WithoutModelVersion(before));
  std::vector<json> v = Versions();
  EXPECT_EQ(v.back()["command"], "rollback");
  EXPECT_EQ(v.back()["by"], "lead");
  EXPECT_EQ(v.back()["fingerprint"], v[1]["fingerprint"]);
  EXPECT_EQ(Chute({"check", "--db", "s.db"}).exit_code, 0);
  // And undone.
  ASSERT_EQ(Chute({"rollback", "--db", "s.db", "4"}).exit_code, 0);
  EXPECT_EQ(WithoutModelVersion(Route()), WithoutModelVersion(after));
}

TEST_F(VersionsTest, PruneBeforeDropsOlderVersionsOnly) {
  dir_.Write("fixes.csv", "path,queue\nl/berths/b1.txt,billing\n");
  ASSERT_EQ(Chute({"correct", "--db", "s.db", "fixes.csv"}).exit_code, 0);
  RunResult r = Chute({"versions", "--db", "s.db", "--prune-before", "2"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(r.out, "dropped 1 versions; rollback now reaches back to version 2\n");
  std::vector<json> v = Versions();
  ASSERT_EQ(v.size(), 2u);
  EXPECT_EQ(v[0]["version"], 2);
  EXPECT_EQ(Chute({"rollback", "--db", "s.db", "2"}).exit_code, 0);
  RunResult gone = Chute({"rollback", "--db", "s.db", "1"});
  EXPECT_EQ(gone.exit_code, 1);
  EXPECT_NE(gone.err.find("there is no version 1; versions 2 to 4 are kept"), std::string::npos)
      << gone.err;
  EXPECT_EQ(Chute({"check", "--db", "s.db"}).exit_code, 0);
  RunResult late = Chute({"versions", "--db", "s.db", "--prune-before", "99"});
  EXPECT_EQ(late.exit_code, 2);
}

TEST_F(VersionsTest, UnknownVersionIsAOneLineError) {
  RunResult r = Chute({"route", "--db", "s.db", "inbox", "--at-version", "42"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_EQ(Lines(r.err).size(), 1u) << r.err;
  EXPECT_NE(r.err.find("there is no version 42"), std::string::npos) << r.err;
  RunResult empty = Chute({"route", "--db", "s.db", "inbox", "--at-version", "1"});
  EXPECT_EQ(empty.exit_code, 1);
  EXPECT_NE(empty.err.find("version 1 had learned no documents"), std::string::npos) << empty.err;
}

TEST_F(VersionsTest, QueueChangesFromTheCommandLine) {
  RunResult r = Chute({"queues", "--db", "s.db", "--rename", "billing", "harbour-dues", "--by", "lead"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(Lines(r.out).at(0), "renamed queue 'billing' to 'harbour-dues' (by lead)");
  EXPECT_NE(Route().find("\"queue\":\"harbour-dues\""), std::string::npos);
  r = Chute({"queues", "--db", "s.db", "--merge", "marina", "--into", "berths", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  bool marina_retired = false;
  for (const std::string& line : Lines(r.out)) {
    json j = json::parse(line);
    if (j["queue"] == "marina") marina_retired = j["retired"].get<bool>() && j["documents"] == 0;
  }
  EXPECT_TRUE(marina_retired) << r.out;
  r = Chute({"queues", "--db", "s.db", "--retire", "harbour-dues"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(Lines(r.out).at(0).rfind("retired queue 'harbour-dues': 2 documents out of the model", 0),
            0u)
      << r.out;
  for (const std::string& line : Lines(Route())) EXPECT_EQ(json::parse(line)["queue"], "berths");
  r = Chute({"queues", "--db", "s.db", "--add", "hazardous-cargo"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::vector<json> v = Versions();
  ASSERT_EQ(v.size(), 6u);
  for (size_t i = 2; i < v.size(); ++i) EXPECT_EQ(v[i]["command"], "queues");
  EXPECT_EQ(v[3]["moved"], 1);
  EXPECT_EQ(v[4]["removed"], 2);
  EXPECT_EQ(Chute({"check", "--db", "s.db"}).exit_code, 0);
  // Undo it all.
  ASSERT_EQ(Chute({"rollback", "--db", "s.db", "2"}).exit_code, 0);
  EXPECT_NE(Route().find("\"queue\":\"billing\""), std::string::npos);
  EXPECT_EQ(Chute({"check", "--db", "s.db"}).exit_code, 0);
}

TEST_F(VersionsTest, QueueChangeErrors) {
  EXPECT_EQ(Chute({"queues", "--db", "s.db", "--merge", "marina"}).exit_code, 2);
  EXPECT_EQ(Chute({"queues", "--db", "s.db", "--into", "marina"}).exit_code, 2);
  EXPECT_EQ(Chute({"queues", "--db", "s.db", "--retire", "marina", "--add", "x"}).exit_code, 2);
  RunResult r = Chute({"queues", "--db", "s.db", "--retire", "nowhere"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_EQ(Lines(r.err).size(), 1u);
  EXPECT_NE(r.err.find("queue 'nowhere' does not exist; nothing was changed"), std::string::npos)
      << r.err;
  EXPECT_EQ(Chute({"queues", "--db", "s.db", "--rename", "marina", "_mine"}).exit_code, 1);
  EXPECT_EQ(Versions().size(), 2u);  // nothing was recorded
}

}  // namespace
}  // namespace chute::testing
