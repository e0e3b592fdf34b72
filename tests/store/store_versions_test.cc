// Tests of the version history (store/store_versions.cc, Store::Rollback):
// every change records a version; a version's model, rebuilt from the
// snapshots and the change log, is exactly the model the store had then;
// rollback brings it back; forget leaves no trace in the history; pruning
// keeps what it promises.
#include <gtest/gtest.h>

#include <cstdio>
#include <map>
#include <memory>
#include <random>
#include <set>
#include <string>
#include <vector>

#include "store/check.h"
#include "store/fingerprint.h"
#include "store/store.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

using testing_files::OpenRaw;
using testing_files::QueryInt;
using testing_files::TempDir;

struct Doc {
  std::string digest;
  std::string queue;
  std::vector<std::string> terms;
};

std::string Digest(unsigned n) {
  char buf[65];
  std::snprintf(buf, sizeof buf, "%064x", n + 1);
  return buf;
}

// n seeded documents over three queues with a skewed vocabulary.
std::vector<Doc> Corpus(unsigned n, unsigned seed) {
  std::mt19937 rng(seed);
  const char* queues[] = {"billing", "marina", "permits"};
  std::vector<Doc> docs;
  for (unsigned i = 0; i < n; ++i) {
    Doc d{Digest(seed * 1000 + i), queues[rng() % 3], {}};
    const auto length = static_cast<unsigned>(2 + rng() % 9);
    for (unsigned k = 0; k < length; ++k) {
      unsigned t = static_cast<unsigned>(rng() % 40);
      d.terms.push_back("w" + std::to_string(t * t % 41));
    }
    d.terms.push_back("own-" + std::to_string(seed) + "-" + std::to_string(i));
    docs.push_back(std::move(d));
  }
  return docs;
}

class StoreVersionsTest : public testing::Test {
 protected:
  void SetUp() override { store_ = Create("s.db"); }

  std::unique_ptr<Store> Create(const std::string& name) {
    std::unique_ptr<Store> store;
    Status s = Store::Create(dir_.File(name), StoreSettings{}, &store,
                             ChangeInfo{"2026-05-01T09:00:00Z", "setup"});
    EXPECT_TRUE(s.ok()) << s.message();
    return store;
  }

  static void Learn(Store* store, const std::vector<Doc>& docs, const std::string& by = "clerk") {
    LearnBatch batch;
    for (const Doc& d : docs) batch.Add(d.digest, d.queue, "/in/" + d.digest.substr(0, 8), d.terms);
    LearnResult r;
    Status s = store->Learn(batch, ChangeInfo{"2026-05-02T10:00:00Z", by}, &r);
    ASSERT_TRUE(s.ok()) << s.message();
  }

  static ModelCounts Counts(Store* store) {
    ModelCounts mc;
    Status s = store->LoadModelCounts(&mc);
    EXPECT_TRUE(s.ok()) << s.message();
    return mc;
  }

  // Queues with documents (names, documents, N(q), priors) and every count.
  static std::map<std::string, int64_t> Flat(const ModelCounts& mc) {
    std::map<std::string, int64_t> out;
    const size_t nq = mc.queues.size();
    for (size_t q = 0; q < nq; ++q) {
      if (mc.queues[q].documents == 0) continue;
      out["#docs " + mc.queues[q].name] = mc.queues[q].documents;
      out["#tokens " + mc.queues[q].name] = mc.queues[q].tokens;
      out["#prior " + mc.queues[q].name] =
          mc.queues[q].set_prior ? static_cast<int64_t>(*mc.queues[q].set_prior * 1e9) : -1;
      for (size_t row = 0; row < mc.terms.size(); ++row) {
        if (int64_t n = mc.counts[row * nq + q]; n != 0) out[mc.queues[q].name + " " + mc.terms[row]] = n;
      }
    }
    return out;
  }

  VersionInfo Current() {
    VersionInfo v;
    EXPECT_TRUE(store_->CurrentVersion(&v).ok());
    return v;
  }

