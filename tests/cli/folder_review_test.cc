// Tests of the folder review (cli/deliver/folder_review.h) on a real store
// whose decision log is seeded through the Store API (LogIntended +
// MarkDelivered), with files laid out as `route --into` leaves them and
// moved as reviewers would.
#include "cli/deliver/folder_review.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <map>
#include <memory>

#include "cli/read/document_reader.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

namespace fs = std::filesystem;
using testing_files::TempDir;
using testing_files::WriteFile;

const ChangeInfo kChange{"2026-12-02T08:00:00Z", "tester"};

class FolderReviewTest : public ::testing::Test {
 protected:
  void SetUp() override {
    ASSERT_TRUE(Store::Create(dir_.File("s.db"), StoreSettings{}, &store_).ok());
    tokenizer_ = std::make_unique<Tokenizer>(store_->settings().tokenizer);
    // The model knows two queues.
    LearnBatch batch;
    std::vector<std::string> terms;
    tokenizer_->Tokenize("building permit for a garage extension", &terms);
    batch.Add(testing_files::NumberedDigest(1), "permits", "p1", terms);
    tokenizer_->Tokenize("insurance claim for storm damage to the roof", &terms);
    batch.Add(testing_files::NumberedDigest(2), "claims", "c1", terms);
    LearnResult learned;
    ASSERT_TRUE(store_->Learn(batch, kChange, &learned).ok());
    fs::create_directory(dir_.File("routed"));
    root_ = fs::canonical(dir_.File("routed")).string();
  }

  // Puts a document where route --into would (DEST/<queue>/ or _review/)
  // and logs it as delivered. Returns the decision id.
  int64_t Deliver(const std::string& name, const std::string& text, const std::string& queue,
                  HeldReason held = HeldReason::kNone,
                  const std::string& time = "2026-12-01T08:00:00Z") {
    const std::string folder = held == HeldReason::kNone ? queue : kReviewFolder;
    fs::create_directories(root_ + "/" + folder);
    const std::string path = root_ + "/" + folder + "/" + name;
    WriteFile(path, text);
    Document doc;
    EXPECT_TRUE(ReadDocument(path, ReadOptions{}, &doc).ok());
    std::vector<DecisionRecord> records(1);
    DecisionRecord& r = records[0];
    r.digest = doc.digest;
    r.source = dir_.File("inbox/" + name);
    r.destination = path;
    r.queue = queue;
    r.confidence = 0.9;
    r.runner_up = queue == "permits" ? "claims" : "permits";
    r.runner_up_posterior = 0.1;
    r.held = held;
    r.model_version = 2;
    r.time = time;
    r.by = "tester";
    r.terms = 5;
    EXPECT_TRUE(store_->LogIntended(&records).ok());
    EXPECT_TRUE(store_->MarkDelivered({records[0].id}).ok());
    digest_of_[records[0].id] = doc.digest;
    return records[0].id;
  }

  void Move(const std::string& from, const std::string& to) {
    fs::create_directories(fs::path(root_ + "/" + to).parent_path());
    fs::rename(root_ + "/" + from, root_ + "/" + to);
  }

  FolderReview Plan(FolderReviewOptions options = {}) {
    FolderReview review;
    EXPECT_TRUE(PlanFolderReview(store_.get(), root_, options, tokenizer_.get(), &review).ok());
    return review;
  }

  // Plans and learns, as the command does.
  FolderReview Apply(FolderReviewOptions options = {}) {
    FolderReview review = Plan(options);
    if (!review.batch.empty()) {
      LearnResult result;
      EXPECT_TRUE(store_->LearnReviewed(review.batch, review.marks, kChange, &result).ok());
    }
    return review;
  }

  DecisionRecord Decision(int64_t id) {
    DecisionRecord found;
    DecisionQuery all;
    EXPECT_TRUE(store_
                    ->ReadDecisions(all,
                                    [&](const DecisionRecord& r) {
                                      if (r.id == id) found = r;
                                      return Status::Ok();
                                    })
                    .ok());
    return found;
  }

  std::string LearnedQueue(int64_t id) {
    std::optional<LedgerEntry> entry;
    EXPECT_TRUE(store_->FindDocument(digest_of_[id], &entry).ok());
    return entry ? entry->queue : "";
  }

  static int Count(const FolderReview& r, FolderReviewOutcome outcome) {
    int n = 0;
    for (const FolderReviewItem& i : r.items) n += i.outcome == outcome;
    return n;
  }

