// Tests of the decision log, unreadable files and queue routing rules
// (store/store_decisions.cc), and of forget and purge erasing them.
#include <gtest/gtest.h>

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "store/store.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

using testing_files::OpenRaw;
using testing_files::QueryInt;
using testing_files::ReadFile;
using testing_files::TempDir;

std::string Digest(unsigned n) { return testing_files::NumberedDigest(n); }

DecisionRecord Decision(unsigned n, const std::string& queue, const std::string& time,
                        HeldReason held = HeldReason::kNone) {
  DecisionRecord r;
  r.digest = Digest(n);
  r.source = "/inbox/letter-" + std::to_string(n) + ".txt";
  r.destination = "/routed/" + (held == HeldReason::kNone ? queue : std::string("_review")) +
                  "/letter-" + std::to_string(n) + ".txt";
  r.queue = queue;
  r.confidence = 0.75;
  r.runner_up = "billing";
  r.runner_up_posterior = 0.25;
  r.held = held;
  r.model_version = 3;
  r.time = time;
  r.by = "router";
  r.mode = DeliveryMode::kMove;
  r.terms = 10;
  r.unknown_terms = 2;
  return r;
}

DecisionQuery Query(std::string since, std::string queue = "", bool delivered_only = true) {
  DecisionQuery q;
  q.since = std::move(since);
  q.queue = std::move(queue);
  q.delivered_only = delivered_only;
  return q;
}

class StoreDecisionsTest : public testing::Test {
 protected:
  void SetUp() override {
    Status s = Store::Create(dir_.File("s.db"), StoreSettings(), &store_);
    ASSERT_TRUE(s.ok()) << s.message();
  }

  std::vector<DecisionRecord> Read(const DecisionQuery& q) {
    std::vector<DecisionRecord> out;
    Status s = store_->ReadDecisions(q, [&](const DecisionRecord& r) {
      out.push_back(r);
      return Status::Ok();
    });
    EXPECT_TRUE(s.ok()) << s.message();
    return out;
  }

  void Learn(unsigned n, const std::string& queue) {
    LearnBatch batch;
    batch.Add(Digest(n), queue, "/inbox/letter-" + std::to_string(n) + ".txt",
              {"berth", "letter" + std::to_string(n)});
    LearnResult result;
    Status s = store_->Learn(batch, {"2026-11-01T08:00:00Z", "tester"}, &result);
    ASSERT_TRUE(s.ok()) << s.message();
  }

  TempDir dir_;
  std::unique_ptr<Store> store_;
};

TEST_F(StoreDecisionsTest, NamesReadBack) {
  for (HeldReason h : {HeldReason::kNone, HeldReason::kThreshold, HeldReason::kNoTerms,
                       HeldReason::kMinDocuments, HeldReason::kAudit}) {
    HeldReason back = HeldReason::kAudit;
    ASSERT_TRUE(ParseHeld(HeldName(h), &back));
    EXPECT_EQ(back, h);
  }
  HeldReason unused;
  EXPECT_FALSE(ParseHeld("maybe", &unused));
  EXPECT_EQ(HeldName(HeldReason::kNoTerms), "no_terms");
  for (DeliveryMode m : {DeliveryMode::kMove, DeliveryMode::kCopy, DeliveryMode::kLink}) {
    DeliveryMode back = DeliveryMode::kLink;
    ASSERT_TRUE(ParseDeliveryMode(DeliveryModeName(m), &back));
    EXPECT_EQ(back, m);
  }
  DeliveryMode mode;
  EXPECT_FALSE(ParseDeliveryMode("", &mode));
}

