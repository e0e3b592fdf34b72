// Tests of the store (store/store.h): creating and opening files, settings,
// learning batches into the counts and the ledger, hand-set priors.
#include "store/store.h"

#include <gtest/gtest.h>
#include <sys/stat.h>

#include <cstdint>
#include <cstdio>
#include <map>
#include <memory>
#include <optional>
#include <random>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include "store/schema.h"
#include "store/term_counts_codec.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

using testing_files::Db;
using testing_files::ExecRaw;
using testing_files::OpenRaw;
using testing_files::QueryInt;
using testing_files::QueryText;
using testing_files::ReadFile;
using testing_files::TempDir;
using testing_files::WriteFile;

constexpr char kNow[] = "2026-05-01T09:30:00Z";

// A 64-hex-digit digest made from a number (the store does not check that
// it is a real SHA-256).
std::string Digest(unsigned n) {
  char buf[65];
  std::snprintf(buf, sizeof buf, "%064x", n);
  return buf;
}

struct Doc {
  std::string digest;
  std::string queue;
  std::vector<std::string> terms;
};

std::string SourceOf(const Doc& d) {
  return "inbox/" + d.digest.substr(56) + ".txt";
}

LearnBatch MakeBatch(const std::vector<Doc>& docs) {
  LearnBatch batch;
  for (const Doc& d : docs) batch.Add(d.digest, d.queue, SourceOf(d), d.terms);
  return batch;
}

// What the store should hold, counted the slow, obvious way.
class Expected {
 public:
  void Count(const Doc& d) {
    Totals& q = queues_[d.queue];
    ++q.documents;
    q.tokens += static_cast<int64_t>(d.terms.size());
    for (const std::string& t : d.terms) ++counts_[{d.queue, t}];
  }

  // Compares ListQueues and LoadModelCounts with what was counted.
  void Check(Store* store) const {
    std::vector<QueueInfo> queues;
    ASSERT_TRUE(store->ListQueues(&queues).ok());
    ASSERT_EQ(queues.size(), queues_.size());
    auto it = queues_.begin();
    for (const QueueInfo& q : queues) {
      EXPECT_EQ(q.name, it->first);  // ordered by name (bytes)
      EXPECT_EQ(q.documents, it->second.documents) << q.name;
      EXPECT_EQ(q.tokens, it->second.tokens) << q.name;
      int64_t distinct = 0;
      for (const auto& [key, n] : counts_)
        distinct += key.first == q.name ? 1 : 0;
      EXPECT_EQ(q.distinct_terms, distinct) << q.name;
      ++it;
    }

    ModelCounts mc;
    ASSERT_TRUE(store->LoadModelCounts(&mc).ok());
    const size_t nq = mc.queues.size();
    ASSERT_EQ(nq, queues_.size());
    ASSERT_EQ(mc.counts.size(), mc.terms.size() * nq);
    std::vector<int64_t> column_sums(nq, 0);
    std::map<std::pair<std::string, std::string>, int64_t> got;
    std::set<std::string> distinct_terms;
    for (size_t row = 0; row < mc.terms.size(); ++row) {
      EXPECT_TRUE(distinct_terms.insert(mc.terms[row]).second)
          << "term twice: " << mc.terms[row];
      int64_t row_sum = 0;
      for (size_t q = 0; q < nq; ++q) {
        const int64_t n = mc.counts[row * nq + q];
        EXPECT_GE(n, 0);
        row_sum += n;
        column_sums[q] += n;
        if (n != 0) got[{mc.queues[q].name, mc.terms[row]}] = n;
      }
      // A vocabulary term has a non-zero count in some queue.
      EXPECT_GT(row_sum, 0) << mc.terms[row];
    }
    EXPECT_EQ(got, counts_);
    it = queues_.begin();
    for (size_t q = 0; q < nq; ++q, ++it) {
      EXPECT_EQ(mc.queues[q].name, it->first);
      EXPECT_EQ(mc.queues[q].documents, it->second.documents);
      EXPECT_EQ(mc.queues[q].tokens, it->second.tokens);
      // N(q) is the column sum of N(q, w).
      EXPECT_EQ(mc.queues[q].tokens, column_sums[q]) << mc.queues[q].name;
    }
  }

 private:
  struct Totals {
    int64_t documents = 0;
    int64_t tokens = 0;
  };
  std::map<std::string, Totals> queues_;
  std::map<std::pair<std::string, std::string>, int64_t> counts_;
};