  TempDir dir_;
  std::unique_ptr<Store> store_;
  std::unique_ptr<Tokenizer> tokenizer_;
  std::string root_;
  std::map<int64_t, std::string> digest_of_;
};

TEST_F(FolderReviewTest, AMoveIntoAnotherQueueIsLearnedOnceAsACorrection) {
  const int64_t id = Deliver("letter.txt", "storm damage claim for the roof", "permits");
  EXPECT_EQ(Plan().waiting, 1);
  Move("permits/letter.txt", "claims/letter.txt");
  FolderReview first = Apply();
  ASSERT_EQ(first.items.size(), 1u);
  EXPECT_EQ(first.items[0].outcome, FolderReviewOutcome::kCorrected);
  EXPECT_EQ(first.items[0].queue, "claims");
  EXPECT_EQ(first.items[0].chosen, "permits");
  EXPECT_EQ(LearnedQueue(id), "claims");
  const DecisionRecord d = Decision(id);
  EXPECT_EQ(d.review, ReviewKind::kMoved);
  EXPECT_EQ(d.reviewed_queue, "claims");
  EXPECT_EQ(d.reviewed_path, root_ + "/claims/letter.txt");

  // Learned once: a second run finds it where the review left it.
  FolderReview second = Apply();
  EXPECT_TRUE(second.items.empty());
  EXPECT_TRUE(second.batch.empty());
  EXPECT_EQ(second.unchanged, 1);

  // Moved again later: a new correction, back to permits.
  Move("claims/letter.txt", "permits/letter.txt");
  FolderReview third = Apply();
  ASSERT_EQ(third.items.size(), 1u);
  EXPECT_EQ(third.items[0].outcome, FolderReviewOutcome::kCorrected);
  EXPECT_EQ(third.items[0].queue, "permits");
  EXPECT_EQ(LearnedQueue(id), "permits");
  EXPECT_EQ(Decision(id).reviewed_path, root_ + "/permits/letter.txt");
}

TEST_F(FolderReviewTest, ARenamedFileIsFoundByItsContent) {
  const int64_t id = Deliver("scan-0001.txt", "application for a building permit", "claims");
  Move("claims/scan-0001.txt", "permits/garage permit.txt");
  FolderReview r = Apply();
  ASSERT_EQ(r.items.size(), 1u);
  EXPECT_EQ(r.items[0].outcome, FolderReviewOutcome::kCorrected);
  EXPECT_EQ(r.items[0].path, root_ + "/permits/garage permit.txt");
  EXPECT_EQ(LearnedQueue(id), "permits");
}

// Two documents with the same file name in two queues: neither is taken for
// the other, though the name matches.
TEST_F(FolderReviewTest, TheSameNameInAnotherQueueIsNotAnotherDocument) {
  const int64_t a = Deliver("a.txt", "permit for a fence", "permits");
  const int64_t b = Deliver("a.txt", "claim for a broken window", "claims");
  // a is moved into claims under a new name (the name is taken there).
  Move("permits/a.txt", "claims/a-moved.txt");
  FolderReview r = Apply();
  ASSERT_EQ(r.items.size(), 1u);
  EXPECT_EQ(r.items[0].decision_id, a);
  EXPECT_EQ(r.items[0].path, root_ + "/claims/a-moved.txt");
  EXPECT_EQ(r.waiting, 1);  // b, still where chute put it
  EXPECT_EQ(Decision(b).review, ReviewKind::kNone);
}

TEST_F(FolderReviewTest, DocumentsTakenOutOfReviewAreLearnedUnderTheirNewQueue) {
  const int64_t guessed = Deliver("g.txt", "permit to extend a garage", "permits",
                                  HeldReason::kThreshold);
  const int64_t other = Deliver("o.txt", "roof damage after the storm", "permits",
                                HeldReason::kAudit);
  const int64_t untouched = Deliver("u.txt", "a letter nobody read", "claims",
                                    HeldReason::kNoTerms);
  Move("_review/g.txt", "permits/g.txt");
  Move("_review/o.txt", "claims/o.txt");
  FolderReview r = Apply();
  std::map<int64_t, FolderReviewItem> by_id;
  for (const FolderReviewItem& i : r.items) by_id[i.decision_id] = i;
  ASSERT_EQ(by_id.size(), 3u);
  EXPECT_EQ(by_id[guessed].outcome, FolderReviewOutcome::kConfirmed);
  EXPECT_EQ(by_id[guessed].kind, ReviewKind::kMoved);
  EXPECT_EQ(by_id[other].outcome, FolderReviewOutcome::kCorrected);
  EXPECT_EQ(by_id[other].queue, "claims");
  EXPECT_EQ(by_id[untouched].outcome, FolderReviewOutcome::kSkipped);
  EXPECT_FALSE(by_id[untouched].refused);
  EXPECT_EQ(LearnedQueue(guessed), "permits");
  EXPECT_EQ(LearnedQueue(other), "claims");
  EXPECT_EQ(LearnedQueue(untouched), "");
  EXPECT_EQ(Decision(other).reviewed_queue, "claims");
}