TEST_F(StoreDecisionsTest, IntendedThenDeliveredRoundTrips) {
  std::vector<DecisionRecord> records = {
      Decision(1, "berths", "2026-11-02T08:00:00Z"),
      Decision(2, "berths", "2026-11-02T08:00:01Z", HeldReason::kThreshold)};
  records[1].runner_up.clear();
  records[1].runner_up_posterior.reset();
  ASSERT_TRUE(store_->LogIntended(&records).ok());
  ASSERT_GT(records[0].id, 0);
  ASSERT_GT(records[1].id, records[0].id);

  // Not delivered yet: pending, and not in the log's default view.
  std::vector<DecisionRecord> pending;
  ASSERT_TRUE(store_->PendingDeliveries(&pending).ok());
  ASSERT_EQ(pending.size(), 2u);
  EXPECT_FALSE(pending[0].delivered);
  EXPECT_TRUE(Read(Query("")).empty());

  ASSERT_TRUE(store_->SetDestination(records[1].id, "/routed/_review/letter-2-2.txt").ok());
  ASSERT_TRUE(store_->MarkDelivered({records[0].id, records[1].id}).ok());
  ASSERT_TRUE(store_->PendingDeliveries(&pending).ok());
  EXPECT_TRUE(pending.empty());
  // A delivered decision's destination is final.
  EXPECT_EQ(store_->SetDestination(records[0].id, "/elsewhere").code(), Status::Code::kNotFound);

  std::vector<DecisionRecord> log = Read(Query(""));
  ASSERT_EQ(log.size(), 2u);
  const DecisionRecord& a = log[0];
  EXPECT_EQ(a.digest, Digest(1));
  EXPECT_EQ(a.source, "/inbox/letter-1.txt");
  EXPECT_EQ(a.destination, "/routed/berths/letter-1.txt");
  EXPECT_EQ(a.queue, "berths");
  EXPECT_EQ(a.confidence, 0.75);
  EXPECT_EQ(a.runner_up, "billing");
  ASSERT_TRUE(a.runner_up_posterior.has_value());
  EXPECT_EQ(*a.runner_up_posterior, 0.25);
  EXPECT_EQ(a.held, HeldReason::kNone);
  EXPECT_EQ(a.model_version, 3);
  EXPECT_EQ(a.time, "2026-11-02T08:00:00Z");
  EXPECT_EQ(a.by, "router");
  EXPECT_EQ(a.mode, DeliveryMode::kMove);
  EXPECT_TRUE(a.delivered);
  EXPECT_EQ(a.terms, 10);
  EXPECT_EQ(a.unknown_terms, 2);
  EXPECT_EQ(a.review, ReviewKind::kNone);
  const DecisionRecord& b = log[1];
  EXPECT_EQ(b.destination, "/routed/_review/letter-2-2.txt");
  EXPECT_EQ(b.held, HeldReason::kThreshold);
  EXPECT_TRUE(b.runner_up.empty());
  EXPECT_FALSE(b.runner_up_posterior.has_value());
}

TEST_F(StoreDecisionsTest, DroppedIntentsLeaveNoRow) {
  std::vector<DecisionRecord> records = {Decision(1, "berths", "2026-11-02T08:00:00Z")};
  ASSERT_TRUE(store_->LogIntended(&records).ok());
  ASSERT_TRUE(store_->DropIntended({records[0].id}).ok());
  std::vector<DecisionRecord> pending;
  ASSERT_TRUE(store_->PendingDeliveries(&pending).ok());
  EXPECT_TRUE(pending.empty());
  EXPECT_TRUE(Read(Query("", "", false)).empty());
}

TEST_F(StoreDecisionsTest, QueriesBySinceAndQueue) {
  std::vector<DecisionRecord> records = {Decision(1, "berths", "2026-11-01T08:00:00Z"),
                                         Decision(2, "billing", "2026-11-02T08:00:00Z"),
                                         Decision(3, "berths", "2026-11-03T08:00:00Z")};
  ASSERT_TRUE(store_->LogIntended(&records).ok());
  ASSERT_TRUE(store_->MarkDelivered({records[0].id, records[1].id, records[2].id}).ok());
  EXPECT_EQ(Read(Query("2026-11-02T08:00:00Z")).size(), 2u);
  std::vector<DecisionRecord> berths = Read(Query("", "berths"));
  ASSERT_EQ(berths.size(), 2u);
  EXPECT_EQ(berths[0].digest, Digest(1));
  EXPECT_EQ(berths[1].digest, Digest(3));
  EXPECT_EQ(Read(Query("2026-11-02T00:00:00Z", "berths")).size(), 1u);
}