class StoreTest : public testing::Test {
 protected:
  std::unique_ptr<Store> CreateStore(const StoreSettings& settings = {}) {
    std::unique_ptr<Store> store;
    Status s = Store::Create(path_, settings, &store);
    EXPECT_TRUE(s.ok()) << s.message();
    return store;
  }

  // Learns docs, expecting every one to be learned, and counts them.
  void LearnAll(Store* store, const std::vector<Doc>& docs) {
    LearnResult result;
    Status s = store->Learn(MakeBatch(docs), {kNow, "tester"}, &result);
    ASSERT_TRUE(s.ok()) << s.message();
    ASSERT_EQ(result.learned, static_cast<int64_t>(docs.size()));
    for (const Doc& d : docs) expected_.Count(d);
  }

  TempDir dir_;
  std::string path_ = dir_.File("intake.db");
  Expected expected_;
};

const std::vector<Doc>& FirstBatch() {
  static const std::vector<Doc> docs = {
      {Digest(1), "permits", {"berth", "permit", "permit", "harbour"}},
      {Digest(2), "permits", {"permit", "fee"}},
      {Digest(3), "berth-bookings", {"berth", "berth", "booking", "日本"}},
      {Digest(4), "Zölle", {"zoll", "fee", "fee"}},
  };
  return docs;
}

// --- Create and Open ---------------------------------------------------------

TEST_F(StoreTest, CreateMakesFileWithMode0600) {
  const mode_t old_mask = ::umask(0);  // the mode must not rely on the umask
  std::unique_ptr<Store> store = CreateStore();
  ::umask(old_mask);
  ASSERT_NE(store, nullptr);
  struct stat st;
  ASSERT_EQ(::stat(path_.c_str(), &st), 0);
  EXPECT_TRUE(S_ISREG(st.st_mode));
  EXPECT_EQ(st.st_mode & 0777, 0600u);
  // SQLite's side files, when present, take the mode of the database.
  for (const char* suffix : {"-wal", "-shm"}) {
    if (::stat((path_ + suffix).c_str(), &st) == 0) {
      EXPECT_EQ(st.st_mode & 0777, 0600u) << suffix;
    }
  }
  EXPECT_EQ(store->path(), path_);
}

TEST_F(StoreTest, CreateRefusesAnExistingPath) {
  WriteFile(path_, "precious");
  std::unique_ptr<Store> store;
  Status s = Store::Create(path_, {}, &store);
  ASSERT_FALSE(s.ok());
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_NE(s.message().find(path_), std::string::npos) << s.message();
  EXPECT_NE(s.message().find("already exists"), std::string::npos)
      << s.message();
  EXPECT_EQ(store, nullptr);
  EXPECT_EQ(ReadFile(path_), "precious");
  EXPECT_EQ(dir_.Entries(), (std::set<std::string>{"intake.db"}));
}

TEST_F(StoreTest, CreateRefusesAnExistingStore) {
  { CreateStore(); }
  std::unique_ptr<Store> again;
  Status s = Store::Create(path_, {}, &again);
  EXPECT_FALSE(s.ok());
  // The first store is intact.
  std::unique_ptr<Store> store;
  EXPECT_TRUE(Store::Open(path_, &store).ok());
}

TEST_F(StoreTest, OpenOfMissingPathIsNotFound) {
  std::unique_ptr<Store> store;
  Status s = Store::Open(path_, &store);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  EXPECT_NE(s.message().find(path_), std::string::npos) << s.message();
  EXPECT_EQ(store, nullptr);
  EXPECT_TRUE(dir_.Entries().empty());  // and nothing was created
}

