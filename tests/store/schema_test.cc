// Tests of the schema and its migrations (store/schema.h).
//
// The migration tests loop over every schema version from 0 to
// SchemaVersion(), so a migration appended to schema.cc is covered without
// editing this file: a store of every older version is built, given data,
// and opened with Store::Open, which must upgrade it and keep the data.
#include "store/schema.h"

#include <fcntl.h>
#include <gtest/gtest.h>
#include <unistd.h>

#include <map>
#include <memory>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "store/store.h"
#include "store/term_counts_codec.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

using testing_files::Db;
using testing_files::ExecRaw;
using testing_files::OpenRaw;
using testing_files::QueryInt;
using testing_files::ReadFile;
using testing_files::TempDir;

// A fresh SQLite file opened the way Store::Create opens one: the file made
// by open(2) with mode 0600, then opened read-write (not create) by SQLite,
// in WAL mode, with foreign keys on.
Db OpenFresh(const std::string& path) {
  int fd = ::open(path.c_str(), O_CREAT | O_EXCL | O_WRONLY | O_CLOEXEC, 0600);
  EXPECT_GE(fd, 0) << path;
  if (fd >= 0) ::close(fd);
  Db db = OpenRaw(path, SQLITE_OPEN_READWRITE);
  ExecRaw(db.get(), "PRAGMA journal_mode = WAL");
  ExecRaw(db.get(), "PRAGMA foreign_keys = ON");
  return db;
}

// Every row of a one-column query, as text.
std::vector<std::string> QueryColumn(sqlite3* db, const std::string& sql) {
  std::vector<std::string> out;
  sqlite3_stmt* st = nullptr;
  if (sqlite3_prepare_v2(db, sql.c_str(), -1, &st, nullptr) != SQLITE_OK) {
    ADD_FAILURE() << sql << ": " << sqlite3_errmsg(db);
    return out;
  }
  while (sqlite3_step(st) == SQLITE_ROW) {
    const unsigned char* text = sqlite3_column_text(st, 0);
    out.emplace_back(text ? reinterpret_cast<const char*>(text) : "");
  }
  sqlite3_finalize(st);
  return out;
}

std::vector<std::string> SchemaOf(sqlite3* db) {
  return QueryColumn(db,
                     "SELECT type || ' ' || name || ' ' || IFNULL(sql, '') "
                     "FROM sqlite_master ORDER BY type, name");
}

// Representative data in the tables of schema version 1, written with plain
// SQL: the settings, two queues (one with a hand-set prior), three terms,
// their counts and three ledger entries, all consistent with each other.
// Rows are written at version 1 and then carried to later versions by the
// migrations themselves, so this SQL never has to change.
constexpr char kDigest1[] =
    "1111111111111111111111111111111111111111111111111111111111111111";
constexpr char kDigest2[] =
    "2222222222222222222222222222222222222222222222222222222222222222";
constexpr char kDigest3[] =
    "3333333333333333333333333333333333333333333333333333333333333333";

void InsertVersion1Rows(sqlite3* db) {
  ExecRaw(db, R"sql(
INSERT INTO settings(key, value) VALUES
  ('alpha', '0.5'), ('prior', 'uniform'), ('bigrams', 'on'),
  ('numbers', 'fold'), ('min_length', '2'), ('max_length', '30');
INSERT INTO queues(id, name, documents, tokens, set_prior, created) VALUES
  (1, 'permits', 2, 5, NULL, '2026-01-01T00:00:00Z'),
  (2, 'Zölle', 1, 3, 0.25, '2026-01-02T00:00:00Z');
INSERT INTO terms(id, text) VALUES (1, 'berth'), (2, 'fee'), (3, '日本');
INSERT INTO counts(term_id, queue_id, n) VALUES
  (1, 1, 3), (2, 1, 2), (2, 2, 1), (3, 2, 2);
)sql");
  struct Entry {
    const char* digest;
    int queue_id;
    const char* source;
    std::vector<TermCount> counts;
  };
  const Entry entries[] = {
      {kDigest1, 1, "a.txt", {{"berth", 2}, {"fee", 1}}},
      {kDigest2, 1, "b.txt", {{"berth", 1}, {"fee", 1}}},
      {kDigest3, 2, "c.txt", {{"fee", 1}, {"日本", 2}}},
  };
  sqlite3_stmt* st = nullptr;
  ASSERT_EQ(sqlite3_prepare_v2(db,
                               "INSERT INTO ledger(digest, queue_id, source, "
                               "learned_at, tokens, term_counts) "
                               "VALUES(?, ?, ?, '2026-01-03T00:00:00Z', ?, ?)",
                               -1, &st, nullptr),
            SQLITE_OK)
      << sqlite3_errmsg(db);
  for (const Entry& e : entries) {
    int64_t tokens = 0;
    for (const auto& [term, n] : e.counts) tokens += n;
    const std::string blob = EncodeTermCounts(e.counts);
    sqlite3_bind_text(st, 1, e.digest, -1, SQLITE_STATIC);
    sqlite3_bind_int(st, 2, e.queue_id);
    sqlite3_bind_text(st, 3, e.source, -1, SQLITE_STATIC);
    sqlite3_bind_int64(st, 4, tokens);
    sqlite3_bind_blob(st, 5, blob.data(), static_cast<int>(blob.size()),
                      SQLITE_TRANSIENT);
    EXPECT_EQ(sqlite3_step(st), SQLITE_DONE) << sqlite3_errmsg(db);
    sqlite3_reset(st);
  }
  sqlite3_finalize(st);
}