  void ExpectConsistent() {
    CheckReport report;
    ASSERT_TRUE(CheckStore(store_->path(), &report).ok());
    for (const CheckLine& l : report.lines) EXPECT_TRUE(l.ok) << l.check << ": " << l.detail;
  }

  TempDir dir_;
  std::unique_ptr<Store> store_;
};

TEST_F(StoreVersionsTest, EveryChangeRecordsAVersionWithWhoAndWhat) {
  std::vector<Doc> docs = Corpus(6, 1);
  Learn(store_.get(), docs, "clerk-a");
  CorrectResult cr;
  ASSERT_TRUE(store_->Correct({{docs[0].digest, docs[0].queue == "marina" ? "billing" : "marina"}},
                              LearnBatch(), ChangeInfo{"2026-05-03T08:00:00Z", "rev-b"}, &cr)
                  .ok());
  ForgetResult fr;
  ASSERT_TRUE(store_->Forget({docs[1].digest}, ChangeInfo{"2026-05-04T08:00:00Z", "dpo-c"}, &fr).ok());
  ASSERT_TRUE(store_->SetPrior("permits", 0.2, ChangeInfo{"2026-05-05T08:00:00Z", "lead-d"}).ok());

  std::vector<VersionInfo> versions;
  ASSERT_TRUE(store_->ListVersions(&versions).ok());
  ASSERT_EQ(versions.size(), 5u);
  const char* commands[] = {"init", "learn", "correct", "forget", "queues"};
  const char* by[] = {"setup", "clerk-a", "rev-b", "dpo-c", "lead-d"};
  for (size_t i = 0; i < versions.size(); ++i) {
    EXPECT_EQ(versions[i].version, static_cast<int64_t>(i + 1));
    EXPECT_EQ(versions[i].command, commands[i]);
    EXPECT_EQ(versions[i].by, by[i]);
    EXPECT_EQ(versions[i].fingerprint.size(), 64u);
  }
  EXPECT_EQ(versions[1].added, 6);
  EXPECT_EQ(versions[2].moved, 1);
  EXPECT_EQ(versions[3].removed, 1);
  EXPECT_EQ(versions[0].time, "2026-05-01T09:00:00Z");
  // Each version's fingerprint is the fingerprint of the model after it.
  EXPECT_EQ(versions.back().fingerprint, ModelFingerprint(store_->settings(), Counts(store_.get())));
  std::set<std::string> distinct;
  for (const VersionInfo& v : versions) distinct.insert(v.fingerprint);
  EXPECT_EQ(distinct.size(), versions.size());
  ExpectConsistent();
}

TEST_F(StoreVersionsTest, FingerprintDoesNotDependOnLearningOrder) {
  std::vector<Doc> docs = Corpus(20, 2);
  Learn(store_.get(), docs);
  auto other = Create("other.db");
  std::vector<Doc> reversed(docs.rbegin(), docs.rend());
  Learn(other.get(), {reversed.begin(), reversed.begin() + 7});
  Learn(other.get(), {reversed.begin() + 7, reversed.end()});
  VersionInfo a, b;
  ASSERT_TRUE(store_->CurrentVersion(&a).ok());
  ASSERT_TRUE(other->CurrentVersion(&b).ok());
  EXPECT_EQ(a.fingerprint, b.fingerprint);
  EXPECT_NE(a.version, b.version);
}

