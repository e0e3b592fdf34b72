// Tests of the kept text (store/store_text.cc): what learn and correct keep,
// reading it back for a rebuild, and purge, whose erasure is checked in the
// raw bytes of the store files.
#include <gtest/gtest.h>

#include <cstdio>
#include <filesystem>
#include <memory>
#include <optional>
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
using testing_files::ReadFile;
using testing_files::TempDir;

constexpr char kMay[] = "2026-05-01T09:30:00Z";
constexpr char kJune[] = "2026-06-01T09:30:00Z";
const ChangeInfo kChange{"2026-07-01T08:00:00Z", "reviewer-1"};

std::string Digest(unsigned n) { return testing_files::NumberedDigest(n); }

struct Doc {
  std::string digest;
  std::string queue;
  std::string text;
  std::vector<std::string> terms;
};

std::vector<Doc> Letters() {
  return {
      {Digest(1),
       "berths",
       "Please book berth 4 for the Aurora.",
       {"book", "berth", "aurora"}},
      {Digest(2), "billing", "Invoice 4471 is unpaid.", {"invoice", "unpaid"}},
      {Digest(3),
       "berths",
       "Berth 2, two nights, from Friday.",
       {"berth", "nights", "friday"}},
  };
}

std::string Pack(const std::string& text) {
  std::string packed;
  EXPECT_TRUE(PackText(text, &packed).ok());
  return packed;
}

// How often needle occurs in the bytes of file (0 for a missing file).
size_t Occurrences(const std::string& file, const std::string& needle) {
  const std::string bytes = ReadFile(file);
  size_t n = 0;
  for (size_t at = bytes.find(needle); at != std::string::npos;
       at = bytes.find(needle, at + 1)) {
    ++n;
  }
  return n;
}

class StoreTextTest : public testing::Test {
 protected:
  std::unique_ptr<Store> Create(bool keep_text,
                                const std::string& name = "s.db") {
    StoreSettings settings;
    settings.keep_text = keep_text;
    std::unique_ptr<Store> store;
    Status s = Store::Create(dir_.File(name), settings, &store);
    EXPECT_TRUE(s.ok()) << s.message();
    return store;
  }

  // Learns docs at `now`, each with its packed text.
  static void Learn(Store* store, const std::vector<Doc>& docs,
                    const std::string& now) {
    LearnBatch batch;
    for (const Doc& d : docs) {
      batch.Add(d.digest, d.queue, "/inbox/" + d.digest.substr(60) + ".txt",
                d.terms, Pack(d.text));
    }
    LearnResult result;
    Status s = store->Learn(batch, {now, "tester"}, &result);
    ASSERT_TRUE(s.ok()) << s.message();
    ASSERT_EQ(result.learned, static_cast<int64_t>(docs.size()));
  }

  static std::vector<LedgerText> Texts(Store* store) {
    std::vector<LedgerText> out;
    Status s = store->ReadLedgerTexts([&](const LedgerText& t) {
      out.push_back(t);
      return Status::Ok();
    });
    EXPECT_TRUE(s.ok()) << s.message();
    return out;
  }

  TempDir dir_;
};

TEST_F(StoreTextTest, LearnedTextsComeBackInLedgerOrder) {
  std::unique_ptr<Store> store = Create(true);
  std::vector<Doc> docs = Letters();
  Learn(store.get(), {docs[0], docs[1]}, kMay);
  Learn(store.get(), {docs[2]}, kJune);
  std::vector<LedgerText> texts = Texts(store.get());
  ASSERT_EQ(texts.size(), 3u);
  for (size_t i = 0; i < texts.size(); ++i) {
    EXPECT_EQ(texts[i].digest, docs[i].digest);
    EXPECT_EQ(texts[i].queue, docs[i].queue);
    EXPECT_TRUE(texts[i].in_model);
    EXPECT_EQ(texts[i].learned_at, i < 2 ? kMay : kJune);
    ASSERT_TRUE(texts[i].text.has_value());
    EXPECT_EQ(*texts[i].text, docs[i].text);
    if (i > 0) {
      EXPECT_GT(texts[i].ledger_id, texts[i - 1].ledger_id);
    }
  }
}