TEST_F(StoreTest, OpenOfOtherFilesSaysNotAChuteStore) {
  std::mt19937 rng(99);
  std::string random_bytes(8192, '\0');
  for (char& c : random_bytes) c = static_cast<char>(rng());
  std::string text;
  for (int i = 0; i < 200; ++i)
    text += "Dear permits desk, please find attached.\n";

  struct Case {
    const char* what;
    std::string name;
    std::string bytes;
  };
  const Case cases[] = {
      {"a text file", "letter.txt", text},
      {"a short text file", "short.txt", "hi\n"},
      {"random bytes", "random.bin", random_bytes},
      {"an empty file", "empty.db", ""},
  };
  for (const Case& c : cases) {
    SCOPED_TRACE(c.what);
    const std::string path = dir_.File(c.name);
    WriteFile(path, c.bytes);
    std::unique_ptr<Store> store;
    Status s = Store::Open(path, &store);
    ASSERT_FALSE(s.ok());
    EXPECT_EQ(s.code(), Status::Code::kCorruption) << s.message();
    EXPECT_NE(s.message().find(path), std::string::npos) << s.message();
    EXPECT_NE(s.message().find("not a chute store"), std::string::npos)
        << s.message();
    EXPECT_EQ(s.message().find('\n'), std::string::npos);
    EXPECT_EQ(store, nullptr);
    // The file is left as it was, with no side files.
    EXPECT_EQ(ReadFile(path), c.bytes);
    EXPECT_EQ(dir_.Entries().count(c.name + "-wal"), 0u);
    EXPECT_EQ(dir_.Entries().count(c.name + "-journal"), 0u);
  }
}

TEST_F(StoreTest, OpenOfAnotherProgramsSqliteFileSaysNotAChuteStore) {
  {
    Db db = OpenRaw(path_, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE);
    ExecRaw(db.get(),
            "CREATE TABLE contacts(name TEXT, phone TEXT);"
            "INSERT INTO contacts VALUES('Ada', '555-0100');");
  }
  const std::string before = ReadFile(path_);
  std::unique_ptr<Store> store;
  Status s = Store::Open(path_, &store);
  ASSERT_FALSE(s.ok());
  EXPECT_EQ(s.code(), Status::Code::kCorruption);
  EXPECT_NE(s.message().find(path_), std::string::npos) << s.message();
  EXPECT_NE(s.message().find("not a chute store"), std::string::npos)
      << s.message();
  EXPECT_EQ(ReadFile(path_), before);
}

TEST_F(StoreTest, OpenOfAFolderSaysNotAChuteStore) {
  std::unique_ptr<Store> store;
  Status s = Store::Open(dir_.path(), &store);
  ASSERT_FALSE(s.ok());
  EXPECT_NE(s.message().find(dir_.path()), std::string::npos) << s.message();
  EXPECT_NE(s.message().find("not a chute store"), std::string::npos)
      << s.message();
}

TEST_F(StoreTest, OpenOfANewerSchemaIsRefused) {
  { CreateStore(); }
  {
    Db db = OpenRaw(path_, SQLITE_OPEN_READWRITE);
    ExecRaw(db.get(),
            "PRAGMA user_version = " + std::to_string(SchemaVersion() + 1));
  }
  std::unique_ptr<Store> store;
  Status s = Store::Open(path_, &store);
  ASSERT_FALSE(s.ok());
  EXPECT_NE(s.message().find(path_), std::string::npos) << s.message();
  EXPECT_NE(s.message().find("newer"), std::string::npos) << s.message();
  EXPECT_EQ(store, nullptr);
  // Not downgraded or touched.
  Db db = OpenRaw(path_, SQLITE_OPEN_READONLY);
  EXPECT_EQ(QueryInt(db.get(), "PRAGMA user_version"), SchemaVersion() + 1);
}

TEST_F(StoreTest, JournalModeIsWal) {
  { CreateStore(); }
  {
    Db db = OpenRaw(path_, SQLITE_OPEN_READONLY);
    EXPECT_EQ(QueryText(db.get(), "PRAGMA journal_mode"), "wal");
  }
  // Still after Store::Open.
  std::unique_ptr<Store> store;
  ASSERT_TRUE(Store::Open(path_, &store).ok());
  Db db = OpenRaw(path_, SQLITE_OPEN_READONLY);
  EXPECT_EQ(QueryText(db.get(), "PRAGMA journal_mode"), "wal");
}

TEST_F(StoreTest, CreateStampsApplicationIdAndSchemaVersion) {
  { CreateStore(); }
  Db db = OpenRaw(path_, SQLITE_OPEN_READONLY);
  EXPECT_EQ(QueryInt(db.get(), "PRAGMA application_id"), kApplicationId);
  EXPECT_EQ(QueryInt(db.get(), "PRAGMA user_version"), SchemaVersion());
}

// --- Settings ----------------------------------------------------------------