TEST_F(StoreDecisionsTest, CopiesAndLinksDeliveredAreFound) {
  std::vector<DecisionRecord> records = {Decision(1, "berths", "2026-11-01T08:00:00Z"),
                                         Decision(2, "berths", "2026-11-01T08:00:00Z"),
                                         Decision(3, "berths", "2026-11-01T08:00:00Z"),
                                         Decision(4, "berths", "2026-11-01T08:00:00Z")};
  records[0].mode = DeliveryMode::kCopy;
  records[1].mode = DeliveryMode::kLink;
  records[2].mode = DeliveryMode::kMove;   // a move leaves nothing to skip
  records[3].mode = DeliveryMode::kCopy;   // never delivered
  ASSERT_TRUE(store_->LogIntended(&records).ok());
  ASSERT_TRUE(store_->MarkDelivered({records[0].id, records[1].id, records[2].id}).ok());
  std::vector<std::string> found;
  ASSERT_TRUE(
      store_->DeliveredCopies({Digest(1), Digest(2), Digest(3), Digest(4), Digest(5)}, &found)
          .ok());
  EXPECT_EQ(found, (std::vector<std::string>{Digest(1), Digest(2)}));
}

TEST_F(StoreDecisionsTest, LearnReviewedLearnsAndMarksInOneVersion) {
  std::vector<DecisionRecord> records = {Decision(1, "berths", "2026-11-01T08:00:00Z"),
                                         Decision(2, "berths", "2026-11-01T08:00:00Z")};
  ASSERT_TRUE(store_->LogIntended(&records).ok());
  ASSERT_TRUE(store_->MarkDelivered({records[0].id, records[1].id}).ok());
  VersionInfo before;
  ASSERT_TRUE(store_->CurrentVersion(&before).ok());

  LearnBatch batch;
  batch.Add(Digest(1), "billing", "/routed/billing/letter-1.txt", {"invoice", "unpaid"});
  batch.Add(Digest(2), "berths", "/routed/berths/letter-2.txt", {"berth"});
  LearnResult learned;
  std::vector<ReviewMark> marks = {
      {records[0].id, ReviewKind::kMoved, "billing", "/routed/billing/letter-1.txt"},
      {records[1].id, ReviewKind::kLeft, "berths", "/routed/berths/letter-2.txt"}};
  Status s = store_->LearnReviewed(batch, marks, {"2026-11-03T08:00:00Z", "nightly"}, &learned);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(learned.learned, 2);
  VersionInfo after;
  ASSERT_TRUE(store_->CurrentVersion(&after).ok());
  EXPECT_EQ(after.version, before.version + 1);
  EXPECT_EQ(after.command, "correct");
  EXPECT_EQ(after.by, "nightly");
  EXPECT_EQ(after.added, 2);

  std::vector<DecisionRecord> log = Read(Query(""));
  ASSERT_EQ(log.size(), 2u);
  EXPECT_EQ(log[0].review, ReviewKind::kMoved);
  EXPECT_EQ(log[0].reviewed_queue, "billing");
  EXPECT_EQ(log[0].reviewed_path, "/routed/billing/letter-1.txt");
  EXPECT_EQ(log[0].reviewed_at, "2026-11-03T08:00:00Z");
  EXPECT_EQ(log[1].review, ReviewKind::kLeft);

  // Moved again later: a new correction of the learned document.
  LearnBatch again;
  again.Add(Digest(1), "berths", "/routed/berths/letter-1.txt", {"invoice", "unpaid"});
  s = store_->LearnReviewed(
      again, {{records[0].id, ReviewKind::kMoved, "berths", "/routed/berths/letter-1.txt"}},
      {"2026-11-04T08:00:00Z", "nightly"}, &learned);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(learned.corrected, 1);
  EXPECT_EQ(Read(Query(""))[0].reviewed_queue, "berths");
}

TEST_F(StoreDecisionsTest, LearnReviewedWithAnUnknownDecisionChangesNothing) {
  VersionInfo before;
  ASSERT_TRUE(store_->CurrentVersion(&before).ok());
  LearnBatch batch;
  batch.Add(Digest(1), "billing", "/x.txt", {"invoice"});
  LearnResult learned;
  Status s = store_->LearnReviewed(batch, {{999, ReviewKind::kMoved, "billing", "/x.txt"}},
                                   {"2026-11-03T08:00:00Z", "nightly"}, &learned);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  std::optional<LedgerEntry> entry;
  ASSERT_TRUE(store_->FindDocument(Digest(1), &entry).ok());
  EXPECT_FALSE(entry.has_value());
  VersionInfo after;
  ASSERT_TRUE(store_->CurrentVersion(&after).ok());
  EXPECT_EQ(after.version, before.version);
}

