// Tests of the integrity check (store/check.h): a consistent store passes
// every check, and each invariant broken on its own by raw SQL gives exactly
// that check's finding.
#include "store/check.h"

#include <gtest/gtest.h>

#include <memory>
#include <set>
#include <string>
#include <vector>

#include "store/store.h"
#include "store/text_codec.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

using testing_files::ExecRaw;
using testing_files::OpenRaw;
using testing_files::QueryInt;
using testing_files::TempDir;
using testing_files::WriteFile;

const std::set<std::string> kAllChecks = {
    "sqlite_integrity", "foreign_keys",       "settings",        "queue_names",
    "ledger_blobs",     "ledger_tokens",      "counts_positive", "vocabulary",
    "queue_totals",     "counts_match_ledger", "history",       "fingerprint",
    "ledger_text"};

std::string Digest(unsigned n) {
  char buf[65];
  std::snprintf(buf, sizeof buf, "%064x", n);
  return buf;
}

class CheckTest : public ::testing::Test {
 protected:
  void SetUp() override {
    path_ = dir_.File("intake.db");
    std::unique_ptr<Store> store;
    ASSERT_TRUE(Store::Create(path_, StoreSettings{}, &store).ok());
    LearnBatch batch;
    // "permit" occurs in both queues; "harbour" and "lorry" in one each.
    // Two documents with kept text, one without.
    ASSERT_TRUE(PackText("permit harbour permit", &packed_).ok());
    std::string packed_b;
    ASSERT_TRUE(PackText("permit, berth", &packed_b).ok());
    batch.Add(Digest(1), "permits", "a.txt", {"permit", "harbour", "permit"}, packed_);
    batch.Add(Digest(2), "permits", "b.txt", {"permit", "berth"}, packed_b);
    batch.Add(Digest(3), "freight", "c.txt",
              {"lorry", "permit", "lorry", "crane"});
    LearnResult result;
    ASSERT_TRUE(store->Learn(batch, {"2026-05-01T09:30:00Z", "tester"}, &result).ok());
    ASSERT_EQ(result.learned, 3);
  }

  // Runs SQL on the store from outside, with CHECK constraints off, so that
  // the test can write what chute never would.
  void Damage(const std::string& sql) {
    auto db = OpenRaw(path_, SQLITE_OPEN_READWRITE);
    ExecRaw(db.get(), "PRAGMA ignore_check_constraints = ON");
    ExecRaw(db.get(), sql);
  }

  int64_t Query(const std::string& sql) {
    auto db = OpenRaw(path_, SQLITE_OPEN_READWRITE);
    return QueryInt(db.get(), sql);
  }

  CheckReport Check() {
    CheckReport report;
    Status s = CheckStore(path_, &report);
    EXPECT_TRUE(s.ok()) << s.message();
    return report;
  }

  // The names of the checks with findings.
  static std::set<std::string> Failing(const CheckReport& report) {
    std::set<std::string> names;
    for (const CheckLine& l : report.lines) {
      if (!l.ok) names.insert(l.check);
    }
    return names;
  }

  static std::string Findings(const CheckReport& report) {
    std::string text;
    for (const CheckLine& l : report.lines) {
      if (!l.ok) text += l.check + ": " + l.detail + "\n";
    }
    return text;
  }

  TempDir dir_;
  std::string path_;
  std::string packed_;  // the kept text of Digest(1)
};

TEST_F(CheckTest, ConsistentStorePassesEveryCheckOnce) {
  CheckReport report = Check();
  EXPECT_TRUE(report.consistent()) << Findings(report);
  std::multiset<std::string> names;
  for (const CheckLine& l : report.lines) {
    EXPECT_TRUE(l.ok);
    EXPECT_FALSE(l.detail.empty());
    names.insert(l.check);
  }
  EXPECT_EQ(names,
            std::multiset<std::string>(kAllChecks.begin(), kAllChecks.end()));
  EXPECT_EQ(report.documents, 3);
  EXPECT_EQ(report.queues, 2);
  EXPECT_EQ(report.terms, 5);  // permit harbour berth lorry crane
  for (const CheckLine& l : report.lines) {
    if (l.check == "ledger_text") {
      EXPECT_EQ(l.detail, "all 2 kept texts unpack (1 entry keeps no text)");
    }
  }
}