void ExpectSameSettings(const StoreSettings& got, const StoreSettings& want) {
  EXPECT_EQ(got.model.alpha, want.model.alpha);
  EXPECT_EQ(got.model.prior, want.model.prior);
  EXPECT_EQ(got.tokenizer.bigrams, want.tokenizer.bigrams);
  EXPECT_EQ(got.tokenizer.numbers, want.tokenizer.numbers);
  EXPECT_EQ(got.tokenizer.min_length, want.tokenizer.min_length);
  EXPECT_EQ(got.tokenizer.max_length, want.tokenizer.max_length);
  EXPECT_EQ(got.keep_text, want.keep_text);
}

TEST_F(StoreTest, SettingsRoundTrip) {
  StoreSettings settings;
  settings.model.alpha = 0.3;
  settings.model.prior = PriorMode::kUniform;
  settings.tokenizer.bigrams = true;
  settings.tokenizer.numbers = NumberMode::kFold;
  settings.tokenizer.min_length = 2;
  settings.tokenizer.max_length = 20;
  settings.keep_text = false;
  {
    std::unique_ptr<Store> store = CreateStore(settings);
    ASSERT_NE(store, nullptr);
    ExpectSameSettings(store->settings(), settings);
  }
  std::unique_ptr<Store> store;
  Status s = Store::Open(path_, &store);
  ASSERT_TRUE(s.ok()) << s.message();
  ExpectSameSettings(store->settings(), settings);
}

TEST_F(StoreTest, DefaultSettingsRoundTrip) {
  { CreateStore(); }
  std::unique_ptr<Store> store;
  ASSERT_TRUE(Store::Open(path_, &store).ok());
  ExpectSameSettings(store->settings(), StoreSettings{});
}

// --- Learn -------------------------------------------------------------------

TEST_F(StoreTest, LearnCountsABatch) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnResult result;
  Status s = store->Learn(MakeBatch(FirstBatch()), {kNow, "tester"}, &result);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(result.learned, 4);
  EXPECT_EQ(result.outcomes,
            std::vector<LearnOutcome>(4, LearnOutcome::kLearned));
  std::set<std::string> vocabulary;
  for (const Doc& d : FirstBatch()) {
    expected_.Count(d);
    vocabulary.insert(d.terms.begin(), d.terms.end());
  }
  EXPECT_EQ(result.new_terms, static_cast<int64_t>(vocabulary.size()));
  expected_.Check(store.get());

  // The same after closing and opening again.
  store.reset();
  ASSERT_TRUE(Store::Open(path_, &store).ok());
  expected_.Check(store.get());
}

TEST_F(StoreTest, LearnInSeveralBatchesAddsUp) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  LearnResult result;
  const std::vector<Doc> more = {
      {Digest(10), "permits", {"permit", "berth", "new-term"}},
      {Digest(11), "Zölle", {"zoll"}},
  };
  ASSERT_TRUE(store->Learn(MakeBatch(more), {kNow, "tester"}, &result).ok());
  EXPECT_EQ(result.learned, 2);
  EXPECT_EQ(result.new_terms, 1);  // only "new-term"
  for (const Doc& d : more) expected_.Count(d);
  expected_.Check(store.get());
}

TEST_F(StoreTest, VocabularySizeIsTheNumberOfDistinctTerms) {
  // |V| enters every θ(q, w): it must count each term once, whatever the
  // number of queues that use it.
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  int64_t size = -1;
  ASSERT_TRUE(store->VocabularySize(&size).ok());
  EXPECT_EQ(size, 0);
  LearnAll(store.get(), FirstBatch());
  std::set<std::string> vocabulary;
  for (const Doc& d : FirstBatch())
    vocabulary.insert(d.terms.begin(), d.terms.end());
  ASSERT_TRUE(store->VocabularySize(&size).ok());
  EXPECT_EQ(size, static_cast<int64_t>(vocabulary.size()));
  ModelCounts mc;
  ASSERT_TRUE(store->LoadModelCounts(&mc).ok());
  EXPECT_EQ(size, static_cast<int64_t>(mc.terms.size()));
}

TEST_F(StoreTest, LedgerRecordsEachDocument) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  for (const Doc& d : FirstBatch()) {
    std::optional<LedgerEntry> entry;
    ASSERT_TRUE(store->FindDocument(d.digest, &entry).ok());
    ASSERT_TRUE(entry.has_value()) << d.digest;
    EXPECT_EQ(entry->digest, d.digest);
    EXPECT_EQ(entry->queue, d.queue);
    EXPECT_EQ(entry->source, SourceOf(d));
    EXPECT_EQ(entry->learned_at, kNow);
    EXPECT_EQ(entry->tokens, static_cast<int64_t>(d.terms.size()));
  }
  std::optional<LedgerEntry> missing;
  ASSERT_TRUE(store->FindDocument(Digest(999), &missing).ok());
  EXPECT_FALSE(missing.has_value());
}