// Checks, through the Store API only, that the rows of InsertVersion1Rows
// are all there.
void ExpectVersion1Rows(Store* store) {
  const StoreSettings& s = store->settings();
  EXPECT_EQ(s.model.alpha, 0.5);
  EXPECT_EQ(s.model.prior, PriorMode::kUniform);
  EXPECT_TRUE(s.tokenizer.bigrams);
  EXPECT_EQ(s.tokenizer.numbers, NumberMode::kFold);
  EXPECT_EQ(s.tokenizer.min_length, 2);
  EXPECT_EQ(s.tokenizer.max_length, 30);
  EXPECT_TRUE(s.keep_text);  // the migration to version 2 turns it on

  std::vector<QueueInfo> queues;
  ASSERT_TRUE(store->ListQueues(&queues).ok());
  ASSERT_EQ(queues.size(), 2u);
  EXPECT_EQ(queues[0].name, "Zölle");
  EXPECT_EQ(queues[0].documents, 1);
  EXPECT_EQ(queues[0].tokens, 3);
  EXPECT_EQ(queues[0].distinct_terms, 2);
  EXPECT_EQ(queues[0].set_prior, 0.25);
  EXPECT_EQ(queues[1].name, "permits");
  EXPECT_EQ(queues[1].documents, 2);
  EXPECT_EQ(queues[1].tokens, 5);
  EXPECT_EQ(queues[1].distinct_terms, 2);
  EXPECT_FALSE(queues[1].set_prior.has_value());

  ModelCounts mc;
  ASSERT_TRUE(store->LoadModelCounts(&mc).ok());
  ASSERT_EQ(mc.queues.size(), 2u);
  std::map<std::string, std::vector<int64_t>> rows;
  for (size_t r = 0; r < mc.terms.size(); ++r) {
    rows[mc.terms[r]] = {mc.counts[r * 2], mc.counts[r * 2 + 1]};
  }
  EXPECT_EQ(rows, (std::map<std::string, std::vector<int64_t>>{
                      {"berth", {0, 3}}, {"fee", {1, 2}}, {"日本", {2, 0}}}));

  std::optional<LedgerEntry> entry;
  ASSERT_TRUE(store->FindDocument(kDigest3, &entry).ok());
  ASSERT_TRUE(entry.has_value());
  EXPECT_EQ(entry->queue, "Zölle");
  EXPECT_EQ(entry->source, "c.txt");
  EXPECT_EQ(entry->learned_at, "2026-01-03T00:00:00Z");
  EXPECT_EQ(entry->tokens, 3);
}