TEST_F(CheckTest, MissingFileIsAnErrorNotAReport) {
  CheckReport report;
  Status s = CheckStore(dir_.File("none.db"), &report);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  EXPECT_NE(s.message().find("none.db"), std::string::npos);
}

TEST_F(CheckTest, FileThatIsNotAStoreIsAnErrorNotAReport) {
  WriteFile(dir_.File("notes.txt"), "not a database at all, just some words\n");
  CheckReport report;
  Status s = CheckStore(dir_.File("notes.txt"), &report);
  EXPECT_EQ(s.code(), Status::Code::kCorruption);
  EXPECT_NE(s.message().find("not a chute store"), std::string::npos)
      << s.message();
}

TEST_F(CheckTest, IndexThatDisagreesWithItsTableFailsSqliteIntegrity) {
  // Redefine the index over another column: its entries no longer match the
  // rows (the writable_schema route of SQLite's own tests).
  Damage(
      "PRAGMA writable_schema = ON; UPDATE sqlite_schema SET sql = "
      "'CREATE INDEX ledger_by_queue ON ledger(source)' WHERE name = "
      "'ledger_by_queue'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), std::set<std::string>{"sqlite_integrity"})
      << Findings(report);
}

TEST_F(CheckTest, CountNamingAMissingQueueIsAnOrphan) {
  Damage(
      "INSERT INTO counts(term_id, queue_id, n) "
      "SELECT id, 999, 4 FROM terms WHERE text = 'permit'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), std::set<std::string>{"foreign_keys"})
      << Findings(report);
  EXPECT_NE(Findings(report).find(
                "1 row of counts names a queue that does not exist"),
            std::string::npos)
      << Findings(report);
}

TEST_F(CheckTest, UnusableSettingFailsSettings) {
  Damage("UPDATE settings SET value = 'sometimes' WHERE key = 'bigrams'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"settings", "fingerprint"}))
      << Findings(report);
  EXPECT_NE(Findings(report).find("bigrams"), std::string::npos);
}

TEST_F(CheckTest, MissingSettingFailsSettings) {
  Damage("DELETE FROM settings WHERE key = 'alpha'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"settings", "fingerprint"}))
      << Findings(report);
}

TEST_F(CheckTest, HandSetPriorsAboveOneFailSettings) {
  Damage("UPDATE queues SET set_prior = 0.6");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"settings", "fingerprint"}))
      << Findings(report);
  EXPECT_NE(Findings(report).find("sum to more than 1"), std::string::npos);
}

TEST_F(CheckTest, InvalidQueueNameFailsQueueNames) {
  Damage("UPDATE queues SET name = '_review' WHERE name = 'freight'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"queue_names", "fingerprint"}))
      << Findings(report);
}

TEST_F(CheckTest, LedgerBlobThatDoesNotDecodeFailsLedgerBlobs) {
  Damage("UPDATE ledger SET term_counts = x'ff' WHERE digest = '" + Digest(2) +
         "'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), std::set<std::string>{"ledger_blobs"})
      << Findings(report);
  EXPECT_NE(Findings(report).find(Digest(2)), std::string::npos);
}

TEST_F(CheckTest, KeptTextThatDoesNotUnpackFailsLedgerText) {
  // Digest(1): its checksum no longer matches; Digest(2): not zstd at all.
  std::string hex;
  for (size_t i = 0; i < packed_.size(); ++i) {
    unsigned char c = static_cast<unsigned char>(packed_[i]);
    if (i + 1 == packed_.size()) c ^= 0x01;
    char buf[3];
    std::snprintf(buf, sizeof buf, "%02x", c);
    hex += buf;
  }
  Damage("UPDATE ledger SET text = x'" + hex + "' WHERE digest = '" + Digest(1) +
         "';"
         "UPDATE ledger SET text = x'00ff' WHERE digest = '" + Digest(2) + "'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), std::set<std::string>{"ledger_text"})
      << Findings(report);
  EXPECT_NE(Findings(report).find(Digest(1)), std::string::npos);
  EXPECT_NE(Findings(report).find(Digest(2)), std::string::npos);
}

TEST_F(CheckTest, LedgerTokensUnlikeItsTermsFailLedgerTokens) {
  // The entry and its queue both claim one more token, so only the entry's
  // own sum disagrees.
  Damage("UPDATE ledger SET tokens = tokens + 1 WHERE digest = '" + Digest(3) +
         "';"
         "UPDATE queues SET tokens = tokens + 1 WHERE name = 'freight'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"ledger_tokens", "fingerprint"}))
      << Findings(report);
}

TEST_F(CheckTest, ZeroCountRowFailsCountsPositive) {
  // 'lorry' was never learned for permits; a zero row for it breaks chute's
  // rule (no zero rows) and the table's CHECK (n > 0), which SQLite's own
  // integrity_check reports as well.
  Damage(
      "INSERT INTO counts(term_id, queue_id, n) SELECT t.id, q.id, 0 "
      "FROM terms t, queues q WHERE t.text = 'lorry' AND q.name = 'permits'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report),
            (std::set<std::string>{"counts_positive", "sqlite_integrity"}))
      << Findings(report);
}

TEST_F(CheckTest, NegativeCountRowFailsCountsPositive) {
  Damage(
      "INSERT INTO counts(term_id, queue_id, n) SELECT t.id, q.id, -2 "
      "FROM terms t, queues q WHERE t.text = 'harbour' AND q.name = 'freight'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report),
            (std::set<std::string>{"counts_positive", "sqlite_integrity"}))
      << Findings(report);
  EXPECT_NE(Findings(report).find("is -2"), std::string::npos);
}

TEST_F(CheckTest, TermWithoutCountsFailsVocabulary) {
  Damage("INSERT INTO terms(text) VALUES('ghost')");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), std::set<std::string>{"vocabulary"})
      << Findings(report);
  EXPECT_NE(Findings(report).find("'ghost'"), std::string::npos);
}

TEST_F(CheckTest, QueueDocumentsUnlikeTheLedgerFailQueueTotals) {
  Damage("UPDATE queues SET documents = documents + 1 WHERE name = 'permits'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"queue_totals", "fingerprint"}))
      << Findings(report);
}

TEST_F(CheckTest, QueueTokensUnlikeTheLedgerFailQueueTotals) {
  Damage("UPDATE queues SET tokens = tokens - 1 WHERE name = 'freight'");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"queue_totals", "fingerprint"}))
      << Findings(report);
}

TEST_F(CheckTest, CountUnlikeTheLedgerFailsCountsMatchLedger) {
  Damage(
      "UPDATE counts SET n = n + 1 WHERE term_id = (SELECT id FROM terms WHERE "
      "text = "
      "'permit') AND queue_id = (SELECT id FROM queues WHERE name = "
      "'freight')");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"counts_match_ledger", "fingerprint"}))
      << Findings(report);
  EXPECT_NE(Findings(report).find(
                "the counts say 2, the queue's ledger entries sum to 1"),
            std::string::npos)
      << Findings(report);
}

