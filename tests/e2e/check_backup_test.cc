// chute check, backup and restore, end to end: the built binary in
// temporary folders.
#include <gtest/gtest.h>
#include <sqlite3.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <nlohmann/json.hpp>
#include <set>
#include <string>
#include <vector>

#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

using nlohmann::json;

const std::string kCorpus =
    std::string(CHUTE_SOURCE_DIR) + "/corpora/port-authority";

class CheckBackupTest : public ::testing::Test {
 protected:
  RunResult Chute(std::vector<std::string> args,
                  const std::string& input = "") {
    return RunChute(args, dir_.path(), input);
  }
  // A store s.db with a few documents in two queues.
  void SmallStore(const std::string& db = "s.db") {
    ASSERT_EQ(Chute({"init", "--db", db}).exit_code, 0);
    dir_.Write("l/permits/1.txt", "berth permit for the crane barge");
    dir_.Write("l/permits/2.txt", "permit renewal, berth seven");
    dir_.Write("l/freight/3.txt", "lorry of timber at gate four");
    RunResult r = Chute({"learn", "--db", db, "--tree", "l"});
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  // Runs SQL on a store from outside chute, CHECK constraints off.
  void Damage(const std::string& db, const std::string& sql) {
    sqlite3* raw = nullptr;
    ASSERT_EQ(sqlite3_open((dir_.path() + "/" + db).c_str(), &raw), SQLITE_OK);
    char* error = nullptr;
    int rc = sqlite3_exec(
        raw, ("PRAGMA ignore_check_constraints = ON;" + sql).c_str(), nullptr,
        nullptr, &error);
    EXPECT_EQ(rc, SQLITE_OK) << (error ? error : "");
    sqlite3_free(error);
    sqlite3_close(raw);
  }
  mode_t Mode(const std::string& rel) {
    struct stat st;
    EXPECT_EQ(::stat((dir_.path() + "/" + rel).c_str(), &st), 0) << rel;
    return st.st_mode & 0777;
  }
  bool Exists(const std::string& rel) {
    struct stat st;
    return ::stat((dir_.path() + "/" + rel).c_str(), &st) == 0;
  }
  static bool OneLine(const std::string& s) {
    return !s.empty() && s.find('\n') == s.size() - 1;
  }
  TempDir dir_;
};

TEST_F(CheckBackupTest, CheckOfAConsistentStoreSaysSoAndExitsZero) {
  SmallStore();
  RunResult r = Chute({"check", "--db", "s.db"});
  EXPECT_EQ(r.exit_code, 0) << r.err;
  EXPECT_TRUE(r.err.empty()) << r.err;
  // 3 documents; terms: berth permit for the crane barge renewal seven lorry
  // of timber at gate four = 14.
  EXPECT_EQ(r.out, "store is consistent: 3 documents, 2 queues, 14 terms\n");
}

TEST_F(CheckBackupTest, CheckJsonlHasOneObjectPerCheckThenTheSummary) {
  SmallStore();
  RunResult r = Chute({"check", "--db", "s.db", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  auto lines = Lines(r.out);
  ASSERT_EQ(lines.size(), 14u);  // thirteen checks and the summary
  std::set<std::string> checks;
  for (const std::string& line : lines) {
    json j = json::parse(line);
    ASSERT_EQ(j.size(), 3u) << line;
    EXPECT_TRUE(j["ok"].get<bool>()) << line;
    EXPECT_FALSE(j["detail"].get<std::string>().empty());
    checks.insert(j["check"].get<std::string>());
  }
  EXPECT_EQ(checks.size(), 14u);
  json last = json::parse(lines.back());
  EXPECT_EQ(last["check"], "summary");
  EXPECT_EQ(last["detail"],
            "store is consistent: 3 documents, 2 queues, 14 terms");
}

TEST_F(CheckBackupTest, CheckOfADamagedStorePrintsTheFindingAndExitsOne) {
  SmallStore();
  Damage("s.db", "UPDATE queues SET documents = 5 WHERE name = 'freight'");
  RunResult r = Chute({"check", "--db", "s.db"});
  EXPECT_EQ(r.exit_code, 1);
  // The model itself changed (a queue's document count, hence its prior),
  // so the fingerprint no longer matches the newest version's either.
  std::vector<std::string> out = Lines(r.out);
  ASSERT_EQ(out.size(), 3u) << r.out;
  EXPECT_EQ(out[0],
            "queue_totals: queue 'freight' records 5 documents but the ledger "
            "holds 1");
  EXPECT_EQ(out[1].rfind("fingerprint: the model's fingerprint is ", 0), 0u) << out[1];
  EXPECT_EQ(out[2], "store is NOT consistent: 3 documents, 2 queues, 14 terms");
  RunResult j = Chute({"check", "--db", "s.db", "--format", "jsonl"});
  EXPECT_EQ(j.exit_code, 1);
  int findings = 0;
  for (const std::string& line : Lines(j.out)) {
    json o = json::parse(line);
    if (!o["ok"].get<bool>()) {
      ++findings;
      EXPECT_TRUE(o["check"] == "queue_totals" || o["check"] == "fingerprint" ||
                  o["check"] == "summary")
          << line;
    }
  }
  EXPECT_EQ(findings, 3);
  RunResult c = Chute({"check", "--db", "s.db", "--format", "csv"});
  EXPECT_EQ(c.exit_code, 1);
  EXPECT_EQ(Lines(c.out).at(0), "check,ok,detail");
}

TEST_F(CheckBackupTest, CheckRefusesWhatIsNotAStoreInOneLine) {
  RunResult missing = Chute({"check", "--db", "none.db"});
  EXPECT_EQ(missing.exit_code, 1);
  EXPECT_TRUE(OneLine(missing.err)) << missing.err;
  EXPECT_NE(missing.err.find("none.db"), std::string::npos);
  dir_.Write("junk.db", std::string(4096, 'j'));
  RunResult junk = Chute({"check", "--db", "junk.db"});
  EXPECT_EQ(junk.exit_code, 1);
  EXPECT_TRUE(OneLine(junk.err)) << junk.err;
  EXPECT_NE(junk.err.find("junk.db: not a chute store"), std::string::npos)
      << junk.err;
  EXPECT_EQ(Chute({"check", "--db", "junk.db", "--format", "yaml"}).exit_code,
            2);
}

TEST_F(CheckBackupTest, BackupIsAConsistentStoreOfMode0600) {
  SmallStore();
  RunResult r = Chute({"backup", "--db", "s.db", "copy.db"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(
      r.out.rfind("backed up s.db to copy.db: 3 documents, 2 queues, ", 0), 0u)
      << r.out;
  EXPECT_EQ(Mode("copy.db"), 0600u);
  RunResult check = Chute({"check", "--db", "copy.db"});
  EXPECT_EQ(check.exit_code, 0) << check.out;
  EXPECT_EQ(check.out,
            "store is consistent: 3 documents, 2 queues, 14 terms\n");
}

TEST_F(CheckBackupTest, BackupRefusesToOverwriteWithoutForce) {
  SmallStore();
  dir_.Write("copy.db", "keep me");
  RunResult r = Chute({"backup", "--db", "s.db", "copy.db"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_TRUE(OneLine(r.err)) << r.err;
  EXPECT_NE(r.err.find("copy.db: already exists; add --force"),
            std::string::npos)
      << r.err;
  RunResult forced = Chute({"backup", "--db", "s.db", "copy.db", "--force"});
  EXPECT_EQ(forced.exit_code, 0) << forced.err;
  EXPECT_EQ(Chute({"check", "--db", "copy.db"}).exit_code, 0);
  RunResult self = Chute({"backup", "--db", "s.db", "s.db", "--force"});
  EXPECT_EQ(self.exit_code, 1);
  EXPECT_TRUE(OneLine(self.err)) << self.err;
  EXPECT_EQ(Chute({"backup", "--db", "s.db"}).exit_code,
            2);  // FILE is required
}

// Backups taken while another process learns batch after batch: each copy
// is a consistent store holding a whole number of batches (each learn is
// one transaction), and nothing fails for a lock.
TEST_F(CheckBackupTest, BackupWhileAnotherProcessLearns) {
  constexpr int kBatches = 8, kPerBatch = 5;
  ASSERT_EQ(Chute({"init", "--db", "s.db"}).exit_code, 0);
  for (int b = 0; b < kBatches; ++b) {
    for (int i = 0; i < kPerBatch; ++i) {
      dir_.Write(
          "b" + std::to_string(b) + "/" + (i % 2 ? "permits" : "freight") +
              "/" + std::to_string(i) + ".txt",
          "batch " + std::to_string(b) + " document " + std::to_string(i) +
              (i % 2 ? " berth permit crane" : " lorry timber gate"));
    }
  }
  pid_t learner = fork();
  ASSERT_GE(learner, 0);
  if (learner == 0) {
    int failed = 0;
    for (int b = 0; b < kBatches; ++b) {
      RunResult r =
          RunChute({"learn", "--db", "s.db", "--tree", "b" + std::to_string(b)},
                   dir_.path());
      failed += r.exit_code != 0;
    }
    _exit(failed);
  }
  std::set<int64_t> seen;
  int copies = 0;
  for (;;) {
    int status = 0;
    bool done = waitpid(learner, &status, WNOHANG) == learner;
    std::string name = "copy" + std::to_string(copies++) + ".db";
    RunResult r = Chute({"backup", "--db", "s.db", name});
    ASSERT_EQ(r.exit_code, 0) << r.err;
    RunResult check = Chute({"check", "--db", name, "--format", "jsonl"});
    ASSERT_EQ(check.exit_code, 0) << check.out;
    json summary = json::parse(Lines(check.out).back());
    // "store is consistent: N documents, ..."
    std::string detail = summary["detail"];
    int64_t documents = std::stoll(detail.substr(detail.find(':') + 2));
    EXPECT_EQ(documents % kPerBatch, 0) << detail;
    seen.insert(documents);
    if (done) {
      ASSERT_TRUE(WIFEXITED(status));
      EXPECT_EQ(WEXITSTATUS(status), 0) << "a learn failed";
      break;
    }
  }
  EXPECT_EQ(*seen.rbegin(),
            kBatches * kPerBatch);  // the last copy, after the learner
  // How many distinct states the copies caught (timing-dependent; recorded,
  // not asserted).
  RecordProperty("distinct_copies", static_cast<int>(seen.size()));
  RecordProperty("copies", copies);
}

// The demo scenario: route the inbox, back up, restore into a new store and
// over a store holding other documents; routing gives identical output.
TEST_F(CheckBackupTest, RestoreThenRouteGivesTheOriginalOutput) {
  ASSERT_EQ(Chute({"init", "--db", "harbour.db"}).exit_code, 0);
  ASSERT_EQ(
      Chute({"learn", "--db", "harbour.db", "--tree", kCorpus + "/labelled"})
          .exit_code,
      0);
  const std::vector<std::string> route = {"route", kCorpus + "/inbox",
                                          "--format", "jsonl"};
  auto Route = [&](const std::string& db) {
    std::vector<std::string> args = route;
    args.insert(args.end(), {"--db", db});
    RunResult r = Chute(args);
    EXPECT_EQ(r.exit_code, 0) << r.err;
    return r.out;
  };
  const std::string original = Route("harbour.db");
  ASSERT_FALSE(original.empty());
  ASSERT_EQ(
      Chute({"backup", "--db", "harbour.db", "harbour-copy.db"}).exit_code, 0);

  RunResult fresh = Chute({"restore", "--db", "new.db", "harbour-copy.db"});
  ASSERT_EQ(fresh.exit_code, 0) << fresh.err;
  EXPECT_EQ(fresh.out,
            "restored harbour-copy.db as the new store new.db: 476 documents, "
            "8 queues\n");
  EXPECT_EQ(Mode("new.db"), 0600u);
  EXPECT_EQ(Route("new.db"), original);
  EXPECT_EQ(Chute({"check", "--db", "new.db"}).exit_code, 0);

  SmallStore("other.db");
  RunResult refused = Chute({"restore", "--db", "other.db", "harbour-copy.db"});
  EXPECT_EQ(refused.exit_code, 1);
  EXPECT_TRUE(OneLine(refused.err)) << refused.err;
  EXPECT_NE(refused.err.find("holds 3 learned documents"), std::string::npos)
      << refused.err;
  RunResult forced =
      Chute({"restore", "--db", "other.db", "harbour-copy.db", "--force"});
  ASSERT_EQ(forced.exit_code, 0) << forced.err;
  EXPECT_EQ(forced.out,
            "restored harbour-copy.db into other.db: 476 documents, 8 queues "
            "(it held 3 "
            "documents)\n");
  EXPECT_EQ(Route("other.db"), original);
}

TEST_F(CheckBackupTest, RestoreRefusesBadFilesInOneLine) {
  SmallStore();
  dir_.Write("junk.db", std::string(4096, 'j'));
  struct Case {
    std::vector<std::string> args;
    std::string says;
  };
  const Case cases[] = {
      {{"restore", "--db", "s.db", "junk.db", "--force"},
       "junk.db: not a chute store"},
      {{"restore", "--db", "s.db", "none.db", "--force"},
       "none.db: no chute store here"},
      {{"restore", "--db", "s.db", "s.db", "--force"}, "is the store itself"},
      {{"restore", "--db", "junk.db", "s.db", "--force"},
       "junk.db: not a chute store"},
  };
  for (const Case& c : cases) {
    RunResult r = Chute(c.args);
    EXPECT_EQ(r.exit_code, 1) << c.args[3];
    EXPECT_TRUE(OneLine(r.err)) << r.err;
    EXPECT_NE(r.err.find(c.says), std::string::npos) << r.err;
  }
  EXPECT_EQ(Chute({"check", "--db", "s.db"}).exit_code, 0);  // untouched
  EXPECT_EQ(Chute({"restore", "--db", "s.db"}).exit_code, 2);
  EXPECT_FALSE(Exists("none.db"));
}

}  // namespace
}  // namespace chute::testing