TEST_F(StoreTextTest, AStoreThatKeepsNoTextStoresNone) {
  std::unique_ptr<Store> store = Create(false);
  Learn(store.get(), Letters(), kMay);  // texts packed, but not kept
  std::vector<LedgerText> texts = Texts(store.get());
  ASSERT_EQ(texts.size(), 3u);
  for (const LedgerText& t : texts)
    EXPECT_FALSE(t.text.has_value()) << t.digest;
  auto raw = OpenRaw(store->path(), SQLITE_OPEN_READONLY);
  EXPECT_EQ(
      QueryInt(raw.get(), "SELECT COUNT(*) FROM ledger WHERE text IS NOT NULL"),
      0);
}

TEST_F(StoreTextTest, ADocumentAddedWithoutTextHasNone) {
  std::unique_ptr<Store> store = Create(true);
  LearnBatch batch;
  batch.Add(Digest(7), "billing", "/inbox/7.txt", {"dues"});  // no packed text
  LearnResult result;
  ASSERT_TRUE(store->Learn(batch, {kMay, "tester"}, &result).ok());
  std::vector<LedgerText> texts = Texts(store.get());
  ASSERT_EQ(texts.size(), 1u);
  EXPECT_FALSE(texts[0].text.has_value());
}

TEST_F(StoreTextTest, CorrectKeepsTheTextOfTheDocumentsItLearns) {
  std::unique_ptr<Store> store = Create(true);
  std::vector<Doc> docs = Letters();
  Learn(store.get(), {docs[0]}, kMay);
  LearnBatch batch;
  batch.Add(docs[1].digest, docs[1].queue, "/inbox/new.txt", docs[1].terms,
            Pack(docs[1].text));
  CorrectResult result;
  ASSERT_TRUE(
      store->Correct({{docs[0].digest, "billing"}}, batch, kChange, &result)
          .ok());
  std::vector<LedgerText> texts = Texts(store.get());
  ASSERT_EQ(texts.size(), 2u);
  // The moved document keeps its text; the new one has its own.
  EXPECT_EQ(texts[0].queue, "billing");
  EXPECT_EQ(texts[0].text.value_or(""), docs[0].text);
  EXPECT_EQ(texts[1].text.value_or(""), docs[1].text);
}

// A rollback keeps a document in the ledger for history (in_model false)
// with its text; learning it again brings it back into the model under the
// same ledger entry, and a batch without text does not erase the kept one.
TEST_F(StoreTextTest, ADocumentKeptForHistoryKeepsItsTextAndReentersWithIt) {
  std::unique_ptr<Store> store = Create(true);
  std::vector<Doc> docs = Letters();
  Learn(store.get(), {docs[0]}, kMay);
  VersionInfo before;
  ASSERT_TRUE(store->CurrentVersion(&before).ok());
  Learn(store.get(), {docs[1]}, kMay);
  RollbackResult rolled;
  ASSERT_TRUE(store->Rollback(before.version, kChange, &rolled).ok());
  std::vector<LedgerText> texts = Texts(store.get());
  ASSERT_EQ(texts.size(), 2u);
  EXPECT_TRUE(texts[0].in_model);
  EXPECT_FALSE(texts[1].in_model);
  EXPECT_EQ(texts[1].text.value_or(""), docs[1].text);

  LearnBatch batch;
  batch.Add(docs[1].digest, docs[1].queue, "/inbox/again.txt", docs[1].terms);
  LearnResult result;
  ASSERT_TRUE(store->Learn(batch, {kJune, "tester"}, &result).ok());
  ASSERT_EQ(result.learned, 1);
  std::vector<LedgerText> again = Texts(store.get());
  ASSERT_EQ(again.size(), 2u);
  EXPECT_EQ(again[1].ledger_id, texts[1].ledger_id);
  EXPECT_TRUE(again[1].in_model);
  EXPECT_EQ(again[1].learned_at, kJune);
  EXPECT_EQ(again[1].text.value_or(""), docs[1].text);
}

