// Tests of the recount library (cli/recount.h) across a rebuild that
// changed tokenizing: a rollback to a version before it, and that
// version's model recounted in memory, equal the model a store made with
// that version's settings holds.
#include "cli/recount.h"

#include <gtest/gtest.h>

#include <cstdio>
#include <filesystem>
#include <memory>
#include <string>
#include <vector>

#include "store/text_codec.h"

namespace chute {
namespace {

const ChangeInfo kChange{"2026-05-01T09:30:00Z", "night-job"};

class RecountTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = std::filesystem::temp_directory_path() /
           ("chute-recount-" + std::to_string(::getpid()) + "-" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    std::filesystem::remove_all(dir_);
    std::filesystem::create_directories(dir_);
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }

  std::unique_ptr<Store> Create(const std::string& name, bool bigrams) {
    StoreSettings s;
    s.tokenizer.bigrams = bigrams;
    std::unique_ptr<Store> store;
    EXPECT_TRUE(Store::Create((dir_ / name).string(), s, &store, kChange).ok());
    return store;
  }

  // Learns letters first..last-1 with the store's own tokenizer and text.
  void Learn(Store* store, int first, int last) {
    Tokenizer tokenizer(store->settings().tokenizer);
    LearnBatch batch;
    const char* words[] = {"berth",  "pier",  "invoice", "dues",
                           "marina", "yacht", "fee",     "tide"};
    for (int i = first; i < last; ++i) {
      std::string text;
      for (int k = 0; k < 7; ++k)
        text += std::string(k ? " " : "") + words[(i * 5 + k * 3) % 8];
      std::vector<std::string> terms;
      tokenizer.Tokenize(text, &terms);
      std::string packed;
      ASSERT_TRUE(PackText(text, &packed).ok());
      char digest[65];
      std::snprintf(digest, sizeof digest, "%064x", i + 1);
      batch.Add(digest, i % 2 ? "billing" : "berths", "-", terms, packed);
    }
    LearnResult result;
    ASSERT_TRUE(store->Learn(batch, kChange, &result).ok());
  }

  std::filesystem::path dir_;
};

void ExpectSameCounts(const ModelCounts& a, const ModelCounts& b) {
  ASSERT_EQ(a.queues.size(), b.queues.size());
  for (size_t q = 0; q < a.queues.size(); ++q) {
    EXPECT_EQ(a.queues[q].name, b.queues[q].name);
    EXPECT_EQ(a.queues[q].documents, b.queues[q].documents);
    EXPECT_EQ(a.queues[q].tokens, b.queues[q].tokens);
  }
  EXPECT_EQ(a.terms, b.terms);
  EXPECT_EQ(a.counts, b.counts);
}

TEST_F(RecountTest, RollbackAndRouteReachBackAcrossATokenizingRebuild) {
  auto store = Create("a.db", false);
  Learn(store.get(), 0, 8);
  VersionInfo before;
  ASSERT_TRUE(store->CurrentVersion(&before).ok());
  ModelCounts at_before;
  ASSERT_TRUE(store->LoadModelCounts(&at_before).ok());

  RebuildRequest request;
  request.target = store->settings();
  request.target.tokenizer.bigrams = true;
  request.threads = 2;
  request.change = kChange;
  RebuildOutcome outcome;
  ASSERT_TRUE(Rebuild(store.get(), request, &outcome).ok());
  Learn(store.get(), 8, 12);  // learned with bigrams, after the rebuild

  // The store refuses; the recount reaches back.
  VersionInfo info;
  StoreSettings settings;
  ModelCounts counts;
  EXPECT_EQ(
      store->ModelAtVersion(before.version, &info, &settings, &counts).code(),
      Status::Code::kInvalidArgument);
  ASSERT_TRUE(RecountedModelAtVersion(store.get(), before.version, 2, &info,
                                      &settings, &counts)
                  .ok());
  EXPECT_FALSE(settings.tokenizer.bigrams);
  ExpectSameCounts(counts, at_before);

  RollbackResult result;
  ASSERT_TRUE(
      RollbackAcrossTokenizing(store.get(), before.version, kChange, 2, &result)
          .ok());
  EXPECT_EQ(result.made.command, "rollback");
  EXPECT_EQ(result.removed, 4);
  EXPECT_FALSE(store->settings().tokenizer.bigrams);
  ModelCounts now;
  ASSERT_TRUE(store->LoadModelCounts(&now).ok());
  ExpectSameCounts(now, at_before);
  EXPECT_EQ(result.made.fingerprint, before.fingerprint);
}

}  // namespace
}  // namespace chute
