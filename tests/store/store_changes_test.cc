// Tests of corrections, exact unlearning and document naming
// (store/store_changes.cc). Exactness is checked the direct way: a store
// that corrected or forgot must hold exactly the counts of a store that was
// built as if the change had been the truth from the start.
#include <gtest/gtest.h>

#include <algorithm>
#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <map>
#include <memory>
#include <random>
#include <string>
#include <vector>

#include "classify/model.h"
#include "store/check.h"
#include "store/store.h"
#include "store/text_codec.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

using testing_files::Db;
using testing_files::OpenRaw;
using testing_files::QueryInt;
using testing_files::TempDir;

const ChangeInfo kChange{"2026-05-01T09:30:00Z", "reviewer-1"};

struct Doc {
  std::string digest;
  std::string queue;
  std::vector<std::string> terms;
};

// A digest whose first eight hex digits are `head` (the store does not
// check that it is a real SHA-256).
std::string Digest(const char* head, unsigned n) {
  char buf[65];
  std::snprintf(buf, sizeof buf, "%s%056x", head, n);
  return buf;
}

std::string SourceOf(const Doc& d) {
  return "/inbox/" + d.digest.substr(0, 12) + ".txt";
}

// A seeded corpus: 40 documents over 4 queues, terms drawn from a skewed
// vocabulary of 60, so that some terms occur in one document only.
std::vector<Doc> Corpus() {
  std::mt19937 rng(20261202);
  auto draw = [&rng](unsigned n) { return static_cast<unsigned>(rng() % n); };
  const char* queues[] = {"berth-bookings", "billing", "marina", "permits"};
  std::vector<Doc> docs;
  for (unsigned i = 0; i < 40; ++i) {
    Doc d{Digest(i % 2 ? "a1b2c3d4" : "0f0f0f0f", i), queues[draw(4)], {}};
    const unsigned length = 3 + draw(12);
    for (unsigned k = 0; k < length; ++k) {
      unsigned t = draw(60);
      d.terms.push_back("t" + std::to_string(t * t % 61));
    }
    d.terms.push_back("only-in-" + std::to_string(i));  // a term of its own
    docs.push_back(std::move(d));
  }
  return docs;
}

// N(q, w) by (queue, term), with each queue's documents and N(q) under the
// term "" (no term is empty).
std::map<std::pair<std::string, std::string>, int64_t> ByName(
    const ModelCounts& mc) {
  std::map<std::pair<std::string, std::string>, int64_t> out;
  const size_t nq = mc.queues.size();
  for (size_t q = 0; q < nq; ++q) {
    out[{mc.queues[q].name, ""}] =
        mc.queues[q].documents * 1000000 + mc.queues[q].tokens;
    for (size_t row = 0; row < mc.terms.size(); ++row) {
      if (int64_t n = mc.counts[row * nq + q]; n != 0)
        out[{mc.queues[q].name, mc.terms[row]}] = n;
    }
  }
  return out;
}

class StoreChangesTest : public testing::Test {
 protected:
  // A store that learned docs in one batch.
  std::unique_ptr<Store> Build(const std::string& name,
                               const std::vector<Doc>& docs) {
    std::unique_ptr<Store> store;
    Status s = Store::Create(dir_.File(name), StoreSettings{}, &store);
    EXPECT_TRUE(s.ok()) << s.message();
    if (!s.ok()) return nullptr;
    LearnBatch batch;
    for (const Doc& d : docs)
      batch.Add(d.digest, d.queue, SourceOf(d), d.terms);
    LearnResult result;
    s = store->Learn(batch, {kChange.now, "tester"}, &result);
    EXPECT_TRUE(s.ok()) << s.message();
    return store;
  }

  static ModelCounts Counts(Store* store) {
    ModelCounts mc;
    Status s = store->LoadModelCounts(&mc);
    EXPECT_TRUE(s.ok()) << s.message();
    return mc;
  }