TEST_F(StoreTextTest, ReadLedgerTextsStopsAtTheFirstErrorOfTheCallback) {
  std::unique_ptr<Store> store = Create(true);
  Learn(store.get(), Letters(), kMay);
  int calls = 0;
  Status s = store->ReadLedgerTexts([&](const LedgerText&) {
    return ++calls == 2 ? Status::InvalidArgument("enough") : Status::Ok();
  });
  EXPECT_EQ(calls, 2);
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_EQ(s.message(), "enough");
}

TEST_F(StoreTextTest, ADamagedTextIsCorruptionNamingTheDocument) {
  std::unique_ptr<Store> store = Create(true);
  Learn(store.get(), Letters(), kMay);
  {
    auto raw = OpenRaw(store->path(), SQLITE_OPEN_READWRITE);
    ExecRaw(raw.get(),
            "UPDATE ledger SET text = substr(text, 1, length(text) - 2) WHERE "
            "digest = '" +
                Digest(2) + "'");
  }
  Status s =
      store->ReadLedgerTexts([](const LedgerText&) { return Status::Ok(); });
  EXPECT_EQ(s.code(), Status::Code::kCorruption);
  EXPECT_NE(s.message().find(Digest(2)), std::string::npos) << s.message();
  EXPECT_NE(s.message().find("does not unpack"), std::string::npos)
      << s.message();
}

// --- Purge -------------------------------------------------------------------

TEST_F(StoreTextTest, PurgeErasesTextAndPathOfOlderEntriesAndKeepsTheModel) {
  std::unique_ptr<Store> store = Create(true);
  std::vector<Doc> docs = Letters();
  Learn(store.get(), {docs[0], docs[1]}, kMay);
  Learn(store.get(), {docs[2]}, kJune);
  ModelCounts before;
  ASSERT_TRUE(store->LoadModelCounts(&before).ok());

  PurgeResult dry;
  ASSERT_TRUE(store->Purge(kJune, /*dry_run=*/true, &dry).ok());
  EXPECT_EQ(dry.entries, 2);
  EXPECT_EQ(Texts(store.get())[0].text.value_or(""),
            docs[0].text);  // unchanged

  PurgeResult result;
  ASSERT_TRUE(store->Purge(kJune, /*dry_run=*/false, &result).ok());
  EXPECT_TRUE(result.checkpointed);
  EXPECT_EQ(result.entries, 2);
  EXPECT_EQ(result.texts, 2);
  EXPECT_EQ(result.sources, 2);
  ASSERT_EQ(result.queues.size(), 2u);
  EXPECT_EQ(result.queues[0].name, "berths");
  EXPECT_EQ(result.queues[0].entries, 1);
  EXPECT_EQ(result.queues[1].name, "billing");
  EXPECT_EQ(result.queues[1].entries, 1);

  std::vector<LedgerText> texts = Texts(store.get());
  ASSERT_EQ(texts.size(), 3u);
  EXPECT_FALSE(texts[0].text.has_value());
  EXPECT_FALSE(texts[1].text.has_value());
  EXPECT_EQ(texts[2].text.value_or(""),
            docs[2].text);  // learned at the cutoff: kept
  // The counts stay learned.
  ModelCounts after;
  ASSERT_TRUE(store->LoadModelCounts(&after).ok());
  EXPECT_EQ(after.terms, before.terms);
  EXPECT_EQ(after.counts, before.counts);
  // The digest still names the document; its path no longer does.
  std::optional<LedgerEntry> found;
  ASSERT_TRUE(store->FindDocument(docs[0].digest, &found).ok());
  ASSERT_TRUE(found.has_value());
  EXPECT_EQ(found->source, "");
  Resolution r;
  ASSERT_TRUE(store->ResolveDocument({"", "/inbox/0001.txt", ""}, &r).ok());
  EXPECT_EQ(r.kind, Resolution::Kind::kUnknown);
  ASSERT_TRUE(store->ResolveDocument({"", "/inbox/0003.txt", ""}, &r).ok());
  EXPECT_EQ(r.kind, Resolution::Kind::kFound);

  // A second purge finds nothing left to purge.
  PurgeResult again;
  ASSERT_TRUE(store->Purge(kJune, /*dry_run=*/false, &again).ok());
  EXPECT_EQ(again.entries, 0);
  EXPECT_TRUE(again.queues.empty());
}

