// Tests of the folder router (cli/deliver/folder_router.h) through its
// library API, with a real store and real files: what the CLI tests cannot
// reach directly (reloading a newer model; finishing or dropping the
// deliveries an earlier run left in the log).
#include "cli/deliver/folder_router.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <memory>
#include <set>
#include <string>
#include <vector>

#include "cli/deliver/file_delivery.h"
#include "cli/read/sha256.h"
#include "tokenize/tokenizer.h"

namespace chute {
namespace {

namespace fs = std::filesystem;

const ChangeInfo kChange{"2026-12-01T09:30:00Z", "tester"};

class FolderRouterTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() /
           ("chute-folder-router-" + std::to_string(::getpid()) + "-" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(dir_);
    fs::create_directories(dir_ / "inbox");
    ASSERT_TRUE(Store::Create((dir_ / "s.db").string(), StoreSettings(), &store_, kChange).ok());
    Learn({{"billing", "invoice payment refund dues"}, {"berths", "berth pier vessel quay"}});
    options_.into = (dir_ / "routed").string();
    options_.by = "tester";
  }
  void TearDown() override { fs::remove_all(dir_); }

  void Learn(const std::vector<std::pair<std::string, std::string>>& docs) {
    Tokenizer tokenizer(store_->settings().tokenizer);
    LearnBatch batch;
    for (const auto& [queue, text] : docs) {
      std::vector<std::string> terms;
      tokenizer.Tokenize(text, &terms);
      batch.Add(Sha256Hex(text), queue, "-", terms);
    }
    LearnResult result;
    ASSERT_TRUE(store_->Learn(batch, kChange, &result).ok());
  }

  std::string Write(const std::string& rel, const std::string& text) {
    const fs::path p = dir_ / rel;
    fs::create_directories(p.parent_path());
    std::ofstream(p, std::ios::binary) << text;
    return p.string();
  }

  std::unique_ptr<FolderRouter> Open(FolderRouteTally* tally,
                                     std::vector<RoutedDocument>* reported = nullptr) {
    std::unique_ptr<FolderRouter> router;
    Status s = FolderRouter::Open(store_.get(), options_, &router, tally,
                                  [reported](const RoutedDocument& d) {
                                    if (reported) reported->push_back(d);
                                  });
    EXPECT_TRUE(s.ok()) << s.message();
    return router;
  }

  std::vector<DecisionRecord> Pending() {
    std::vector<DecisionRecord> pending;
    EXPECT_TRUE(store_->PendingDeliveries(&pending).ok());
    return pending;
  }