TEST_F(CheckTest, CountRowMissingFailsCountsMatchLedger) {
  // 'permit' keeps its count in permits, so the vocabulary stays whole.
  Damage(
      "DELETE FROM counts WHERE term_id = (SELECT id FROM terms WHERE text = "
      "'permit') "
      "AND queue_id = (SELECT id FROM queues WHERE name = 'freight')");
  CheckReport report = Check();
  EXPECT_EQ(Failing(report), (std::set<std::string>{"counts_match_ledger", "fingerprint"}))
      << Findings(report);
  EXPECT_NE(Findings(report).find("the counts have no row"), std::string::npos);
}

TEST_F(CheckTest, ManyFindingsAreListedUpToTheLimitThenSummed) {
  std::string sql;
  for (int i = 0; i < kMaxFindingsPerCheck + 5; ++i) {
    sql += "INSERT INTO terms(text) VALUES('ghost" + std::to_string(i) + "');";
  }
  Damage(sql);
  CheckReport report = Check();
  int listed = 0;
  std::string last;
  for (const CheckLine& l : report.lines) {
    if (l.check == "vocabulary") {
      ++listed;
      last = l.detail;
    }
  }
  EXPECT_EQ(listed, kMaxFindingsPerCheck + 1);
  EXPECT_EQ(last, "... and 5 more like these");
}

TEST_F(CheckTest, CheckChangesNothing) {
  int64_t before = Query("SELECT COUNT(*) FROM counts");
  Damage("UPDATE queues SET documents = documents + 1 WHERE name = 'permits'");
  Check();
  EXPECT_EQ(Query("SELECT COUNT(*) FROM counts"), before);
  EXPECT_EQ(Query("SELECT documents FROM queues WHERE name = 'permits'"), 3);
}

}  // namespace
}  // namespace chute
