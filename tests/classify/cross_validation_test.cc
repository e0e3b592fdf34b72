#include "classify/cross_validation.h"

#include <gtest/gtest.h>

#include <cmath>
#include <map>
#include <optional>
#include <string>
#include <vector>

namespace chute {
namespace {

struct Doc {
  uint32_t queue;
  uint32_t fold;
  std::vector<std::string> terms;
};

// Counts of the documents for which keep(i) holds, built from scratch: the
// slow, obvious way a fresh store would count them.
ModelCounts CountsOf(const std::vector<std::string>& queues, const std::vector<Doc>& docs,
                     const std::function<bool(size_t)>& keep,
                     const std::map<uint32_t, double>& set_priors = {}) {
  ModelCounts c;
  for (const std::string& q : queues) c.queues.push_back({q, 0, 0, std::nullopt});
  for (const auto& [q, p] : set_priors) c.queues[q].set_prior = p;
  std::map<std::string, std::vector<int64_t>> by_term;
  for (size_t i = 0; i < docs.size(); ++i) {
    if (!keep(i)) continue;
    ++c.queues[docs[i].queue].documents;
    for (const std::string& t : docs[i].terms) {
      auto& row = by_term[t];
      row.resize(queues.size(), 0);
      ++row[docs[i].queue];
      ++c.queues[docs[i].queue].tokens;
    }
  }
  for (const auto& [t, row] : by_term) {
    c.terms.push_back(t);
    c.counts.insert(c.counts.end(), row.begin(), row.end());
  }
  return c;
}

std::vector<CountedDocument> Counted(const ModelCounts& whole, const std::vector<Doc>& docs) {
  CountsRowIndex index(whole);
  std::vector<CountedDocument> out;
  for (const Doc& d : docs) {
    std::map<uint32_t, int64_t> rows;
    for (const std::string& t : d.terms) ++rows[static_cast<uint32_t>(index.Find(t))];
    CountedDocument c{d.queue, d.fold, {}};
    for (const auto& [r, n] : rows) c.rows.emplace_back(r, n);
    out.push_back(std::move(c));
  }
  return out;
}

// Three queues; some terms occur in one document only, so they leave |V|
// when that document is held out.
const std::vector<std::string> kQueues = {"berths", "billing", "careers"};
std::vector<Doc> Corpus() {
  return {
      {0, 0, {"berth", "booking", "vessel", "quay", "arrival"}},
      {0, 1, {"berth", "vessel", "pilot", "arrival", "arrival"}},
      {0, 2, {"booking", "quay", "berth", "tug"}},
      {0, 0, {"vessel", "berth", "berth", "window"}},
      {1, 1, {"invoice", "dues", "payment", "vessel"}},
      {1, 2, {"invoice", "refund", "payment", "payment"}},
      {1, 0, {"dues", "invoice", "overdue", "reminder"}},
      {2, 1, {"vacancy", "application", "harbour", "pilot"}},
      {2, 2, {"application", "cv", "vacancy"}},
  };
}

// Each fold's model, made by subtraction, routes its held-out documents
// exactly as a model built from scratch from the other folds' documents.
void ExpectSameAsFromScratch(const std::vector<Doc>& docs, uint32_t folds,
                             const ModelOptions& options,
                             const std::map<uint32_t, double>& set_priors = {}) {
  ModelCounts whole = CountsOf(kQueues, docs, [](size_t) { return true; }, set_priors);
  const ModelCounts before = whole;
  const std::vector<CountedDocument> counted = Counted(whole, docs);
  CrossValidation cv;
  std::string error;
  ASSERT_TRUE(CrossValidate(&whole, counted, folds, options, &cv, &error)) << error;
  EXPECT_EQ(whole.counts, before.counts) << "the whole counts are restored";
  EXPECT_EQ(whole.queues[0].documents, before.queues[0].documents);
  EXPECT_EQ(whole.queues[2].tokens, before.queues[2].tokens);
  ASSERT_EQ(cv.predictions.size(), docs.size());
  ASSERT_EQ(cv.folds.size(), folds);
  for (uint32_t f = 0; f < folds; ++f) {
    const ModelCounts train =
        CountsOf(kQueues, docs, [&](size_t i) { return docs[i].fold != f; }, set_priors);
    const Model m = Model::Build(train, options);
    if (cv.folds[f].held_out > 0) {
      EXPECT_EQ(cv.folds[f].vocabulary, static_cast<int64_t>(m.vocabulary_size()))
          << "fold " << f;
    }
    const std::vector<uint32_t> label_of = LabelsOfQueues(m, cv.labels);
    for (size_t i = 0; i < docs.size(); ++i) {
      if (docs[i].fold != f) continue;
      DocumentRows rows;
      int64_t unknown = 0;
      m.ToRows(docs[i].terms, &rows, &unknown);
      const Decision d = m.Decide(rows, unknown);
      const Prediction& p = cv.predictions[i];
      EXPECT_EQ(p.truth, docs[i].queue);
      EXPECT_EQ(p.predicted, label_of[d.ranked[0].queue]) << "document " << i;
      EXPECT_NEAR(p.confidence, d.ranked[0].posterior, 1e-12);
      EXPECT_EQ(p.no_terms, d.no_terms());
      for (const QueuePosterior& q : d.ranked) {
        EXPECT_NEAR(p.probabilities[label_of[q.queue]], q.posterior, 1e-12);
      }
    }
  }
}

TEST(CrossValidationTest, SubtractedModelsRouteAsModelsBuiltFromScratch) {
  ExpectSameAsFromScratch(Corpus(), 3, {1.0, PriorMode::kLearned});
  ExpectSameAsFromScratch(Corpus(), 3, {0.3, PriorMode::kUniform});
}

TEST(CrossValidationTest, HandSetPriorsApplyInEveryFold) {
  ExpectSameAsFromScratch(Corpus(), 3, {1.0, PriorMode::kLearned}, {{2, 0.4}});
}

TEST(CrossValidationTest, TermsSeenOnlyInTheFoldLeaveTheVocabulary) {
  const std::vector<Doc> docs = Corpus();
  ModelCounts whole = CountsOf(kQueues, docs, [](size_t) { return true; });
  CrossValidation cv;
  std::string error;
  ASSERT_TRUE(CrossValidate(&whole, Counted(whole, docs), 3, {}, &cv, &error)) << error;
  // Fold 0 holds the only documents with "window", "overdue" and
  // "reminder": its model's |V| is the whole's less those three (every
  // other term of fold 0 occurs in another fold too).
  EXPECT_EQ(cv.folds[0].vocabulary, static_cast<int64_t>(whole.terms.size()) - 3);
}

TEST(CrossValidationTest, QueueWhollyInOneFoldLeavesThatFoldsModel) {
  std::vector<Doc> docs = Corpus();
  for (Doc& d : docs) {
    if (d.queue == 2) d.fold = 1;  // both careers documents in fold 1
  }
  ModelCounts whole = CountsOf(kQueues, docs, [](size_t) { return true; });
  CrossValidation cv;
  std::string error;
  ASSERT_TRUE(CrossValidate(&whole, Counted(whole, docs), 3, {}, &cv, &error)) << error;
  EXPECT_EQ(cv.folds[1].queues_left_out, std::vector<uint32_t>{2});
  EXPECT_TRUE(cv.folds[0].queues_left_out.empty());
  for (size_t i = 0; i < docs.size(); ++i) {
    if (docs[i].queue != 2) continue;
    EXPECT_NE(cv.predictions[i].predicted, 2u) << "its fold's model cannot route to careers";
    EXPECT_EQ(cv.predictions[i].probabilities[2], 0.0);
  }
  ExpectSameAsFromScratch(docs, 3, {});
}

TEST(CrossValidationTest, EmptyFoldBuildsNoModelAndRoutesNothing) {
  const std::vector<Doc> docs = Corpus();  // folds 0, 1, 2 of 4
  ModelCounts whole = CountsOf(kQueues, docs, [](size_t) { return true; });
  CrossValidation cv;
  std::string error;
  ASSERT_TRUE(CrossValidate(&whole, Counted(whole, docs), 4, {}, &cv, &error)) << error;
  EXPECT_EQ(cv.folds[3].held_out, 0);
  EXPECT_EQ(cv.folds[3].learned, 9);
  EXPECT_EQ(cv.folds[3].vocabulary, 0);
  ExpectSameAsFromScratch(docs, 4, {});
}

TEST(CrossValidationTest, DocumentsThatDoNotAddUpToTheCountsAreRefused) {
  std::vector<Doc> docs = Corpus();
  ModelCounts whole = CountsOf(kQueues, docs, [](size_t) { return true; });
  const ModelCounts before = whole;
  std::vector<CountedDocument> counted = Counted(whole, docs);
  counted.push_back(counted[0]);  // a document the counts do not hold
  CrossValidation cv;
  std::string error;
  EXPECT_FALSE(CrossValidate(&whole, counted, 3, {}, &cv, &error));
  EXPECT_NE(error.find("berths"), std::string::npos) << error;
  EXPECT_EQ(whole.counts, before.counts);
}

TEST(CrossValidationTest, FoldHoldingEveryDocumentIsRefused) {
  std::vector<Doc> docs = Corpus();
  for (Doc& d : docs) d.fold = 0;
  ModelCounts whole = CountsOf(kQueues, docs, [](size_t) { return true; });
  const ModelCounts before = whole;
  CrossValidation cv;
  std::string error;
  EXPECT_FALSE(CrossValidate(&whole, Counted(whole, docs), 2, {}, &cv, &error));
  EXPECT_NE(error.find("fold 1"), std::string::npos) << error;
  EXPECT_EQ(whole.counts, before.counts);
  EXPECT_EQ(whole.queues[1].documents, before.queues[1].documents);
}

}  // namespace
}  // namespace chute