  // Same queues (names, documents, N(q), priors), same terms in the same
  // order, same counts, same |V|.
  static void ExpectSameModel(Store* got, Store* want) {
    ModelCounts a = Counts(got), b = Counts(want);
    ASSERT_EQ(a.queues.size(), b.queues.size());
    for (size_t q = 0; q < a.queues.size(); ++q) {
      EXPECT_EQ(a.queues[q].name, b.queues[q].name);
      EXPECT_EQ(a.queues[q].documents, b.queues[q].documents)
          << a.queues[q].name;
      EXPECT_EQ(a.queues[q].tokens, b.queues[q].tokens) << a.queues[q].name;
      EXPECT_EQ(a.queues[q].set_prior, b.queues[q].set_prior);
    }
    EXPECT_EQ(a.terms, b.terms);
    EXPECT_EQ(a.counts, b.counts);
    int64_t va = 0, vb = 0;
    ASSERT_TRUE(got->VocabularySize(&va).ok());
    ASSERT_TRUE(want->VocabularySize(&vb).ok());
    EXPECT_EQ(va, vb);
    EXPECT_EQ(va, static_cast<int64_t>(a.terms.size()));
    // And the scores, to the bit, for every document of the corpus.
    Model ma = Model::Build(a, ModelOptions{}),
          mb = Model::Build(b, ModelOptions{});
    for (const Doc& d : Corpus()) {
      DocumentRows ra, rb;
      int64_t ua = 0, ub = 0;
      ma.ToRows(d.terms, &ra, &ua);
      mb.ToRows(d.terms, &rb, &ub);
      std::vector<double> sa, sb;
      ma.Score(ra, &sa);
      mb.Score(rb, &sb);
      EXPECT_EQ(sa, sb) << d.digest;
      EXPECT_EQ(ua, ub);
    }
  }

  TempDir dir_;
};

TEST_F(StoreChangesTest,
       ForgetGivesTheModelOfAStoreThatNeverLearnedTheDocuments) {
  const std::vector<Doc> docs = Corpus();
  std::unique_ptr<Store> store = Build("all.db", docs);
  ASSERT_NE(store, nullptr);
  const std::vector<size_t> gone = {3, 17, 28};
  std::vector<Doc> kept;
  std::vector<std::string> digests;
  for (size_t i = 0; i < docs.size(); ++i) {
    bool forget = std::find(gone.begin(), gone.end(), i) != gone.end();
    (forget ? digests.push_back(docs[i].digest) : kept.push_back(docs[i]));
  }
  ForgetResult result;
  Status s = store->Forget(digests, kChange, &result);
  ASSERT_TRUE(s.ok()) << s.message();
  ASSERT_EQ(result.forgotten.size(), 3u);
  EXPECT_EQ(result.forgotten[1].digest, docs[17].digest);
  EXPECT_EQ(result.forgotten[1].queue, docs[17].queue);
  EXPECT_TRUE(result.checkpointed);
  // Each forgotten document took at least its own term with it.
  EXPECT_GE(result.removed_terms, 3);
  std::unique_ptr<Store> without = Build("without.db", kept);
  ASSERT_NE(without, nullptr);
  ExpectSameModel(store.get(), without.get());
  std::optional<LedgerEntry> entry;
  ASSERT_TRUE(store->FindDocument(docs[17].digest, &entry).ok());
  EXPECT_FALSE(entry.has_value());
}