// The model of every version, rebuilt from snapshots and the change log, is
// the model the store had then; across more versions than kSnapshotEvery.
TEST_F(StoreVersionsTest, EveryVersionsModelIsTheModelTheStoreHadThen) {
  std::vector<Doc> docs = Corpus(90, 3);
  std::map<int64_t, std::map<std::string, int64_t>> seen;
  std::mt19937 rng(7);
  std::vector<const Doc*> learned;
  for (size_t i = 0; i < docs.size(); ++i) {
    if (i > 5 && i % 4 == 0) {
      // A correction of a document learned earlier.
      const Doc& d = *learned[rng() % learned.size()];
      CorrectResult cr;
      Status s = store_->Correct({{d.digest, "marina"}}, LearnBatch(), ChangeInfo{"", "rev"}, &cr);
      ASSERT_TRUE(s.ok()) << s.message();
    } else {
      Learn(store_.get(), {docs[i]});
      learned.push_back(&docs[i]);
    }
    seen[Current().version] = Flat(Counts(store_.get()));
  }
  ASSERT_GT(Current().version, kSnapshotEvery);
  EXPECT_GE(QueryInt(OpenRaw(store_->path(), SQLITE_OPEN_READONLY).get(),
                     "SELECT COUNT(*) FROM snapshots"),
            1);
  for (const auto& [v, flat] : seen) {
    VersionInfo info;
    StoreSettings settings;
    ModelCounts mc;
    Status s = store_->ModelAtVersion(v, &info, &settings, &mc);
    ASSERT_TRUE(s.ok()) << s.message();
    EXPECT_EQ(Flat(mc), flat) << "version " << v;
    EXPECT_EQ(ModelFingerprint(settings, mc), info.fingerprint) << "version " << v;
  }
  ExpectConsistent();
}

TEST_F(StoreVersionsTest, RollbackBringsBackTheModelAndIsItselfUndoable) {
  std::vector<Doc> docs = Corpus(30, 4);
  Learn(store_.get(), {docs.begin(), docs.begin() + 15});
  ASSERT_TRUE(store_->SetPrior("billing", 0.3, ChangeInfo{"", "lead"}).ok());
  const VersionInfo good = Current();
  const auto good_model = Flat(Counts(store_.get()));
  // A bad night: more documents, corrections, a prior cleared.
  Learn(store_.get(), {docs.begin() + 15, docs.end()});
  CorrectResult cr;
  ASSERT_TRUE(store_->Correct({{docs[0].digest, "permits"}, {docs[20].digest, "billing"}},
                              LearnBatch(), ChangeInfo{"", "rev"}, &cr)
                  .ok());
  ASSERT_TRUE(store_->SetPrior("billing", std::nullopt, ChangeInfo{"", "lead"}).ok());
  const VersionInfo bad = Current();
  const auto bad_model = Flat(Counts(store_.get()));
  ASSERT_NE(good_model, bad_model);

  RollbackResult r;
  ASSERT_TRUE(store_->Rollback(good.version, ChangeInfo{"", "lead"}, &r).ok());
  EXPECT_EQ(r.made.version, bad.version + 1);
  EXPECT_EQ(r.made.command, "rollback");
  EXPECT_EQ(r.made.fingerprint, good.fingerprint);
  EXPECT_EQ(Flat(Counts(store_.get())), good_model);
  EXPECT_EQ(r.removed, 15);  // the documents learned after it
  ExpectConsistent();
  // The documents learned after the good version are out of the model but
  // kept: learning one again counts it again.
  std::optional<LedgerEntry> e;
  ASSERT_TRUE(store_->FindDocument(docs[25].digest, &e).ok());
  ASSERT_TRUE(e.has_value());
  EXPECT_FALSE(e->in_model);

  // And back to the bad night: a rollback is a version like any other.
  ASSERT_TRUE(store_->Rollback(bad.version, ChangeInfo{"", "lead"}, &r).ok());
  EXPECT_EQ(r.made.fingerprint, bad.fingerprint);
  EXPECT_EQ(Flat(Counts(store_.get())), bad_model);
  ExpectConsistent();
}

TEST_F(StoreVersionsTest, RollbackBeforeAForgetGivesThatVersionWithoutTheForgotten) {
  std::vector<Doc> docs = Corpus(12, 5);
  Learn(store_.get(), docs);
  const int64_t v = Current().version;
  Learn(store_.get(), Corpus(5, 6));
  ForgetResult fr;
  ASSERT_TRUE(store_->Forget({docs[3].digest}, ChangeInfo{"", "dpo"}, &fr).ok());
  RollbackResult r;
  ASSERT_TRUE(store_->Rollback(v, ChangeInfo{"", "lead"}, &r).ok());
  // The same as a store that learned version v's documents but the
  // forgotten one.
  auto without = Create("without.db");
  std::vector<Doc> kept = docs;
  kept.erase(kept.begin() + 3);
  Learn(without.get(), kept);
  VersionInfo w;
  ASSERT_TRUE(without->CurrentVersion(&w).ok());
  EXPECT_EQ(r.made.fingerprint, w.fingerprint);
  EXPECT_EQ(Flat(Counts(store_.get())), Flat(Counts(without.get())));
  ExpectConsistent();
}

