// Kept text and chute purge, end to end: the built binary in temporary
// folders, its store read back through the store's own API (the texts) and
// as raw bytes (erasure).
#include <gtest/gtest.h>
#include <sqlite3.h>
#include <unistd.h>

#include <chrono>
#include <filesystem>
#include <map>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <thread>
#include <vector>

#include "store/store.h"
#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

using nlohmann::json;

class TextPurgeTest : public ::testing::Test {
 protected:
  RunResult Chute(std::vector<std::string> args,
                  const std::string& input = "") {
    return RunChute(args, dir_.path(), input);
  }
  void Init(const std::vector<std::string>& extra = {}) {
    std::vector<std::string> args = {"init", "--db", "s.db"};
    args.insert(args.end(), extra.begin(), extra.end());
    RunResult r = Chute(args);
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  // file name under l/<queue>/ -> text
  std::map<std::string, std::string> WriteTree() {
    std::map<std::string, std::string> files = {
        {"berths/b1.txt", "berth booking for the vessel Aurora, pier 4"},
        {"berths/b2.txt", "please reserve a berth at pier 2 for two nights"},
        {"billing/i1.txt", "invoice 4471 unpaid, harbour dues for March"},
        {"billing/i2.txt", "refund of the berth deposit, invoice attached"},
        {"marina/m1.txt", "mooring buoy for a sailing yacht, marina pontoon"},
    };
    for (const auto& [name, text] : files) dir_.Write("l/" + name, text);
    return files;
  }
  // digest -> kept text (nullopt when none), through Store::ReadLedgerTexts.
  std::vector<LedgerText> Texts() {
    std::unique_ptr<Store> store;
    Status s = Store::Open(db_, &store);
    EXPECT_TRUE(s.ok()) << s.message();
    std::vector<LedgerText> out;
    if (!s.ok()) return out;
    s = store->ReadLedgerTexts([&](const LedgerText& t) {
      out.push_back(t);
      return Status::Ok();
    });
    EXPECT_TRUE(s.ok()) << s.message();
    return out;
  }
  int64_t Count(const std::string& sql) {
    sqlite3* raw = nullptr;
    EXPECT_EQ(sqlite3_open_v2(db_.c_str(), &raw, SQLITE_OPEN_READONLY, nullptr),
              SQLITE_OK);
    sqlite3_stmt* st = nullptr;
    int64_t n = -1;
    if (sqlite3_prepare_v2(raw, sql.c_str(), -1, &st, nullptr) == SQLITE_OK &&
        sqlite3_step(st) == SQLITE_ROW) {
      n = sqlite3_column_int64(st, 0);
    }
    sqlite3_finalize(st);
    sqlite3_close(raw);
    return n;
  }
  std::string Route() {
    dir_.Write("inbox/1.txt", "invoice for the berth at pier 4");
    dir_.Write("inbox/2.txt", "marina pontoon mooring for a yacht, dues");
    RunResult r = Chute(
        {"route", "--db", "s.db", "inbox", "--format", "jsonl", "--top", "5"});
    EXPECT_EQ(r.exit_code, 0) << r.err;
    return r.out;
  }
  // Waits into the next second, so that what is learned next has a later
  // learned_at than everything before.
  static void NextSecond() {
    std::this_thread::sleep_for(std::chrono::milliseconds(1100));
  }

  static bool OneLine(const std::string& s) {
    return !s.empty() && s.find('\n') == s.size() - 1;
  }

  TempDir dir_;
  std::string db_ = dir_.path() + "/s.db";
};

TEST_F(TextPurgeTest, KeepTextIsOnByDefaultAndSetAtInit) {
  Init();
  RunResult r =
      Chute({"queues", "--db", "s.db", "--settings", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(json::parse(Lines(r.out).at(0))["keep_text"], true);
  RunResult off = Chute({"init", "--db", "off.db", "--keep-text", "off"});
  ASSERT_EQ(off.exit_code, 0) << off.err;
  EXPECT_NE(off.out.find("keep text off"), std::string::npos) << off.out;
  r = Chute({"queues", "--db", "off.db", "--settings"});
  EXPECT_NE(r.out.find("keep_text   off"), std::string::npos) << r.out;
  RunResult bad = Chute({"init", "--db", "bad.db", "--keep-text", "sometimes"});
  EXPECT_EQ(bad.exit_code, 2);
  EXPECT_FALSE(std::filesystem::exists(dir_.path() + "/bad.db"));
}

TEST_F(TextPurgeTest, LearnAndCorrectKeepTheTextTheyTokenized) {
  Init();
  std::map<std::string, std::string> files = WriteTree();
  // Ill-formed UTF-8: the kept text is the decoded text, with U+FFFD.
  dir_.Write("l/billing/i3.txt", "dues \xff statement");
  RunResult learn = Chute({"learn", "--db", "s.db", "--tree", "l"});
  ASSERT_EQ(learn.exit_code, 0) << learn.err;
  dir_.Write("new.txt", "late fee on the harbour dues");
  dir_.Write("fixes.csv", "path,queue\nnew.txt,billing\n");
  RunResult correct = Chute({"correct", "--db", "s.db", "fixes.csv"});
  ASSERT_EQ(correct.exit_code, 0) << correct.err;

  std::multiset<std::string> want, got;
  for (const auto& [name, text] : files) want.insert(text);
  want.insert("dues \xEF\xBF\xBD statement");
  want.insert("late fee on the harbour dues");
  for (const LedgerText& t : Texts()) {
    ASSERT_TRUE(t.text.has_value()) << t.digest;
    got.insert(*t.text);
  }
  EXPECT_EQ(got, want);
  RunResult check = Chute({"check", "--db", "s.db", "--format", "jsonl"});
  EXPECT_EQ(check.exit_code, 0) << check.out;
  bool seen = false;
  for (const std::string& line : Lines(check.out)) {
    json j = json::parse(line);
    if (j["check"] != "ledger_text") continue;
    seen = true;
    EXPECT_EQ(j["detail"], "all 7 kept texts unpack (0 entries keep no text)");
  }
  EXPECT_TRUE(seen) << check.out;
}

TEST_F(TextPurgeTest, AStoreWithKeepTextOffKeepsNoText) {
  Init({"--keep-text", "off"});
  WriteTree();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  std::vector<LedgerText> texts = Texts();
  EXPECT_EQ(texts.size(), 5u);
  for (const LedgerText& t : texts)
    EXPECT_FALSE(t.text.has_value()) << t.digest;
}

TEST_F(TextPurgeTest, PurgeErasesOlderTextsAndPathsAndRoutesAsBefore) {
  Init();
  WriteTree();
  const std::string planted = "zqxpurgedname42";
  dir_.Write("l/billing/" + planted + ".txt",
             "invoice copy requested by the agent");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  NextSecond();
  dir_.Write("late/marina/m9.txt", "pontoon berth for a small yacht");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "late"}).exit_code, 0);
  std::vector<LedgerText> texts = Texts();
  ASSERT_EQ(texts.size(), 7u);
  const std::string late = texts.back().learned_at;  // the last learn's time
  ASSERT_LT(texts.front().learned_at, late);
  const std::string routed = Route();
  const int64_t versions = Count("SELECT COUNT(*) FROM versions");
  // The test first sees the file name it looks for.
  ASSERT_TRUE(ReadBytes(db_).find(planted) != std::string::npos ||
              ReadBytes(db_ + "-wal").find(planted) != std::string::npos);