// The model does not depend on the order in which documents were learned:
// a store that learned the corpus one document per batch, first to last,
// and then forgot some, has the model, to the bit, of a store that learned
// only the kept documents in one batch, last to first.
TEST_F(StoreChangesTest, ForgetMatchesAStoreThatLearnedTheRestInAnotherOrder) {
  const std::vector<Doc> docs = Corpus();
  std::unique_ptr<Store> store;
  ASSERT_TRUE(Store::Create(dir_.File("one-by-one.db"), StoreSettings{}, &store).ok());
  for (const Doc& d : docs) {
    LearnBatch batch;
    batch.Add(d.digest, d.queue, SourceOf(d), d.terms);
    LearnResult result;
    ASSERT_TRUE(store->Learn(batch, {kChange.now, "tester"}, &result).ok());
  }
  // Forget the first documents: they brought most terms into the store.
  std::vector<std::string> digests;
  std::vector<Doc> kept;
  for (size_t i = 0; i < docs.size(); ++i) {
    (i < 5 ? digests.push_back(docs[i].digest) : kept.push_back(docs[i]));
  }
  ForgetResult result;
  ASSERT_TRUE(store->Forget(digests, kChange, &result).ok());
  std::reverse(kept.begin(), kept.end());
  std::unique_ptr<Store> reversed = Build("reversed.db", kept);
  ASSERT_NE(reversed, nullptr);
  ExpectSameModel(store.get(), reversed.get());
}

// The planted word (a term, part of the source path and of the kept text)
// is in the store file or its write-ahead log after learning, and in
// neither file, nor the -shm file, after forgetting, while the connection
// is still open. The kept text is compressed, so the test looks for its
// compressed blob too.
TEST_F(StoreChangesTest, ForgetLeavesNoByteOfTheDocumentInTheFilesOrTheLog) {
  const std::string planted = "zqxunique1234";
  std::vector<Doc> docs = Corpus();
  docs[9].terms.push_back(planted);
  std::string packed;  // the kept text of docs[9]
  ASSERT_TRUE(PackText("A letter from " + planted + " about the berth.", &packed).ok());
  std::unique_ptr<Store> store;
  ASSERT_TRUE(Store::Create(dir_.File("s.db"), StoreSettings{}, &store).ok());
  ASSERT_TRUE(store->settings().keep_text);
  LearnBatch batch;
  for (const Doc& d : docs) {
    const bool it = d.digest == docs[9].digest;
    batch.Add(d.digest, d.queue, it ? "/inbox/" + planted + ".txt" : SourceOf(d),
              d.terms, it ? packed : std::string());
  }
  LearnResult learned;
  ASSERT_TRUE(store->Learn(batch, {kChange.now, "tester"}, &learned).ok());
  const std::string db = store->path();
  auto count_of = [&](const std::string& file, const std::string& needle) {
    const std::string bytes = testing_files::ReadFile(file);
    size_t n = 0;
    for (size_t at = bytes.find(needle); at != std::string::npos;
         at = bytes.find(needle, at + 1)) {
      ++n;
    }
    return n;
  };
  auto count = [&](const std::string& file) { return count_of(file, planted); };
  auto blobs = [&] {
    return count_of(db, packed) + count_of(db + "-wal", packed) +
           count_of(db + "-shm", packed);
  };
  ASSERT_TRUE(std::filesystem::exists(db + "-wal"));
  ASSERT_GE(count(db) + count(db + "-wal"), 2u);  // term and path, at least
  ASSERT_GE(blobs(), 1u);                         // the kept text
  ForgetResult result;
  ASSERT_TRUE(store->Forget({docs[9].digest}, kChange, &result).ok());
  EXPECT_TRUE(result.checkpointed);
  ASSERT_TRUE(std::filesystem::exists(db + "-wal"));
  EXPECT_EQ(std::filesystem::file_size(db + "-wal"), 0u);
  EXPECT_EQ(count(db), 0u);
  EXPECT_EQ(count(db + "-wal"), 0u);
  EXPECT_EQ(count(db + "-shm"), 0u);
  EXPECT_EQ(blobs(), 0u);
  // And the digest is gone too.
  EXPECT_EQ(testing_files::ReadFile(db).find(docs[9].digest),
            std::string::npos);
}