TEST_F(StoreDecisionsTest, UnreadableFilesAreRememberedAndReplaced) {
  UnreadableFile f{"/inbox/scan.bin", 4096, 1700000000123456789, "", "binary (NUL byte)",
                   "2026-11-01T08:00:00Z", ""};
  ASSERT_TRUE(store_->RememberUnreadable(f).ok());
  std::optional<UnreadableFile> found;
  ASSERT_TRUE(store_->FindUnreadable("/inbox/scan.bin", &found).ok());
  ASSERT_TRUE(found.has_value());
  EXPECT_EQ(found->size, 4096);
  EXPECT_EQ(found->mtime_ns, 1700000000123456789);
  EXPECT_EQ(found->reason, "binary (NUL byte)");
  EXPECT_TRUE(found->digest.empty());
  f.size = 5000;
  f.digest = Digest(7);
  f.set_aside = "/routed/_unreadable/scan.bin";
  ASSERT_TRUE(store_->RememberUnreadable(f).ok());
  std::vector<UnreadableFile> all;
  ASSERT_TRUE(store_->ListUnreadable(&all).ok());
  ASSERT_EQ(all.size(), 1u);
  EXPECT_EQ(all[0].size, 5000);
  EXPECT_EQ(all[0].set_aside, "/routed/_unreadable/scan.bin");
  ASSERT_TRUE(store_->ForgetUnreadable("/inbox/scan.bin").ok());
  ASSERT_TRUE(store_->FindUnreadable("/inbox/scan.bin", &found).ok());
  EXPECT_FALSE(found.has_value());
}

TEST_F(StoreDecisionsTest, QueueRules) {
  Learn(1, "berths");
  std::vector<QueuePolicy> policies;
  ASSERT_TRUE(store_->QueuePolicies(&policies).ok());
  ASSERT_EQ(policies.size(), 1u);
  EXPECT_FALSE(policies[0].threshold.has_value());
  EXPECT_FALSE(policies[0].min_documents.has_value());
  EXPECT_EQ(policies[0].documents, 1);

  ASSERT_TRUE(store_->SetQueueThreshold("berths", 0.95).ok());
  ASSERT_TRUE(store_->SetQueueMinDocuments("berths", 20).ok());
  ASSERT_TRUE(store_->QueuePolicies(&policies).ok());
  EXPECT_EQ(policies[0].threshold, 0.95);
  EXPECT_EQ(policies[0].min_documents, 20);
  EXPECT_EQ(store_->SetQueueThreshold("berths", 0.0).code(), Status::Code::kInvalidArgument);
  EXPECT_EQ(store_->SetQueueThreshold("berths", 1.5).code(), Status::Code::kInvalidArgument);
  EXPECT_EQ(store_->SetQueueMinDocuments("berths", -1).code(), Status::Code::kInvalidArgument);
  EXPECT_EQ(store_->SetQueueThreshold("nowhere", 0.5).code(), Status::Code::kNotFound);
  ASSERT_TRUE(store_->SetQueueThreshold("berths", std::nullopt).ok());
  ASSERT_TRUE(store_->SetQueueMinDocuments("berths", std::nullopt).ok());
  ASSERT_TRUE(store_->QueuePolicies(&policies).ok());
  EXPECT_FALSE(policies[0].threshold.has_value());
  EXPECT_FALSE(policies[0].min_documents.has_value());
  // Routing rules are not the model: no version, same fingerprint.
  std::vector<VersionInfo> versions;
  ASSERT_TRUE(store_->ListVersions(&versions).ok());
  EXPECT_EQ(versions.back().command, "learn");
}