TEST_F(StoreTextTest, PurgeWithoutKeptTextErasesThePaths) {
  std::unique_ptr<Store> store = Create(false);
  Learn(store.get(), Letters(), kMay);
  PurgeResult result;
  ASSERT_TRUE(store->Purge(kJune, /*dry_run=*/false, &result).ok());
  EXPECT_EQ(result.entries, 3);
  EXPECT_EQ(result.texts, 0);
  EXPECT_EQ(result.sources, 3);
}

TEST_F(StoreTextTest, PurgeRefusesACutoffNotInTheLedgersForm) {
  std::unique_ptr<Store> store = Create(true);
  Learn(store.get(), Letters(), kMay);
  for (const char* bad :
       {"", "2026-06-01", "2026-06-01T09:30:00+01:00", "2026-06-01T09:30:00.5Z",
        "2026-06-01 09:30:00Z", "later"}) {
    PurgeResult result;
    Status s = store->Purge(bad, /*dry_run=*/false, &result);
    EXPECT_EQ(s.code(), Status::Code::kInvalidArgument) << bad;
  }
  EXPECT_EQ(Texts(store.get())[0].text.value_or(""), Letters()[0].text);
}

// The planted word is in a document's text and its source path, and the
// document's compressed text is a blob of the store; after purge, neither
// the word nor the blob is in the store file, its -wal or its -shm file,
// while the connection is still open. (The word is not one of the terms:
// purge keeps the counts, and so the terms.)
TEST_F(StoreTextTest, PurgeLeavesNoByteOfTheTextOrPathInTheFilesOrTheLog) {
  const std::string planted = "zqxpurgeplant5678";
  std::unique_ptr<Store> store = Create(true);
  std::vector<Doc> docs = Letters();
  docs[1].text =
      "Invoice 4471 is unpaid; write to " + planted + " at the harbour office.";
  LearnBatch batch;
  const std::string packed = Pack(docs[1].text);
  for (const Doc& d : docs) {
    batch.Add(d.digest, d.queue,
              d.digest == docs[1].digest ? "/inbox/" + planted + ".txt"
                                         : "/inbox/other.txt",
              d.terms, Pack(d.text));
  }
  LearnResult learned;
  ASSERT_TRUE(store->Learn(batch, {kMay, "tester"}, &learned).ok());
  const std::string db = store->path();
  auto count = [&](const std::string& needle) {
    size_t n = 0;
    for (const char* suffix : {"", "-wal", "-shm"})
      n += Occurrences(db + suffix, needle);
    return n;
  };
  // The test first sees what it looks for: the path (in the row and the
  // index on source), the text inside the compressed blob, the blob.
  ASSERT_GE(count(planted), 2u);
  ASSERT_GE(count(packed), 1u);

  PurgeResult result;
  ASSERT_TRUE(store->Purge(kJune, /*dry_run=*/false, &result).ok());
  EXPECT_EQ(result.entries, 3);
  EXPECT_TRUE(result.checkpointed);
  ASSERT_TRUE(std::filesystem::exists(db + "-wal"));
  EXPECT_EQ(std::filesystem::file_size(db + "-wal"), 0u);
  EXPECT_EQ(count(planted), 0u);
  EXPECT_EQ(count(packed), 0u);
  // The counts and digest stay.
  EXPECT_NE(ReadFile(db).find(docs[1].digest), std::string::npos);
}

}  // namespace
}  // namespace chute