TEST_F(StoreChangesTest, ForgetDeletesZeroRowsAndShrinksTheVocabulary) {
  const std::vector<Doc> docs = {
      {Digest("00000001", 1), "permits", {"permit", "fee", "unique-word"}},
      {Digest("00000002", 2), "permits", {"permit"}},
      {Digest("00000003", 3), "billing", {"fee", "invoice"}},
  };
  std::unique_ptr<Store> store = Build("s.db", docs);
  ASSERT_NE(store, nullptr);
  int64_t before = 0;
  ASSERT_TRUE(store->VocabularySize(&before).ok());
  EXPECT_EQ(before, 4);
  ForgetResult result;
  ASSERT_TRUE(store->Forget({docs[0].digest}, kChange, &result).ok());
  EXPECT_EQ(result.removed_terms, 1);  // unique-word; fee stays for billing
  int64_t after = 0;
  ASSERT_TRUE(store->VocabularySize(&after).ok());
  EXPECT_EQ(after, 3);
  Db raw = OpenRaw(store->path(), SQLITE_OPEN_READONLY);
  // permits' fee row reached zero and is gone; its permit row went from 2
  // to 1; no row of a deleted term is left.
  EXPECT_EQ(
      QueryInt(raw.get(),
               "SELECT COUNT(*) FROM counts c JOIN terms t ON t.id = c.term_id "
               "JOIN queues q ON q.id = c.queue_id WHERE q.name = 'permits'"),
      1);
  EXPECT_EQ(QueryInt(raw.get(),
                     "SELECT n FROM counts c JOIN terms t ON t.id = c.term_id "
                     "JOIN queues q ON q.id = c.queue_id "
                     "WHERE q.name = 'permits' AND t.text = 'permit'"),
            1);
  EXPECT_EQ(QueryInt(raw.get(),
                     "SELECT COUNT(*) FROM terms WHERE text = 'unique-word'"),
            0);
  EXPECT_EQ(QueryInt(raw.get(),
                     "SELECT COUNT(*) FROM counts WHERE term_id NOT IN (SELECT "
                     "id FROM terms)"),
            0);
  EXPECT_EQ(QueryInt(raw.get(),
                     "SELECT documents FROM queues WHERE name = 'permits'"),
            1);
  EXPECT_EQ(
      QueryInt(raw.get(), "SELECT tokens FROM queues WHERE name = 'permits'"),
      1);
}

TEST_F(StoreChangesTest,
       ForgettingAQueuesLastDocumentLeavesAQueueThatRoutesNothing) {
  const std::vector<Doc> docs = {
      {Digest("00000001", 1), "permits", {"permit", "fee"}},
      {Digest("00000002", 2), "billing", {"fee", "invoice"}},
  };
  std::unique_ptr<Store> store = Build("s.db", docs);
  ASSERT_NE(store, nullptr);
  ForgetResult result;
  ASSERT_TRUE(store->Forget({docs[1].digest}, kChange, &result).ok());
  std::vector<QueueInfo> queues;
  ASSERT_TRUE(store->ListQueues(&queues).ok());
  ASSERT_EQ(queues.size(), 2u);
  EXPECT_EQ(queues[0].name, "billing");
  EXPECT_EQ(queues[0].documents, 0);
  EXPECT_EQ(queues[0].tokens, 0);
  EXPECT_EQ(queues[0].distinct_terms, 0);
  Model model = Model::Build(Counts(store.get()), ModelOptions{});
  ASSERT_EQ(model.queue_count(), 1u);
  EXPECT_EQ(model.queues()[0].name, "permits");
  EXPECT_EQ(model.vocabulary_size(), 2u);  // invoice is gone
}

TEST_F(StoreChangesTest, ForgetOfAnUnknownDigestChangesNothing) {
  const std::vector<Doc> docs = Corpus();
  std::unique_ptr<Store> store = Build("s.db", docs);
  std::unique_ptr<Store> same = Build("same.db", docs);
  ASSERT_NE(store, nullptr);
  ForgetResult result;
  Status s =
      store->Forget({docs[0].digest, Digest("99999999", 9)}, kChange, &result);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  ExpectSameModel(store.get(), same.get());  // docs[0] is still learned
}