TEST_F(StoreDecisionsTest, ForgetErasesTheLogToo) {
  Learn(1, "berths");
  std::vector<DecisionRecord> records = {Decision(1, "berths", "2026-11-02T08:00:00Z"),
                                         Decision(2, "berths", "2026-11-02T08:00:00Z"),
                                         Decision(3, "berths", "2026-11-02T08:00:00Z")};
  records[1].source = "/inbox/zq-planted-name-0xA7.txt";
  const std::string third = "abcdef12" + std::string(56, '0');
  records[2].digest = third;
  ASSERT_TRUE(store_->LogIntended(&records).ok());
  ASSERT_TRUE(store_->MarkDelivered({records[0].id, records[1].id, records[2].id}).ok());
  ASSERT_TRUE(store_
                  ->RememberUnreadable({"/inbox/other.bin", 1, 1, Digest(2), "binary",
                                        "2026-11-02T08:00:00Z", ""})
                  .ok());

  // Document 2 was routed but never learned: found through the log.
  std::vector<std::string> logged;
  DocumentName by_path;
  by_path.source = "/inbox/zq-planted-name-0xA7.txt";
  ASSERT_TRUE(store_->FindLogged(by_path, &logged).ok());
  EXPECT_EQ(logged, std::vector<std::string>{Digest(2)});
  DocumentName by_prefix;
  by_prefix.prefix = "abcdef12";
  ASSERT_TRUE(store_->FindLogged(by_prefix, &logged).ok());
  EXPECT_EQ(logged, std::vector<std::string>{third});

  VersionInfo before;
  ASSERT_TRUE(store_->CurrentVersion(&before).ok());
  ForgetResult result;
  Status s = store_->Forget({Digest(1), Digest(2)}, {"2026-11-05T08:00:00Z", "dpo"}, &result);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(result.forgotten.size(), 1u);
  EXPECT_EQ(result.log_only, std::vector<std::string>{Digest(2)});
  EXPECT_EQ(result.decisions, 2);
  std::vector<DecisionRecord> log = Read(Query(""));
  ASSERT_EQ(log.size(), 1u);
  EXPECT_EQ(log[0].digest, third);
  std::vector<UnreadableFile> unreadable;
  ASSERT_TRUE(store_->ListUnreadable(&unreadable).ok());
  EXPECT_TRUE(unreadable.empty());
  EXPECT_TRUE(result.checkpointed);
  // The planted name is gone from the raw bytes of the store and its log.
  EXPECT_EQ(ReadFile(store_->path()).find("zq-planted-name-0xA7"), std::string::npos);
  EXPECT_EQ(ReadFile(store_->path() + "-wal").find("zq-planted-name-0xA7"), std::string::npos);

  // Forgetting only a logged document makes no version.
  ASSERT_TRUE(store_->Forget({third}, {"2026-11-05T09:00:00Z", "dpo"}, &result).ok());
  VersionInfo after;
  ASSERT_TRUE(store_->CurrentVersion(&after).ok());
  EXPECT_EQ(after.version, before.version + 1);
  // Neither learned nor logged: refused, nothing changes.
  EXPECT_EQ(store_->Forget({Digest(9)}, {"", "dpo"}, &result).code(), Status::Code::kNotFound);
}

TEST_F(StoreDecisionsTest, PurgeDeletesOldLogRows) {
  std::vector<DecisionRecord> records = {Decision(1, "berths", "2026-01-02T08:00:00Z"),
                                         Decision(2, "berths", "2026-11-02T08:00:00Z")};
  ASSERT_TRUE(store_->LogIntended(&records).ok());
  ASSERT_TRUE(store_->MarkDelivered({records[0].id, records[1].id}).ok());
  ASSERT_TRUE(store_
                  ->RememberUnreadable({"/inbox/old.bin", 1, 1, "", "binary",
                                        "2026-01-01T00:00:00Z", ""})
                  .ok());
  PurgeResult dry;
  ASSERT_TRUE(store_->Purge("2026-06-01T00:00:00Z", true, &dry).ok());
  EXPECT_EQ(dry.decisions, 1);
  EXPECT_EQ(dry.unreadable, 1);
  EXPECT_EQ(Read(Query("")).size(), 2u);
  PurgeResult done;
  ASSERT_TRUE(store_->Purge("2026-06-01T00:00:00Z", false, &done).ok());
  EXPECT_EQ(done.decisions, 1);
  std::vector<DecisionRecord> log = Read(Query(""));
  ASSERT_EQ(log.size(), 1u);
  EXPECT_EQ(log[0].digest, Digest(2));
  std::vector<UnreadableFile> unreadable;
  ASSERT_TRUE(store_->ListUnreadable(&unreadable).ok());
  EXPECT_TRUE(unreadable.empty());
  EXPECT_EQ(ReadFile(store_->path()).find("letter-1.txt"), std::string::npos);
}

}  // namespace
}  // namespace chute
