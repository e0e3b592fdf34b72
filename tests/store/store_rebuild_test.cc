// Tests of the recount beside the current counts and its swap
// (store/store_rebuild.cc): what was learned, corrected or forgotten while a
// recount ran is caught up, so the swapped-in model is exactly the one a
// store made with the new settings would hold; a reader's open snapshot
// keeps the old model.
#include <gtest/gtest.h>

#include <algorithm>
#include <cstdio>
#include <memory>
#include <string>
#include <vector>

#include "store/check.h"
#include "store/store.h"
#include "store/text_codec.h"
#include "tests/store/test_files.h"
#include "tokenize/tokenizer.h"

namespace chute {
namespace {

using testing_files::TempDir;

const ChangeInfo kChange{"2026-05-01T09:30:00Z", "night-job"};

struct Letter {
  std::string digest;
  std::string queue;
  std::string text;
};

// Twelve letters over three queues, words from one small pool.
std::vector<Letter> Letters() {
  const char* words[] = {"berth",   "pier",   "invoice", "dues", "marina",
                         "pontoon", "vessel", "refund",  "tide", "yacht",
                         "fee",     "quay",   "2026",    "of"};
  const char* queues[] = {"berths", "billing", "marina"};
  std::vector<Letter> out;
  uint32_t x = 7;
  for (unsigned i = 0; i < 12; ++i) {
    char digest[65];
    std::snprintf(digest, sizeof digest, "%064x", i + 1);
    std::string text;
    for (int k = 0; k < 9; ++k) {
      x = x * 1664525u + 1013904223u;  // an LCG (common practice), seeded
      text += std::string(k ? " " : "") + words[(x >> 8) % 14];
    }
    out.push_back({digest, queues[i % 3], text});
  }
  return out;
}

StoreSettings Settings(bool bigrams) {
  StoreSettings s;
  s.tokenizer.bigrams = bigrams;
  return s;
}

// Learns letters (under `queue` when given) the way learn does, with text.
void Learn(Store* store, const std::vector<Letter>& letters, bool bigrams) {
  Tokenizer tokenizer(Settings(bigrams).tokenizer);
  LearnBatch batch;
  std::vector<std::string> terms;
  for (const Letter& l : letters) {
    terms.clear();
    tokenizer.Tokenize(l.text, &terms);
    std::string packed;
    ASSERT_TRUE(PackText(l.text, &packed).ok());
    batch.Add(l.digest, l.queue, "/in/" + l.digest.substr(60), terms, packed);
  }
  LearnResult result;
  ASSERT_TRUE(store->Learn(batch, kChange, &result).ok());
}

RecountFunction Recounter(Tokenizer* tokenizer) {
  return [tokenizer](const std::string& text, RecountedDocument* doc) {
    std::vector<std::string> terms;
    tokenizer->Tokenize(text, &terms);
    std::sort(terms.begin(), terms.end());
    doc->tokens = static_cast<int64_t>(terms.size());
    doc->terms.clear();
    for (const std::string& t : terms) {
      if (!doc->terms.empty() && doc->terms.back().first == t) {
        ++doc->terms.back().second;
      } else {
        doc->terms.emplace_back(t, 1);
      }
    }
    return Status::Ok();
  };
}

// Recounts every ledger document with the function, in batches of `batch`.
void RecountAll(Store* reader, Store* writer, const RecountFunction& recount,
                size_t batch) {
  std::vector<RecountedDocument> docs;
  ASSERT_TRUE(reader
                  ->ReadLedgerTexts([&](const LedgerText& t) {
                    RecountedDocument d;
                    d.ledger_id = t.ledger_id;
                    EXPECT_TRUE(t.text.has_value());
                    if (Status s = recount(*t.text, &d); !s.ok()) return s;
                    docs.push_back(std::move(d));
                    if (docs.size() < batch) return Status::Ok();
                    Status s = writer->WriteRecounted(docs);
                    docs.clear();
                    return s;
                  })
                  .ok());
  ASSERT_TRUE(writer->WriteRecounted(docs).ok());
}

void ExpectSameModel(Store* a, Store* b) {
  ModelCounts x, y;
  ASSERT_TRUE(a->LoadModelCounts(&x).ok());
  ASSERT_TRUE(b->LoadModelCounts(&y).ok());
  ASSERT_EQ(x.queues.size(), y.queues.size());
  for (size_t q = 0; q < x.queues.size(); ++q) {
    EXPECT_EQ(x.queues[q].name, y.queues[q].name);
    EXPECT_EQ(x.queues[q].documents, y.queues[q].documents) << x.queues[q].name;
    EXPECT_EQ(x.queues[q].tokens, y.queues[q].tokens) << x.queues[q].name;
  }
  EXPECT_EQ(x.terms, y.terms);
  EXPECT_EQ(x.counts, y.counts);
  VersionInfo va, vb;
  ASSERT_TRUE(a->CurrentVersion(&va).ok());
  ASSERT_TRUE(b->CurrentVersion(&vb).ok());
  EXPECT_EQ(va.fingerprint, vb.fingerprint);
}

void ExpectConsistent(const std::string& path) {
  CheckReport report;
  ASSERT_TRUE(CheckStore(path, &report).ok());
  for (const CheckLine& l : report.lines)
    EXPECT_TRUE(l.ok) << l.check << ": " << l.detail;
}

TEST(RecountSwapTest, CatchesUpWhatWasLearnedCorrectedAndForgottenMeanwhile) {
  TempDir dir;
  std::vector<Letter> letters = Letters();
  const std::string path = dir.path() + "/a.db";
  std::unique_ptr<Store> store, writer;
  ASSERT_TRUE(Store::Create(path, Settings(false), &store, kChange).ok());
  Learn(store.get(), {letters.begin(), letters.begin() + 9}, false);

  int64_t base = 0;
  bool replaced = true;
  ASSERT_TRUE(
      store->BeginRecount(Settings(true), kChange, &base, &replaced).ok());
  EXPECT_FALSE(replaced);
  ASSERT_TRUE(Store::Open(path, &writer).ok());
  Tokenizer bigrams(Settings(true).tokenizer);
  // Corrected and forgotten between the recount's batches and the swap.
  RecountAll(store.get(), writer.get(), Recounter(&bigrams), 4);
  Learn(writer.get(), {letters.begin() + 9, letters.end()},
        false);  // three new
  CorrectResult corrected;
  ASSERT_TRUE(writer
                  ->Correct({{letters[1].digest, "marina"}}, LearnBatch(),
                            kChange, &corrected)
                  .ok());
  letters[1].queue = "marina";
  ForgetResult forgotten;
  Status forget = writer->Forget({letters[4].digest}, kChange, &forgotten);
  ASSERT_TRUE(forget.ok()) << forget.message();
  letters.erase(letters.begin() + 4);

  SwapResult swap;
  ASSERT_TRUE(
      store->SwapRecount("rebuild", kChange, "{}", Recounter(&bigrams), &swap)
          .ok());
  EXPECT_EQ(swap.caught_up, 3);
  EXPECT_EQ(swap.resynced, 1);
  EXPECT_EQ(swap.made.command, "rebuild");
  EXPECT_TRUE(store->settings().tokenizer.bigrams);

  std::unique_ptr<Store> fresh;
  ASSERT_TRUE(
      Store::Create(dir.path() + "/b.db", Settings(true), &fresh, kChange)
          .ok());
  Learn(fresh.get(), letters, true);
  ExpectSameModel(store.get(), fresh.get());
  ExpectConsistent(path);
  std::optional<RecountInfo> left;
  ASSERT_TRUE(store->LoadRecount(&left).ok());
  EXPECT_FALSE(left.has_value());
}

TEST(RecountSwapTest, AReaderInATransactionKeepsTheOldModel) {
  TempDir dir;
  const std::vector<Letter> letters = Letters();
  const std::string path = dir.path() + "/a.db";
  std::unique_ptr<Store> store, reader;
  ASSERT_TRUE(Store::Create(path, Settings(false), &store, kChange).ok());
  Learn(store.get(), letters, false);
  int64_t base = 0;
  bool replaced = false;
  ASSERT_TRUE(
      store->BeginRecount(Settings(true), kChange, &base, &replaced).ok());
  Tokenizer bigrams(Settings(true).tokenizer);
  RecountAll(store.get(), store.get(), Recounter(&bigrams), 100);
  ASSERT_TRUE(Store::Open(path, &reader).ok());
  ModelCounts before;
  bool swapped = false;
  int64_t documents = 0;
  // The swap commits while the reader is half-way through its snapshot.
  ASSERT_TRUE(reader
                  ->ReadCountsAndLedger(
                      &before,
                      [&](LedgerDocument& d) {
                        if (!swapped) {
                          SwapResult swap;
                          EXPECT_TRUE(
                              store
                                  ->SwapRecount("rebuild", kChange, "{}",
                                                Recounter(&bigrams), &swap)
                                  .ok());
                          swapped = true;
                        }
                        ++documents;
                        for (const auto& [term, n] : d.terms) {
                          EXPECT_EQ(term.find(' '), std::string::npos) << term;
                        }
                      })
                  .ok());
  EXPECT_TRUE(swapped);
  EXPECT_EQ(documents, 12);
  for (const std::string& t : before.terms)
    EXPECT_EQ(t.find(' '), std::string::npos) << t;
  ModelCounts after;
  ASSERT_TRUE(reader->LoadModelCounts(&after).ok());
  EXPECT_TRUE(std::any_of(
      after.terms.begin(), after.terms.end(),
      [](const std::string& t) { return t.find(' ') != std::string::npos; }));
}

TEST(RecountSwapTest, ANewRecountReplacesTheCandidate) {
  TempDir dir;
  const std::string path = dir.path() + "/a.db";
  std::unique_ptr<Store> store;
  ASSERT_TRUE(Store::Create(path, Settings(false), &store, kChange).ok());
  Learn(store.get(), Letters(), false);
  bool replaced = true;
  StoreSettings smoother = Settings(false);
  smoother.model.alpha = 0.5;
  ASSERT_TRUE(store->SaveRebuildCandidate(smoother, kChange, &replaced).ok());
  EXPECT_FALSE(replaced);
  std::optional<Candidate> candidate;
  ASSERT_TRUE(store->LoadCandidate(&candidate).ok());
  ASSERT_TRUE(candidate.has_value());
  EXPECT_EQ(candidate->settings.model.alpha, 0.5);
  EXPECT_EQ(candidate->members.size(), 12u);
  int64_t base = 0;
  ASSERT_TRUE(
      store->BeginRecount(Settings(true), kChange, &base, &replaced).ok());
  EXPECT_TRUE(replaced);
  ASSERT_TRUE(store->LoadCandidate(&candidate).ok());
  EXPECT_FALSE(candidate.has_value());
}

}  // namespace
}  // namespace chute