TEST_F(StoreChangesTest,
       CorrectionGivesTheModelOfAStoreThatLearnedTheRightQueue) {
  std::vector<Doc> docs = Corpus();
  std::unique_ptr<Store> store = Build("wrong.db", docs);
  ASSERT_NE(store, nullptr);
  // Move three documents, one of them into a queue that does not exist yet.
  const std::vector<std::pair<size_t, std::string>> fixes = {
      {5, docs[5].queue == "billing" ? "marina" : "billing"},
      {12, "careers"},
      {30, docs[30].queue == "permits" ? "billing" : "permits"},
  };
  std::vector<CorrectMove> moves;
  std::vector<std::string> old_queues;
  for (const auto& [i, queue] : fixes) {
    moves.push_back({docs[i].digest, queue});
    old_queues.push_back(docs[i].queue);
    docs[i].queue = queue;
  }
  moves.push_back({docs[7].digest, docs[7].queue});  // already right
  CorrectResult result;
  Status s = store->Correct(moves, LearnBatch(), kChange, &result);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(result.moved, 3);
  ASSERT_EQ(result.from.size(), 4u);
  for (size_t k = 0; k < 3; ++k) EXPECT_EQ(result.from[k], old_queues[k]);
  EXPECT_EQ(result.from[3], docs[7].queue);
  std::unique_ptr<Store> right = Build("right.db", docs);
  ASSERT_NE(right, nullptr);
  ExpectSameModel(store.get(), right.get());
}

// A correction or a forget writes its counts one way when it touches a
// small part of the model (each term's rows read, the new counts written in
// one statement) and another when it touches a large part (one pass over
// all of counts); from one document to most of them, every size must give
// exactly the model of a store built without the change, and a fingerprint
// that chute check finds right.
TEST_F(StoreChangesTest, CorrectionsAndForgetsOfEverySizeAreExact) {
  // 400 documents over 5 queues; terms from a vocabulary of 6,000 with a
  // skewed draw, so that rows begin, change and end.
  std::mt19937 rng(7);
  auto draw = [&rng](unsigned n) { return static_cast<unsigned>(rng() % n); };
  const std::vector<std::string> queues = {"berth-bookings", "billing", "marina", "permits",
                                           "moorings"};
  std::vector<Doc> docs;
  for (unsigned i = 0; i < 400; ++i) {
    Doc d{Digest("c0ffee00", i), queues[draw(5)], {}};
    const unsigned length = 5 + draw(40);
    for (unsigned k = 0; k < length; ++k) {
      d.terms.push_back("w" + std::to_string(std::min(draw(6000), draw(6000))));
    }
    docs.push_back(std::move(d));
  }
  for (const size_t size : {1u, 4u, 40u, 250u}) {
    SCOPED_TRACE("documents changed: " + std::to_string(size));
    const std::string tag = std::to_string(size);
    std::vector<size_t> picked(docs.size());
    for (size_t i = 0; i < picked.size(); ++i) picked[i] = i;
    std::shuffle(picked.begin(), picked.end(), rng);
    picked.resize(size);

    std::unique_ptr<Store> store = Build("c" + tag + ".db", docs);
    ASSERT_NE(store, nullptr);
    std::vector<Doc> right = docs;
    std::vector<CorrectMove> moves;
    for (size_t i : picked) {
      // Any queue but its own.
      const auto own = static_cast<size_t>(
          std::find(queues.begin(), queues.end(), docs[i].queue) - queues.begin());
      right[i].queue = queues[(own + 1 + draw(4)) % queues.size()];
      moves.push_back({docs[i].digest, right[i].queue});
    }
    CorrectResult corrected;
    Status s = store->Correct(moves, LearnBatch(), kChange, &corrected);
    ASSERT_TRUE(s.ok()) << s.message();
    EXPECT_EQ(corrected.moved, static_cast<int64_t>(size));
    std::unique_ptr<Store> want = Build("c" + tag + "-want.db", right);
    ASSERT_NE(want, nullptr);
    ExpectSameModel(store.get(), want.get());
    CheckReport report;
    ASSERT_TRUE(CheckStore(dir_.File("c" + tag + ".db"), &report).ok());
    EXPECT_TRUE(report.consistent());

    std::unique_ptr<Store> forgetting = Build("f" + tag + ".db", docs);
    ASSERT_NE(forgetting, nullptr);
    std::vector<std::string> digests;
    std::vector<Doc> kept;
    for (size_t i = 0; i < docs.size(); ++i) {
      if (std::find(picked.begin(), picked.end(), i) != picked.end()) {
        digests.push_back(docs[i].digest);
      } else {
        kept.push_back(docs[i]);
      }
    }
    ForgetResult forgot;
    s = forgetting->Forget(digests, kChange, &forgot);
    ASSERT_TRUE(s.ok()) << s.message();
    EXPECT_EQ(forgot.forgotten.size(), size);
    std::unique_ptr<Store> without = Build("f" + tag + "-want.db", kept);
    ASSERT_NE(without, nullptr);
    ExpectSameModel(forgetting.get(), without.get());
    ASSERT_TRUE(CheckStore(dir_.File("f" + tag + ".db"), &report).ok());
    EXPECT_TRUE(report.consistent());
  }
}