TEST_F(FolderReviewTest, ConfirmAfterLearnsOnlyOldUntouchedAutomaticDecisions) {
  const int64_t old_routed =
      Deliver("old.txt", "permit for a shed", "permits", HeldReason::kNone, "2026-11-20T08:00:00Z");
  const int64_t new_routed = Deliver("new.txt", "permit for a porch", "permits",
                                     HeldReason::kNone, "2026-12-02T07:00:00Z");
  const int64_t old_audit = Deliver("audit.txt", "claim for hail damage", "claims",
                                    HeldReason::kAudit, "2026-11-20T08:00:00Z");
  const int64_t old_held = Deliver("held.txt", "unclear letter", "claims",
                                   HeldReason::kThreshold, "2026-11-20T08:00:00Z");
  FolderReviewOptions options;
  options.confirm_before = "2026-12-01T08:00:00Z";
  FolderReview r = Apply(options);
  EXPECT_EQ(Count(r, FolderReviewOutcome::kConfirmed), 1);
  EXPECT_EQ(Count(r, FolderReviewOutcome::kSkipped), 2);  // the audit and the held one
  EXPECT_EQ(r.waiting, 1);                                // the new one
  EXPECT_EQ(Decision(old_routed).review, ReviewKind::kLeft);
  EXPECT_EQ(Decision(old_routed).reviewed_queue, "permits");
  EXPECT_EQ(LearnedQueue(old_routed), "permits");
  EXPECT_EQ(Decision(new_routed).review, ReviewKind::kNone);
  EXPECT_EQ(Decision(old_audit).review, ReviewKind::kNone);
  EXPECT_EQ(Decision(old_held).review, ReviewKind::kNone);
  // Confirmed once.
  FolderReview again = Apply(options);
  EXPECT_EQ(Count(again, FolderReviewOutcome::kConfirmed), 0);
  EXPECT_EQ(again.unchanged, 1);
}

TEST_F(FolderReviewTest, AFolderThatIsNotAQueueIsReportedUnlessAskedToCreateIt) {
  const int64_t id = Deliver("t.txt", "tender for road works", "permits");
  Move("permits/t.txt", "tenders/t.txt");
  FolderReview refused = Plan();
  ASSERT_EQ(refused.items.size(), 1u);
  EXPECT_EQ(refused.items[0].outcome, FolderReviewOutcome::kSkipped);
  EXPECT_TRUE(refused.items[0].refused);
  ASSERT_EQ(refused.problems.size(), 1u);
  EXPECT_NE(refused.problems[0].find("--create-queues"), std::string::npos);
  EXPECT_TRUE(refused.batch.empty());

  FolderReviewOptions create;
  create.create_queues = true;
  FolderReview created = Apply(create);
  ASSERT_EQ(created.items.size(), 1u);
  EXPECT_EQ(created.items[0].outcome, FolderReviewOutcome::kCorrected);
  EXPECT_EQ(LearnedQueue(id), "tenders");
}

TEST_F(FolderReviewTest, GoneDocumentsAndChosenFoldersAreLeftAlone) {
  Deliver("gone.txt", "permit taken away for work", "permits");
  Deliver("back.txt", "claim put back into review", "claims");
  fs::remove(root_ + "/permits/gone.txt");
  Move("claims/back.txt", "_review/back.txt");
  // chute's own and hidden names are not queues.
  fs::create_directories(root_ + "/_unreadable");
  WriteFile(root_ + "/_unreadable/x.bin", "x");
  WriteFile(root_ + "/permits/.chute-tmp-123", "partial");
  FolderReview r = Apply();
  EXPECT_EQ(r.gone, 1);
  ASSERT_EQ(r.items.size(), 1u);
  EXPECT_EQ(r.items[0].outcome, FolderReviewOutcome::kSkipped);
  EXPECT_NE(r.items[0].reason.find("back in _review"), std::string::npos);
  EXPECT_TRUE(r.problems.empty());
  EXPECT_TRUE(r.batch.empty());
}

}  // namespace
}  // namespace chute