TEST_F(StoreTest, LedgerKeepsEachDocumentsOwnCounts) {
  // The blob lets a document be unlearned exactly: it must decode to the
  // document's own term counts.
  {
    std::unique_ptr<Store> store = CreateStore();
    ASSERT_NE(store, nullptr);
    LearnAll(store.get(), FirstBatch());
  }
  Db db = OpenRaw(path_, SQLITE_OPEN_READONLY);
  for (const Doc& d : FirstBatch()) {
    std::map<std::string, int64_t> own;
    for (const std::string& t : d.terms) ++own[t];
    const std::vector<TermCount> want(own.begin(), own.end());

    sqlite3_stmt* st = nullptr;
    ASSERT_EQ(sqlite3_prepare_v2(
                  db.get(), "SELECT term_counts FROM ledger WHERE digest = ?",
                  -1, &st, nullptr),
              SQLITE_OK);
    sqlite3_bind_text(st, 1, d.digest.c_str(), -1, SQLITE_TRANSIENT);
    ASSERT_EQ(sqlite3_step(st), SQLITE_ROW);
    const std::string blob(static_cast<const char*>(sqlite3_column_blob(st, 0)),
                           static_cast<size_t>(sqlite3_column_bytes(st, 0)));
    sqlite3_finalize(st);
    std::vector<TermCount> got;
    ASSERT_TRUE(DecodeTermCounts(blob, &got));
    EXPECT_EQ(got, want) << d.digest;
  }
}

TEST_F(StoreTest, ReadLedgerGivesEveryDocumentInLearningOrder) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  std::vector<LedgerDocument> seen;
  Status s = store->ReadLedger([&](LedgerDocument& d) { seen.push_back(d); });
  ASSERT_TRUE(s.ok()) << s.message();
  ASSERT_EQ(seen.size(), FirstBatch().size());
  for (size_t i = 0; i < seen.size(); ++i) {
    const Doc& d = FirstBatch()[i];
    std::map<std::string, int64_t> own;
    for (const std::string& t : d.terms) ++own[t];
    EXPECT_EQ(seen[i].digest, d.digest);
    EXPECT_EQ(seen[i].queue, d.queue);
    EXPECT_EQ(seen[i].source, SourceOf(d));
    EXPECT_EQ(seen[i].learned_at, kNow);
    EXPECT_EQ(seen[i].tokens, static_cast<int64_t>(d.terms.size()));
    EXPECT_EQ(seen[i].terms, std::vector<TermCount>(own.begin(), own.end()));
  }
}

// One snapshot: the counts handed back are the sum of the documents.
TEST_F(StoreTest, ReadCountsAndLedgerReadsOneConsistentSnapshot) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  ModelCounts counts;
  std::map<std::pair<std::string, std::string>, int64_t> summed;
  size_t documents = 0;
  Status s = store->ReadCountsAndLedger(&counts, [&](LedgerDocument& d) {
    ++documents;
    for (const auto& [term, n] : d.terms) summed[{d.queue, term}] += n;
  });
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(documents, FirstBatch().size());
  std::map<std::pair<std::string, std::string>, int64_t> from_counts;
  const size_t nq = counts.queues.size();
  for (size_t row = 0; row < counts.terms.size(); ++row) {
    for (size_t q = 0; q < nq; ++q) {
      if (int64_t n = counts.counts[row * nq + q]; n != 0) {
        from_counts[{counts.queues[q].name, counts.terms[row]}] = n;
      }
    }
  }
  EXPECT_EQ(from_counts, summed);
  // The snapshot is closed again: the store takes a write afterwards.
  LearnResult result;
  EXPECT_TRUE(store->Learn(MakeBatch({{Digest(99), "permits", {"pilot"}}}), {kNow, "tester"}, &result).ok());
}