// Learning writes its counts the same ways (count_writer.h): into an empty
// store, then batches of 1, 5, 50 and the rest of 400 documents, whose terms
// are partly known and partly new, must give the model (and the term ids'
// uniqueness, and a fingerprint check accepts) of learning all at once.
TEST_F(StoreChangesTest, LearningInBatchesOfEverySizeGivesTheModelOfOneBatch) {
  std::mt19937 rng(21);
  auto draw = [&rng](unsigned n) { return static_cast<unsigned>(rng() % n); };
  const std::vector<std::string> queues = {"berth-bookings", "billing", "marina"};
  std::vector<Doc> docs;
  for (unsigned i = 0; i < 400; ++i) {
    Doc d{Digest("ba7c4e00", i), queues[draw(3)], {}};
    const unsigned length = 3 + draw(30);
    for (unsigned k = 0; k < length; ++k)
      d.terms.push_back("v" + std::to_string(std::min(draw(5000), draw(5000))));
    docs.push_back(std::move(d));
  }
  std::unique_ptr<Store> batches = Build("batches.db", {});
  ASSERT_NE(batches, nullptr);
  size_t next = 0;
  for (const size_t size : {1u, 5u, 50u, 344u}) {
    LearnBatch batch;
    for (size_t i = next; i < next + size; ++i)
      batch.Add(docs[i].digest, docs[i].queue, SourceOf(docs[i]), docs[i].terms);
    next += size;
    LearnResult result;
    Status s = batches->Learn(batch, {kChange.now, "tester"}, &result);
    ASSERT_TRUE(s.ok()) << s.message();
    EXPECT_EQ(result.learned, static_cast<int64_t>(size));
  }
  ASSERT_EQ(next, docs.size());
  std::unique_ptr<Store> once = Build("once.db", docs);
  ASSERT_NE(once, nullptr);
  ExpectSameModel(batches.get(), once.get());
  CheckReport report;
  ASSERT_TRUE(CheckStore(dir_.File("batches.db"), &report).ok());
  EXPECT_TRUE(report.consistent());
}