TEST_F(StoreVersionsTest, ForgetLeavesNoTraceInTheHistory) {
  std::vector<Doc> docs = Corpus(8, 8);
  Learn(store_.get(), docs);
  // Enough versions for a snapshot that holds the document.
  for (unsigned i = 0; i < kSnapshotEvery; ++i) Learn(store_.get(), Corpus(1, 100 + i));
  CorrectResult cr;
  ASSERT_TRUE(store_->Correct({{docs[2].digest, "permits"}, {docs[2].digest, "billing"}}, LearnBatch(),
                              ChangeInfo{"", "rev"}, &cr)
                  .ok());
  auto raw = OpenRaw(store_->path(), SQLITE_OPEN_READONLY);
  const int64_t id = QueryInt(raw.get(), "SELECT id FROM ledger WHERE digest = '" + docs[2].digest + "'");
  ASSERT_GE(QueryInt(raw.get(), "SELECT COUNT(*) FROM changes WHERE document = " + std::to_string(id)), 2);
  ASSERT_GE(QueryInt(raw.get(), "SELECT COUNT(*) FROM snapshots"), 1);
  raw.reset();
  ForgetResult fr;
  ASSERT_TRUE(store_->Forget({docs[2].digest}, ChangeInfo{"", "dpo"}, &fr).ok());
  raw = OpenRaw(store_->path(), SQLITE_OPEN_READONLY);
  EXPECT_EQ(QueryInt(raw.get(), "SELECT COUNT(*) FROM changes WHERE document = " + std::to_string(id)), 0);
  // No snapshot names it, and no version's model counts it.
  std::vector<VersionInfo> versions;
  ASSERT_TRUE(store_->ListVersions(&versions).ok());
  for (const VersionInfo& v : versions) {
    VersionState st;
    ASSERT_TRUE(store_->LoadVersionState(v.version, &st).ok());
    for (const auto& [member, queue] : st.members) EXPECT_NE(member, id) << "version " << v.version;
  }
  raw.reset();
  ExpectConsistent();
}

TEST_F(StoreVersionsTest, PruneKeepsRollbackFromThePruneVersionOn) {
  std::vector<Doc> docs = Corpus(10, 9);
  for (const Doc& d : docs) Learn(store_.get(), {d});
  const int64_t keep_from = 6;
  VersionInfo info;
  StoreSettings settings;
  ModelCounts before;
  ASSERT_TRUE(store_->ModelAtVersion(keep_from, &info, &settings, &before).ok());
  int64_t dropped = 0;
  ASSERT_TRUE(store_->PruneVersions(keep_from, &dropped).ok());
  EXPECT_EQ(dropped, keep_from - 1);
  VersionState st;
  EXPECT_EQ(store_->LoadVersionState(keep_from - 1, &st).code(), Status::Code::kNotFound);
  ModelCounts after;
  ASSERT_TRUE(store_->ModelAtVersion(keep_from, &info, &settings, &after).ok());
  EXPECT_EQ(Flat(after), Flat(before));
  RollbackResult r;
  ASSERT_TRUE(store_->Rollback(keep_from, ChangeInfo{"", "lead"}, &r).ok());
  EXPECT_EQ(r.made.fingerprint, info.fingerprint);
  ExpectConsistent();
}

TEST_F(StoreVersionsTest, UnknownVersionIsNotFound) {
  RollbackResult r;
  Status s = store_->Rollback(99, ChangeInfo{"", "lead"}, &r);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  EXPECT_NE(s.message().find("there is no version 99"), std::string::npos) << s.message();
}

}  // namespace
}  // namespace chute
