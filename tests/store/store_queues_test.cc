// Tests of queue changes (store/store_queues.cc): each is exact (the model
// equals a store that learned the documents the changed way from the start),
// keeps the ledger whole, records a version and can be rolled back.
#include <gtest/gtest.h>

#include <cstdio>
#include <memory>
#include <string>
#include <vector>

#include "store/check.h"
#include "store/store.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

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

std::vector<Doc> Harbour() {
  return {{Digest(1), "berths", {"berth", "pier", "vessel"}},
          {Digest(2), "berths", {"berth", "reserve", "pier"}},
          {Digest(3), "pilotage", {"pilot", "vessel", "tide"}},
          {Digest(4), "pilotage", {"pilot", "boarding", "pilot"}},
          {Digest(5), "billing", {"invoice", "dues", "pier"}},
          {Digest(6), "billing", {"invoice", "late", "fee"}}};
}

class StoreQueuesTest : public testing::Test {
 protected:
  std::unique_ptr<Store> Build(const std::string& name, const std::vector<Doc>& docs) {
    std::unique_ptr<Store> store;
    EXPECT_TRUE(Store::Create(dir_.File(name), StoreSettings{}, &store).ok());
    LearnBatch batch;
    for (const Doc& d : docs) batch.Add(d.digest, d.queue, "/in/" + d.digest.substr(60), d.terms);
    LearnResult r;
    EXPECT_TRUE(store->Learn(batch, ChangeInfo{"2026-05-01T00:00:00Z", "clerk"}, &r).ok());
    return store;
  }
  static std::string Fingerprint(Store* s) {
    VersionInfo v;
    EXPECT_TRUE(s->CurrentVersion(&v).ok());
    return v.fingerprint;
  }
  static std::vector<std::string> RoutedQueues(Store* s) {
    ModelCounts mc;
    EXPECT_TRUE(s->LoadModelCounts(&mc).ok());
    std::vector<std::string> names;
    for (const QueueCounts& q : mc.queues) {
      if (q.documents > 0) names.push_back(q.name);
    }
    return names;
  }
  static void ExpectConsistent(Store* s) {
    CheckReport report;
    ASSERT_TRUE(CheckStore(s->path(), &report).ok());
    for (const CheckLine& l : report.lines) EXPECT_TRUE(l.ok) << l.check << ": " << l.detail;
  }
  const ChangeInfo change_{"2026-05-02T00:00:00Z", "lead"};
  TempDir dir_;
};

TEST_F(StoreQueuesTest, MergeAddsCountsExactly) {
  auto store = Build("s.db", Harbour());
  const std::string before = Fingerprint(store.get());
  int64_t moved = 0;
  ASSERT_TRUE(store->MergeQueue("pilotage", "berths", change_, &moved).ok());
  EXPECT_EQ(moved, 2);
  std::vector<Doc> merged = Harbour();
  for (Doc& d : merged) {
    if (d.queue == "pilotage") d.queue = "berths";
  }
  auto want = Build("want.db", merged);
  EXPECT_EQ(Fingerprint(store.get()), Fingerprint(want.get()));
  EXPECT_EQ(RoutedQueues(store.get()), (std::vector<std::string>{"berths", "billing"}));
  ExpectConsistent(store.get());
  // Undone by a rollback: pilotage is back with its own documents.
  RollbackResult r;
  ASSERT_TRUE(store->Rollback(2, change_, &r).ok());
  EXPECT_EQ(r.made.fingerprint, before);
  EXPECT_EQ(r.moved, 2);
  ExpectConsistent(store.get());
}