TEST_F(StoreTest, ReadLedgerRefusesABlobThatDoesNotDecode) {
  {
    std::unique_ptr<Store> store = CreateStore();
    ASSERT_NE(store, nullptr);
    LearnAll(store.get(), FirstBatch());
  }
  {
    Db db = OpenRaw(path_, SQLITE_OPEN_READWRITE);
    ExecRaw(db.get(), "UPDATE ledger SET term_counts = x'05' WHERE id = 2");
  }
  std::unique_ptr<Store> store;
  ASSERT_TRUE(Store::Open(path_, &store).ok());
  Status s = store->ReadLedger([](LedgerDocument&) {});
  EXPECT_EQ(s.code(), Status::Code::kCorruption);
  EXPECT_NE(s.message().find("does not decode"), std::string::npos) << s.message();
}

TEST_F(StoreTest, SameDigestSameQueueIsAlreadyLearned) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  const Doc& again = FirstBatch()[0];
  LearnResult result;
  ASSERT_TRUE(
      store->Learn(MakeBatch({again}), {"2026-05-02T00:00:00Z", "tester"}, &result).ok());
  EXPECT_EQ(result.learned, 0);
  EXPECT_EQ(result.new_terms, 0);
  ASSERT_EQ(result.outcomes.size(), 1u);
  EXPECT_EQ(result.outcomes[0], LearnOutcome::kAlreadyLearned);
  EXPECT_EQ(result.known_queue[0], "permits");
  expected_.Check(store.get());  // counts unchanged
  std::optional<LedgerEntry> entry;
  ASSERT_TRUE(store->FindDocument(again.digest, &entry).ok());
  ASSERT_TRUE(entry.has_value());
  EXPECT_EQ(entry->learned_at, kNow);  // the first learning stands
}

TEST_F(StoreTest, SameDigestOtherQueueIsACorrection) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  // The same bytes, labelled for a queue that does not exist yet, then for
  // one that does: two corrections in a row. The stored counts move, not
  // the terms given with the batch.
  const Doc& first = FirstBatch()[0];
  const std::vector<Doc> relabelled = {
      {first.digest, "new-queue", first.terms},
      {first.digest, "Zölle", {"other", "terms"}},
  };
  LearnResult result;
  ASSERT_TRUE(store->Learn(MakeBatch(relabelled), {kNow, "tester"}, &result).ok());
  EXPECT_EQ(result.learned, 0);
  EXPECT_EQ(result.corrected, 2);
  EXPECT_EQ(result.new_terms, 0);
  EXPECT_EQ(result.outcomes,
            std::vector<LearnOutcome>(2, LearnOutcome::kCorrected));
  EXPECT_EQ(result.known_queue, (std::vector<std::string>{"permits", "new-queue"}));
  // The document's counts are now Zölle's; "new-queue", made for it and
  // left empty within the batch, is not kept.
  Expected moved;
  for (const Doc& d : FirstBatch()) {
    moved.Count(d.digest == first.digest ? Doc{d.digest, "Zölle", d.terms} : d);
  }
  moved.Check(store.get());
  std::optional<LedgerEntry> entry;
  ASSERT_TRUE(store->FindDocument(first.digest, &entry).ok());
  ASSERT_TRUE(entry.has_value());
  EXPECT_EQ(entry->queue, "Zölle");
}

TEST_F(StoreTest, DuplicateDigestInsideOneBatch) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  const std::vector<Doc> docs = {
      {Digest(1), "permits", {"permit", "fee"}},
      {Digest(1), "permits", {"permit", "fee"}},
      {Digest(2), "permits", {"berth"}},
      {Digest(2), "berth-bookings", {"berth"}},
      {Digest(3), "permits", {"x"}},
      {Digest(1), "moved-last", {"permit"}},
  };
  LearnResult result;
  ASSERT_TRUE(store->Learn(MakeBatch(docs), {kNow, "tester"}, &result).ok());
  EXPECT_EQ(result.outcomes,
            (std::vector<LearnOutcome>{
                LearnOutcome::kLearned, LearnOutcome::kAlreadyLearned,
                LearnOutcome::kLearned, LearnOutcome::kCorrected,
                LearnOutcome::kLearned, LearnOutcome::kCorrected}));
  EXPECT_EQ(
      result.known_queue,
      (std::vector<std::string>{"", "permits", "", "permits", "", "permits"}));
  EXPECT_EQ(result.learned, 3);
  EXPECT_EQ(result.corrected, 2);
  // The last label of each digest wins, with the first document's terms.
  expected_.Count({Digest(1), "moved-last", docs[0].terms});
  expected_.Count(docs[3]);
  expected_.Count(docs[4]);
  expected_.Check(store.get());
}