  fs::path dir_;
  std::unique_ptr<Store> store_;
  FolderRouteOptions options_;
};

TEST_F(FolderRouterTest, RoutesInInputOrderAndLogsEachDelivery) {
  const std::string a = Write("inbox/a.txt", "invoice refund");
  const std::string b = Write("inbox/b.txt", "pier vessel");
  FolderRouteTally tally;
  auto router = Open(&tally);
  ASSERT_TRUE(router);
  std::vector<RoutedDocument> seen;
  ASSERT_TRUE(router
                  ->Route({{a, ""}, {b, ""}},
                          [&](const RoutedDocument& d) { seen.push_back(d); }, &tally)
                  .ok());
  ASSERT_EQ(seen.size(), 2u);
  EXPECT_EQ(seen[0].path, a);
  EXPECT_EQ(seen[0].outcome, RoutedDocument::Outcome::kDelivered);
  EXPECT_EQ(seen[0].record.queue, "billing");
  EXPECT_EQ(seen[0].record.destination, router->root() + "/billing/a.txt");
  EXPECT_EQ(seen[1].record.destination, router->root() + "/berths/b.txt");
  EXPECT_EQ(seen[0].record.model_version, router->model_version());
  EXPECT_EQ(seen[0].record.terms, 2);
  EXPECT_EQ(seen[0].record.unknown_terms, 0);
  EXPECT_EQ(tally.delivered, 2);
  EXPECT_FALSE(fs::exists(a));
  EXPECT_TRUE(fs::exists(router->root() + "/billing/a.txt"));
  EXPECT_TRUE(Pending().empty());
  int64_t rows = 0;
  ASSERT_TRUE(store_
                  ->ReadDecisions(DecisionQuery(),
                                  [&](const DecisionRecord& r) {
                                    ++rows;
                                    EXPECT_TRUE(r.delivered);
                                    return Status::Ok();
                                  })
                  .ok());
  EXPECT_EQ(rows, 2);
}

TEST_F(FolderRouterTest, ReloadsOnlyWhenTheStoreHasANewerModel) {
  FolderRouteTally tally;
  auto router = Open(&tally);
  ASSERT_TRUE(router);
  const int64_t before = router->model_version();
  bool reloaded = true;
  ASSERT_TRUE(router->ReloadIfChanged(&reloaded).ok());
  EXPECT_FALSE(reloaded);
  Learn({{"customs", "declaration cargo manifest"}});
  ASSERT_TRUE(router->ReloadIfChanged(&reloaded).ok());
  EXPECT_TRUE(reloaded);
  EXPECT_GT(router->model_version(), before);
  const std::string c = Write("inbox/c.txt", "cargo manifest declaration");
  std::vector<RoutedDocument> seen;
  ASSERT_TRUE(
      router->Route({{c, ""}}, [&](const RoutedDocument& d) { seen.push_back(d); }, &tally).ok());
  ASSERT_EQ(seen.size(), 1u);
  EXPECT_EQ(seen[0].record.queue, "customs");
  // A threshold set meanwhile is read by the next reload, without a new
  // model.
  ASSERT_TRUE(store_->SetQueueThreshold("customs", 1.0).ok());
  ASSERT_TRUE(router->ReloadIfChanged(&reloaded).ok());
  EXPECT_FALSE(reloaded);
  const std::string d = Write("inbox/d.txt", "cargo manifest");
  seen.clear();
  ASSERT_TRUE(
      router->Route({{d, ""}}, [&](const RoutedDocument& r) { seen.push_back(r); }, &tally).ok());
  ASSERT_EQ(seen.size(), 1u);
  EXPECT_EQ(seen[0].record.held, HeldReason::kThreshold);
}

// A run killed after logging its intended deliveries: the next Open
// finishes the one whose file is still in the inbox, takes the one already
// moved as done, and drops the one found nowhere, reporting each.
TEST_F(FolderRouterTest, OpenFinishesOrDropsTheDeliveriesAnEarlierRunLeft) {
  const std::string root = (dir_ / "routed").string();
  fs::create_directories(root + "/billing");
  const std::string waiting = Write("inbox/waiting.txt", "invoice dues");
  const std::string moved_text = "refund payment";
  Write("routed/billing/moved.txt", moved_text);
  std::vector<DecisionRecord> records(3);
  const std::string texts[] = {"invoice dues", moved_text, "vanished words"};
  const std::string names[] = {"waiting.txt", "moved.txt", "gone.txt"};
  for (int i = 0; i < 3; ++i) {
    DecisionRecord& r = records[i];
    r.digest = Sha256Hex(texts[i]);
    r.source = (dir_ / "inbox" / names[i]).string();
    r.destination = fs::canonical(root).string() + "/billing/" + names[i];
    r.queue = "billing";
    r.confidence = 0.9;
    r.model_version = 1;
    r.time = kChange.now;
    r.by = "tester";
  }
  ASSERT_TRUE(store_->LogIntended(&records).ok());
  ASSERT_EQ(Pending().size(), 3u);

  FolderRouteTally tally;
  std::vector<RoutedDocument> reported;
  auto router = Open(&tally, &reported);
  ASSERT_TRUE(router);
  EXPECT_EQ(tally.finished_pending, 2);
  EXPECT_EQ(tally.failed, 1);
  ASSERT_EQ(reported.size(), 3u);
  EXPECT_EQ(reported[0].outcome, RoutedDocument::Outcome::kDelivered);
  EXPECT_EQ(reported[1].outcome, RoutedDocument::Outcome::kDelivered);
  EXPECT_EQ(reported[2].outcome, RoutedDocument::Outcome::kFailed);
  EXPECT_NE(reported[2].reason.find("neither"), std::string::npos) << reported[2].reason;
  EXPECT_FALSE(fs::exists(waiting));
  EXPECT_TRUE(fs::exists(root + "/billing/waiting.txt"));
  EXPECT_TRUE(Pending().empty());
  int64_t rows = 0;
  ASSERT_TRUE(store_
                  ->ReadDecisions(DecisionQuery(),
                                  [&](const DecisionRecord&) {
                                    ++rows;
                                    return Status::Ok();
                                  })
                  .ok());
  EXPECT_EQ(rows, 2);
}

TEST_F(FolderRouterTest, TheAuditDrawDependsOnlyOnTheSeedAndTheDigest) {
  std::vector<InputFile> files;
  for (int i = 0; i < 60; ++i) {
    files.push_back({Write("inbox/" + std::to_string(i) + ".txt",
                           "invoice payment " + std::to_string(i)),
                     ""});
  }
  auto drawn = [&](uint64_t seed, bool reversed) {
    options_.dry_run = true;
    options_.audit_share = 0.25;
    options_.audit_seed = seed;
    FolderRouteTally tally;
    auto router = Open(&tally);
    std::vector<InputFile> in = files;
    if (reversed) std::reverse(in.begin(), in.end());
    std::set<std::string> audit;
    EXPECT_TRUE(router
                    ->Route(in,
                            [&](const RoutedDocument& d) {
                              if (d.record.held == HeldReason::kAudit) audit.insert(d.path);
                            },
                            &tally)
                    .ok());
    return audit;
  };
  const auto a = drawn(11, false);
  EXPECT_EQ(a, drawn(11, true));
  EXPECT_NE(a, drawn(12, false));
  // 60 draws of share 1/4: 15 expected; far tails excluded.
  EXPECT_GE(a.size(), 4u);
  EXPECT_LE(a.size(), 30u);
  EXPECT_FALSE(fs::exists(dir_ / "routed"));  // a dry run makes nothing
}

}  // namespace
}  // namespace chute