TEST_F(StoreChangesTest, CorrectAndLearnShareOneTransaction) {
  const std::vector<Doc> docs = Corpus();
  std::unique_ptr<Store> store = Build("s.db", docs);
  std::unique_ptr<Store> same = Build("same.db", docs);
  ASSERT_NE(store, nullptr);
  // A good move and a new document, then a move to an invalid queue name:
  // nothing of it may stay.
  LearnBatch batch;
  batch.Add(Digest("77777777", 7), "billing", "/inbox/new.txt",
            {"fresh", "fee"});
  CorrectResult result;
  Status s =
      store->Correct({{docs[0].digest, "careers"}, {docs[1].digest, "_review"}},
                     batch, kChange, &result);
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  ExpectSameModel(store.get(), same.get());
  s = store->Correct({{Digest("99999999", 9), "billing"}}, batch, kChange,
                     &result);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  ExpectSameModel(store.get(), same.get());
  // Valid, it is applied whole: the move and the new document.
  s = store->Correct({{docs[0].digest, "careers"}}, batch, kChange, &result);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(result.learned.learned, 1);
  std::vector<Doc> want = docs;
  want[0].queue = "careers";
  want.push_back({Digest("77777777", 7), "billing", {"fresh", "fee"}});
  std::unique_ptr<Store> right = Build("right.db", want);
  // "fresh" came later than in a store learned in one batch, so compare
  // the counts by name rather than by row.
  EXPECT_EQ(ByName(Counts(store.get())), ByName(Counts(right.get())));
  int64_t va = 0, vb = 0;
  ASSERT_TRUE(store->VocabularySize(&va).ok());
  ASSERT_TRUE(right->VocabularySize(&vb).ok());
  EXPECT_EQ(va, vb);
}

TEST_F(StoreChangesTest, ResolvesByDigestSourceAndPrefix) {
  const std::vector<Doc> docs = {
      {Digest("abcdef01", 1), "permits", {"permit"}},
      {Digest("abcdef01", 2),
       "permits",
       {"fee"}},  // shares 8 digits with the first
      {Digest("12345678", 3), "billing", {"fee"}},
  };
  std::unique_ptr<Store> store = Build("s.db", docs);
  ASSERT_NE(store, nullptr);
  Resolution r;
  // The exact digest of a file.
  ASSERT_TRUE(store->ResolveDocument({docs[1].digest, "", ""}, &r).ok());
  ASSERT_EQ(r.kind, Resolution::Kind::kFound);
  EXPECT_EQ(r.entry.digest, docs[1].digest);
  EXPECT_EQ(r.entry.queue, "permits");
  // A file that changed since: its digest is unknown, its stored path names
  // the document.
  ASSERT_TRUE(
      store->ResolveDocument({Digest("eeeeeeee", 5), SourceOf(docs[2]), ""}, &r)
          .ok());
  ASSERT_EQ(r.kind, Resolution::Kind::kFound);
  EXPECT_EQ(r.entry.digest, docs[2].digest);
  // Prefixes: unique, ambiguous, longer and unique, unknown.
  ASSERT_TRUE(store->ResolveDocument({"", "", "12345678"}, &r).ok());
  ASSERT_EQ(r.kind, Resolution::Kind::kFound);
  EXPECT_EQ(r.entry.digest, docs[2].digest);
  ASSERT_TRUE(store->ResolveDocument({"", "", "abcdef01"}, &r).ok());
  ASSERT_EQ(r.kind, Resolution::Kind::kAmbiguous);
  EXPECT_EQ(r.candidates,
            (std::vector<std::string>{docs[0].digest, docs[1].digest}));
  ASSERT_TRUE(
      store->ResolveDocument({"", "", docs[1].digest.substr(0, 64)}, &r).ok());
  ASSERT_EQ(r.kind, Resolution::Kind::kFound);
  EXPECT_EQ(r.entry.digest, docs[1].digest);
  ASSERT_TRUE(
      store->ResolveDocument({"", "/inbox/none.txt", "abcdef02"}, &r).ok());
  EXPECT_EQ(r.kind, Resolution::Kind::kUnknown);
  // Digits after the prefix's range: "abcdef00" < every "abcdef01..." but
  // the range [abcdef00, abcdef00g) holds none of them.
  ASSERT_TRUE(store->ResolveDocument({"", "", "abcdef00"}, &r).ok());
  EXPECT_EQ(r.kind, Resolution::Kind::kUnknown);
}

}  // namespace
}  // namespace chute