  // A dry run counts and changes nothing.
  RunResult dry = Chute({"purge", "--db", "s.db", "--older-than", late,
                         "--dry-run", "--by", "tester", "--format", "csv"});
  ASSERT_EQ(dry.exit_code, 0) << dry.err;
  EXPECT_EQ(dry.out, "before,dry_run,purged,texts,sources,decisions,unreadable,by\r\n" + late +
                         ",true,6,6,6,0,0,tester\r\n");
  EXPECT_EQ(Count("SELECT COUNT(*) FROM ledger WHERE text IS NULL"), 0);

  RunResult r = Chute({"purge", "--db", "s.db", "--older-than", late, "--by",
                       "records-office", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(r.err, "");
  json j = json::parse(Lines(r.out).at(0));
  EXPECT_EQ(j["before"], late);
  EXPECT_EQ(j["dry_run"], false);
  EXPECT_EQ(j["purged"], 6);
  EXPECT_EQ(j["texts"], 6);
  EXPECT_EQ(j["sources"], 6);
  EXPECT_EQ(j["by"], "records-office");
  ASSERT_EQ(j["queues"].size(), 3u);
  EXPECT_EQ(j["queues"][0]["queue"], "berths");
  EXPECT_EQ(j["queues"][0]["purged"], 2);

  texts = Texts();
  for (size_t i = 0; i + 1 < texts.size(); ++i)
    EXPECT_FALSE(texts[i].text.has_value());
  EXPECT_EQ(texts.back().text.value_or(""), "pontoon berth for a small yacht");
  EXPECT_EQ(Count("SELECT COUNT(*) FROM ledger WHERE source IS NULL"), 6);
  // The model did not change: same routing, no new version, a sound store.
  EXPECT_EQ(Route(), routed);
  EXPECT_EQ(Count("SELECT COUNT(*) FROM versions"), versions);
  EXPECT_EQ(Chute({"check", "--db", "s.db"}).exit_code, 0);
  // The planted file name is in no store file.
  for (const char* suffix : {"", "-wal", "-shm"}) {
    EXPECT_EQ(ReadBytes(db_ + suffix).find(planted), std::string::npos)
        << suffix;
  }

  // evaluate --with-paths names a purged document by its digest, the one
  // learned later by its path.
  RunResult ev = Chute({"evaluate", "--db", "s.db", "--folds", "2",
                        "--with-paths", "--csv", "ev"});
  ASSERT_EQ(ev.exit_code, 0) << ev.err;
  int by_digest = 0, by_path = 0;
  for (const std::string& line :
       Lines(ReadBytes(dir_.path() + "/ev/predictions.csv"))) {
    const std::string name = line.substr(0, line.find(','));
    if (name == "document") continue;
    if (name.find("/late/marina/m9.txt") != std::string::npos) {
      ++by_path;
    } else {
      EXPECT_EQ(name.size(), 12u) << name;
      EXPECT_EQ(name.find_first_not_of("0123456789abcdef"), std::string::npos)
          << name;
      ++by_digest;
    }
  }
  EXPECT_EQ(by_digest, 6);
  EXPECT_EQ(by_path, 1);

  // The table says what was done; a second purge finds nothing.
  RunResult again = Chute({"purge", "--db", "s.db", "--older-than", "400d"});
  ASSERT_EQ(again.exit_code, 0) << again.err;
  EXPECT_NE(again.out.find("purged 0 documents learned before"),
            std::string::npos)
      << again.out;
}

TEST_F(TextPurgeTest, PurgeReportsBadArgumentsOnOneLine) {
  Init();
  WriteTree();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  for (const std::string age :
       {"400", "4w", "yesterday", "2025-02-30T00:00:00Z"}) {
    RunResult r = Chute({"purge", "--db", "s.db", "--older-than", age});
    EXPECT_EQ(r.exit_code, 2) << age;
    EXPECT_TRUE(OneLine(r.err)) << r.err;
    EXPECT_EQ(
        r.err.rfind("chute purge: --older-than: '" + age + "' is neither", 0),
        0u)
        << r.err;
    EXPECT_EQ(r.out, "");
  }
  RunResult future =
      Chute({"purge", "--db", "s.db", "--older-than", "2999-01-01T00:00:00Z"});
  EXPECT_EQ(future.exit_code, 2);
  EXPECT_EQ(
      future.err,
      "chute purge: --older-than: 2999-01-01T00:00:00Z is in the future\n");
  EXPECT_EQ(Chute({"purge", "--db", "s.db"}).exit_code,
            2);  // --older-than is required
  RunResult missing = Chute({"purge", "--db", "none.db", "--older-than", "1d"});
  EXPECT_EQ(missing.exit_code, 1);
  EXPECT_TRUE(OneLine(missing.err)) << missing.err;
  EXPECT_FALSE(std::filesystem::exists(dir_.path() + "/none.db"));
  // Nothing was purged by any of them.
  EXPECT_EQ(
      Count("SELECT COUNT(*) FROM ledger WHERE text IS NULL OR source IS NULL"),
      0);
}

}  // namespace
}  // namespace chute::testing