TEST(SchemaTest, EveryOlderVersionIsUpgradedByOpen) {
  TempDir dir;
  // k = SchemaVersion() is included: there Open has nothing to migrate, and
  // the data checks run against the current schema too.
  for (int k = 0; k <= SchemaVersion(); ++k) {
    SCOPED_TRACE(testing::Message() << "store of schema version " << k);
    const std::string path = dir.File("v" + std::to_string(k) + ".db");
    {
      Db db = OpenFresh(path);
      if (k >= 1) {
        ASSERT_TRUE(Migrate(db.get(), 1).ok());
        InsertVersion1Rows(db.get());
      }
      Status s = Migrate(db.get(), k);
      ASSERT_TRUE(s.ok()) << s.message();
      ASSERT_EQ(QueryInt(db.get(), "PRAGMA user_version"), k);
    }

    const std::string before = ReadFile(path);
    std::unique_ptr<Store> store;
    Status s = Store::Open(path, &store);
    if (k == 0) {
      // Version 0 is an SQLite file before migration 1, which is the one
      // that stamps chute's application id: Open must refuse it rather than
      // adopt any SQLite file, and leave it as it was.
      EXPECT_FALSE(s.ok());
      EXPECT_NE(s.message().find("not a chute store"), std::string::npos)
          << s.message();
      EXPECT_EQ(ReadFile(path), before);
      Db db = OpenRaw(path, SQLITE_OPEN_READONLY);
      EXPECT_EQ(QueryInt(db.get(), "PRAGMA user_version"), 0);
      EXPECT_TRUE(SchemaOf(db.get()).empty());
      continue;
    }
    ASSERT_TRUE(s.ok()) << s.message();
    ExpectVersion1Rows(store.get());

    // The upgraded store learns like a new one.
    LearnBatch batch;
    batch.Add(std::string(64, 'f'), "permits", "d.txt", {"berth", "neu"});
    LearnResult result;
    ASSERT_TRUE(store->Learn(batch, {"2026-05-01T00:00:00Z", "tester"}, &result).ok());
    EXPECT_EQ(result.learned, 1);
    EXPECT_EQ(result.new_terms, 1);
    std::vector<QueueInfo> queues;
    ASSERT_TRUE(store->ListQueues(&queues).ok());
    ASSERT_EQ(queues.size(), 2u);
    EXPECT_EQ(queues[1].documents, 3);
    EXPECT_EQ(queues[1].tokens, 7);
    store.reset();

    Db db = OpenRaw(path, SQLITE_OPEN_READONLY);
    EXPECT_EQ(QueryInt(db.get(), "PRAGMA user_version"), SchemaVersion());
    EXPECT_EQ(QueryInt(db.get(), "PRAGMA application_id"), kApplicationId);
  }
}

TEST(SchemaTest, MigratingStepByStepGivesTheSchemaOfCreate) {
  TempDir dir;
  std::vector<std::string> want;
  {
    std::unique_ptr<Store> store;
    ASSERT_TRUE(Store::Create(dir.File("created.db"), {}, &store).ok());
    store.reset();
    Db db = OpenRaw(dir.File("created.db"), SQLITE_OPEN_READONLY);
    want = SchemaOf(db.get());
  }
  ASSERT_FALSE(want.empty());
  for (int k = 0; k <= SchemaVersion(); ++k) {
    SCOPED_TRACE(testing::Message() << "through version " << k);
    Db db = OpenFresh(dir.File("step" + std::to_string(k) + ".db"));
    ASSERT_TRUE(Migrate(db.get(), k).ok());
    EXPECT_EQ(QueryInt(db.get(), "PRAGMA user_version"), k);
    // Migration 1 stamps the application id.
    EXPECT_EQ(QueryInt(db.get(), "PRAGMA application_id"),
              k >= 1 ? kApplicationId : 0);
    ASSERT_TRUE(Migrate(db.get(), SchemaVersion()).ok());
    EXPECT_EQ(QueryInt(db.get(), "PRAGMA user_version"), SchemaVersion());
    EXPECT_EQ(QueryInt(db.get(), "PRAGMA application_id"), kApplicationId);
    EXPECT_EQ(SchemaOf(db.get()), want);
  }
}

TEST(SchemaTest, MigrateToTheCurrentVersionAgainDoesNothing) {
  TempDir dir;
  Db db = OpenFresh(dir.File("twice.db"));
  ASSERT_TRUE(Migrate(db.get(), SchemaVersion()).ok());
  const std::vector<std::string> once = SchemaOf(db.get());
  ASSERT_TRUE(Migrate(db.get(), SchemaVersion()).ok());
  EXPECT_EQ(SchemaOf(db.get()), once);
  EXPECT_EQ(QueryInt(db.get(), "PRAGMA user_version"), SchemaVersion());
}

TEST(SchemaTest, CreateInAMissingFolderFailsAndLeavesNothing) {
  TempDir dir;
  const std::string path = dir.File("no-such-folder/intake.db");
  std::unique_ptr<Store> store;
  Status s = Store::Create(path, {}, &store);
  ASSERT_FALSE(s.ok());
  EXPECT_EQ(store, nullptr);
  EXPECT_NE(s.message().find(path), std::string::npos) << s.message();
  EXPECT_NE(s.message().find("No such file or directory"), std::string::npos)
      << s.message();
  EXPECT_EQ(s.message().find('\n'), std::string::npos);
  EXPECT_TRUE(dir.Entries().empty());
}

}  // namespace
}  // namespace chute