TEST_F(StoreTest, BatchWithAnInvalidQueueNameChangesNothing) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  const std::vector<Doc> docs = {
      {Digest(20), "fresh", {"fine"}},
      {Digest(21), "_review", {"reserved"}},
  };
  LearnResult result;
  Status s = store->Learn(MakeBatch(docs), {kNow, "tester"}, &result);
  ASSERT_FALSE(s.ok());
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_NE(s.message().find("_review"), std::string::npos) << s.message();
  // The whole batch is rolled back: no "fresh" queue, no new terms.
  expected_.Check(store.get());
  std::optional<LedgerEntry> entry;
  ASSERT_TRUE(store->FindDocument(Digest(20), &entry).ok());
  EXPECT_FALSE(entry.has_value());
}

TEST_F(StoreTest, EmptyBatchChangesNothing) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  LearnResult result;
  ASSERT_TRUE(store->Learn(LearnBatch(), {kNow, "tester"}, &result).ok());
  EXPECT_EQ(result.learned, 0);
  EXPECT_TRUE(result.outcomes.empty());
  expected_.Check(store.get());
}

// --- Priors ------------------------------------------------------------------

std::map<std::string, std::optional<double>> SetPriors(Store* store) {
  std::vector<QueueInfo> queues;
  EXPECT_TRUE(store->ListQueues(&queues).ok());
  std::map<std::string, std::optional<double>> out;
  for (const QueueInfo& q : queues) out[q.name] = q.set_prior;
  return out;
}

TEST_F(StoreTest, SetPriorOfUnknownQueueIsNotFound) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  Status s = store->SetPrior("no-such-queue", 0.1);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  EXPECT_NE(s.message().find("no-such-queue"), std::string::npos)
      << s.message();
  for (const auto& [name, prior] : SetPriors(store.get())) {
    EXPECT_FALSE(prior.has_value()) << name;
  }
}

TEST_F(StoreTest, SetPriorsMayNotSumPastOne) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  using Priors = std::map<std::string, std::optional<double>>;

  ASSERT_TRUE(store->SetPrior("permits", 0.6).ok());
  Status s = store->SetPrior("Zölle", 0.5);  // 0.6 + 0.5 > 1
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_NE(s.message().find("more than 1"), std::string::npos) << s.message();
  EXPECT_EQ(SetPriors(store.get()), (Priors{{"Zölle", std::nullopt},
                                            {"berth-bookings", std::nullopt},
                                            {"permits", 0.6}}));

  // Setting a queue's prior again replaces it rather than adding to it.
  ASSERT_TRUE(store->SetPrior("permits", 0.25).ok());
  ASSERT_TRUE(store->SetPrior("Zölle", 0.5).ok());
  // Exactly 1 is allowed: only more than 1 is refused.
  ASSERT_TRUE(store->SetPrior("berth-bookings", 0.25).ok());
  EXPECT_EQ(
      SetPriors(store.get()),
      (Priors{{"Zölle", 0.5}, {"berth-bookings", 0.25}, {"permits", 0.25}}));
}

TEST_F(StoreTest, SetPriorNulloptClearsIt) {
  std::unique_ptr<Store> store = CreateStore();
  ASSERT_NE(store, nullptr);
  LearnAll(store.get(), FirstBatch());
  ASSERT_TRUE(store->SetPrior("permits", 0.7).ok());
  ASSERT_TRUE(store->SetPrior("Zölle", 0.2).ok());
  ASSERT_TRUE(store->SetPrior("permits", std::nullopt).ok());
  // Cleared, so the room is free again.
  ASSERT_TRUE(store->SetPrior("berth-bookings", 0.7).ok());

  // The model counts carry the hand-set priors, also after reopening.
  store.reset();
  ASSERT_TRUE(Store::Open(path_, &store).ok());
  ModelCounts mc;
  ASSERT_TRUE(store->LoadModelCounts(&mc).ok());
  std::map<std::string, std::optional<double>> priors;
  for (const QueueCounts& q : mc.queues) priors[q.name] = q.set_prior;
  EXPECT_EQ(
      priors,
      (std::map<std::string, std::optional<double>>{
          {"Zölle", 0.2}, {"berth-bookings", 0.7}, {"permits", std::nullopt}}));
}

}  // namespace
}  // namespace chute