TEST_F(StoreQueuesTest, RetireTakesTheQueueOutAndKeepsItsDocuments) {
  auto store = Build("s.db", Harbour());
  int64_t removed = 0;
  ASSERT_TRUE(store->RetireQueue("pilotage", change_, &removed).ok());
  EXPECT_EQ(removed, 2);
  std::vector<Doc> rest;
  for (const Doc& d : Harbour()) {
    if (d.queue != "pilotage") rest.push_back(d);
  }
  auto want = Build("want.db", rest);
  EXPECT_EQ(Fingerprint(store.get()), Fingerprint(want.get()));
  int64_t va = 0, vb = 0;
  ASSERT_TRUE(store->VocabularySize(&va).ok());
  ASSERT_TRUE(want->VocabularySize(&vb).ok());
  EXPECT_EQ(va, vb);  // 'pilot', 'tide', 'boarding' left the vocabulary
  std::optional<LedgerEntry> e;
  ASSERT_TRUE(store->FindDocument(Digest(3), &e).ok());
  ASSERT_TRUE(e.has_value());
  EXPECT_FALSE(e->in_model);
  EXPECT_EQ(e->queue, "pilotage");
  std::vector<QueueInfo> queues;
  ASSERT_TRUE(store->ListQueues(&queues).ok());
  bool listed_retired = false;
  for (const QueueInfo& q : queues) listed_retired |= q.name == "pilotage" && q.retired;
  EXPECT_TRUE(listed_retired);
  ExpectConsistent(store.get());
  // A hand-set prior cannot be given to a retired queue.
  EXPECT_FALSE(store->SetPrior("pilotage", 0.1, change_).ok());
  // Adding it again brings it back empty: routed to only once it learns.
  ASSERT_TRUE(store->AddQueue("pilotage", change_).ok());
  EXPECT_EQ(RoutedQueues(store.get()), (std::vector<std::string>{"berths", "billing"}));
  LearnBatch batch;
  batch.Add(Digest(3), "pilotage", "/in/again", {"pilot", "vessel", "tide"});
  LearnResult r;
  ASSERT_TRUE(store->Learn(batch, change_, &r).ok());
  EXPECT_EQ(r.learned, 1);  // kept out of the model, so learned again
  EXPECT_EQ(RoutedQueues(store.get()), (std::vector<std::string>{"berths", "billing", "pilotage"}));
  ExpectConsistent(store.get());
}

TEST_F(StoreQueuesTest, RenameKeepsTheDocumentsAndRollsBack) {
  auto store = Build("s.db", Harbour());
  ASSERT_TRUE(store->RenameQueue("billing", "harbour-dues", change_).ok());
  EXPECT_EQ(RoutedQueues(store.get()),
            (std::vector<std::string>{"berths", "harbour-dues", "pilotage"}));
  std::vector<Doc> renamed = Harbour();
  for (Doc& d : renamed) {
    if (d.queue == "billing") d.queue = "harbour-dues";
  }
  auto want = Build("want.db", renamed);
  EXPECT_EQ(Fingerprint(store.get()), Fingerprint(want.get()));
  // Names are taken whether the queue is active or retired; names are
  // validated as at creation.
  EXPECT_FALSE(store->RenameQueue("berths", "pilotage", change_).ok());
  EXPECT_FALSE(store->RenameQueue("berths", "_review", change_).ok());
  EXPECT_EQ(store->RenameQueue("nowhere", "x", change_).code(), Status::Code::kNotFound);
  // Swapping two names through the history works (rollback parks names).
  ASSERT_TRUE(store->RenameQueue("berths", "billing", change_).ok());
  RollbackResult r;
  ASSERT_TRUE(store->Rollback(2, change_, &r).ok());
  EXPECT_EQ(RoutedQueues(store.get()), (std::vector<std::string>{"berths", "billing", "pilotage"}));
  ExpectConsistent(store.get());
}

TEST_F(StoreQueuesTest, AddedQueueIsListedButNotRoutedUntilItLearns) {
  auto store = Build("s.db", Harbour());
  const std::string before = Fingerprint(store.get());
  ASSERT_TRUE(store->AddQueue("hazardous-cargo", change_).ok());
  EXPECT_EQ(Fingerprint(store.get()), before);  // the model is unchanged
  std::vector<VersionInfo> versions;
  ASSERT_TRUE(store->ListVersions(&versions).ok());
  EXPECT_EQ(versions.back().command, "queues");
  EXPECT_FALSE(store->AddQueue("hazardous-cargo", change_).ok());
  EXPECT_FALSE(store->AddQueue("bad\nname", change_).ok());
  EXPECT_EQ(RoutedQueues(store.get()).size(), 3u);
  ExpectConsistent(store.get());
}

TEST_F(StoreQueuesTest, MergeRefusesUnknownAndSelf) {
  auto store = Build("s.db", Harbour());
  int64_t moved = 0;
  EXPECT_EQ(store->MergeQueue("nowhere", "berths", change_, &moved).code(), Status::Code::kNotFound);
  EXPECT_EQ(store->MergeQueue("berths", "nowhere", change_, &moved).code(), Status::Code::kNotFound);
  EXPECT_FALSE(store->MergeQueue("berths", "berths", change_, &moved).ok());
  ExpectConsistent(store.get());
}

}  // namespace
}  // namespace chute
