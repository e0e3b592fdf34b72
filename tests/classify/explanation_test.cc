#include "classify/explanation.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>
#include <random>
#include <string>
#include <vector>

#include "classify/neumaier_sum.h"

namespace chute {
namespace {

// Counts from documents given as (queue, terms), every queue with at least
// one document.
ModelCounts CountsOf(const std::vector<std::string>& queues,
                     const std::vector<std::pair<size_t, std::vector<std::string>>>& docs) {
  ModelCounts c;
  for (const std::string& q : queues) c.queues.push_back({q, 0, 0, std::nullopt});
  std::map<std::string, std::vector<int64_t>> by_term;
  for (const auto& [q, terms] : docs) {
    ++c.queues[q].documents;
    for (const std::string& t : terms) {
      auto& row = by_term[t];
      row.resize(queues.size(), 0);
      ++row[q];
      ++c.queues[q].tokens;
    }
  }
  for (const auto& [t, row] : by_term) {
    c.terms.push_back(t);
    c.counts.insert(c.counts.end(), row.begin(), row.end());
  }
  return c;
}

// Manning, Raghavan & Schütze, Introduction to Information Retrieval,
// Cambridge University Press, 2008, chapter 13, Example 13.1 (Table 13.1):
// documents 1-3 in class China (c), document 4 not (c̄); test document
// d5 = "Chinese Chinese Chinese Tokyo Japan". With add-one smoothing the book
// gives P̂(c) = 3/4, P̂(c̄) = 1/4, P̂(Chinese|c) = 3/7,
// P̂(Tokyo|c) = P̂(Japan|c) = 1/14, P̂(Chinese|c̄) = P̂(Tokyo|c̄) =
// P̂(Japan|c̄) = 2/9, and P̂(c|d5) ∝ 3/4·(3/7)^3·(1/14)^2 = 81/268912,
// P̂(c̄|d5) ∝ 1/4·(2/9)^5 = 8/59049 (the exact fractions worked by hand).
ModelCounts Example131() {
  return CountsOf({"china", "not-china"}, {{0, {"chinese", "beijing", "chinese"}},
                                           {0, {"chinese", "chinese", "shanghai"}},
                                           {0, {"chinese", "macao"}},
                                           {1, {"tokyo", "japan", "chinese"}}});
}

const std::vector<std::string> kD5 = {"chinese", "chinese", "chinese", "tokyo", "japan"};

TEST(ExplanationTest, Example131SharesMatchTheBookWorkedByHand) {
  const Model m = Model::Build(Example131(), ModelOptions{1.0, PriorMode::kLearned});
  const Explanation e = ExplainTerms(m, kD5);
  ASSERT_TRUE(e.runner_up.has_value());
  EXPECT_EQ(m.queues()[e.queue].name, "china");
  EXPECT_EQ(m.queues()[*e.runner_up].name, "not-china");
  // Prior share: log(3/4) − log(1/4) = log 3.
  EXPECT_NEAR(e.prior_share, std::log(3.0), 1e-15);
  // Chinese: 3 · (log(3/7) − log(2/9)).
  ASSERT_EQ(e.toward_queue.size(), 1u);
  EXPECT_EQ(e.toward_queue[0].term, "chinese");
  EXPECT_EQ(e.toward_queue[0].count, 3);
  EXPECT_NEAR(e.toward_queue[0].contribution, 3.0 * (std::log(3.0 / 7.0) - std::log(2.0 / 9.0)),
              1e-14);
  // Tokyo and Japan: log(1/14) − log(2/9) each; equal, so listed by term.
  ASSERT_EQ(e.toward_runner_up.size(), 2u);
  EXPECT_EQ(e.toward_runner_up[0].term, "japan");
  EXPECT_EQ(e.toward_runner_up[1].term, "tokyo");
  for (const TermContribution& t : e.toward_runner_up) {
    EXPECT_EQ(t.count, 1);
    EXPECT_NEAR(t.contribution, std::log(1.0 / 14.0) - std::log(2.0 / 9.0), 1e-15);
  }
  // Their sum is log(P(c|d5) / P(c̄|d5)) = log((81/268912) / (8/59049)).
  const double by_hand = std::log((81.0 / 268912.0) / (8.0 / 59049.0));
  EXPECT_NEAR(e.contribution_sum, by_hand, 1e-14);
  EXPECT_NEAR(e.score_gap, by_hand, 1e-14);
  EXPECT_NEAR(e.prior_share + e.toward_queue[0].contribution +
                  e.toward_runner_up[0].contribution + e.toward_runner_up[1].contribution,
              by_hand, 1e-14);
  EXPECT_EQ(e.terms_toward_queue, 1u);
  EXPECT_EQ(e.terms_toward_runner_up, 2u);
  EXPECT_TRUE(e.ignored.empty());
  EXPECT_NEAR(e.decision.ranked[0].posterior,
              (81.0 / 268912.0) / (81.0 / 268912.0 + 8.0 / 59049.0), 1e-14);
}

// A random model: `queues` queues, `vocabulary` terms, sparse counts of very
// different sizes, some priors set by hand.
struct RandomCase {
  ModelCounts counts;
  ModelOptions options;
};

RandomCase RandomModel(std::mt19937_64* rng) {
  std::uniform_int_distribution<size_t> nq(2, 9), nv(3, 400);
  const size_t queues = nq(*rng), vocabulary = nv(*rng);
  RandomCase c;
  std::uniform_int_distribution<int64_t> docs(1, 500);
  for (size_t q = 0; q < queues; ++q) {
    c.counts.queues.push_back({"q" + std::to_string(q), docs(*rng), 0, std::nullopt});
  }
  std::uniform_real_distribution<double> u(0.0, 1.0);
  std::geometric_distribution<int64_t> size(0.02);
  for (size_t w = 0; w < vocabulary; ++w) {
    c.counts.terms.push_back("t" + std::to_string(w));
    for (size_t q = 0; q < queues; ++q) {
      const int64_t n = u(*rng) < 0.6 ? 0 : 1 + size(*rng);
      c.counts.counts.push_back(n);
      c.counts.queues[q].tokens += n;
    }
  }
  const double alphas[] = {1.0, 0.5, 0.1, 0.01, 2.5};
  c.options.alpha = alphas[(*rng)() % 5];
  c.options.prior = (*rng)() % 2 ? PriorMode::kLearned : PriorMode::kUniform;
  if ((*rng)() % 4 == 0) c.counts.queues[0].set_prior = 0.001 + 0.9 * u(*rng);
  return c;
}

// A random document over the model's terms, as distinct terms with counts:
// short notes to long files with large counts, some terms unknown.
struct RandomDocument {
  std::vector<std::string> distinct;  // each once
  std::vector<int64_t> counts;
};

RandomDocument MakeDocument(std::mt19937_64* rng, size_t vocabulary) {
  std::uniform_int_distribution<size_t> word(0, vocabulary + vocabulary / 5);
  const size_t sizes[] = {1, 5, 60, 400};
  const double means[] = {1.0, 3.0, 40.0, 2000.0};
  const size_t pick = (*rng)() % 4;
  std::geometric_distribution<int64_t> count(1.0 / means[(*rng)() % 4]);
  std::map<size_t, int64_t> chosen;
  for (size_t i = 0; i < sizes[pick]; ++i) chosen[word(*rng)] += 1 + count(*rng);
  RandomDocument d;
  for (const auto& [w, n] : chosen) {
    d.distinct.push_back(w < vocabulary ? "t" + std::to_string(w) : "unseen" + std::to_string(w));
    d.counts.push_back(n);
  }
  return d;
}

// The rows and ignored terms of a RandomDocument, as SplitTerms would give.
void RowsOf(const Model& m, const RandomDocument& d, DocumentRows* rows,
            std::vector<IgnoredTerm>* ignored) {
  rows->clear();
  ignored->clear();
  for (size_t i = 0; i < d.distinct.size(); ++i) {
    const int64_t row = m.FindTerm(d.distinct[i]);
    if (row < 0) {
      ignored->push_back({d.distinct[i], d.counts[i]});
    } else {
      rows->emplace_back(static_cast<uint32_t>(row), d.counts[i]);
    }
  }
  std::sort(rows->begin(), rows->end());
}

bool WithinBound(double got, double gap) {
  return std::fabs(got - gap) <= 1e-9 * std::max(1.0, std::fabs(gap));
}

TEST(ExplanationTest, SharesSumToTheScorersGapOnRandomModelsAndDocuments) {
  std::mt19937_64 rng(20261203);
  int checked = 0;
  double worst = 0.0;  // largest |sum − gap| / max(1, |gap|) seen
  for (int model_trial = 0; model_trial < 120; ++model_trial) {
    const RandomCase c = RandomModel(&rng);
    const Model m = Model::Build(c.counts, c.options);
    for (int doc_trial = 0; doc_trial < 25; ++doc_trial) {
      DocumentRows rows;
      std::vector<IgnoredTerm> ignored;
      RowsOf(m, MakeDocument(&rng, c.counts.terms.size()), &rows, &ignored);
      const Explanation e = Explain(m, rows, ignored, ExplainOptions{5});
      ASSERT_TRUE(e.runner_up.has_value());
      // The gap is the scorer's own: Model::Score on the same rows.
      std::vector<double> scores;
      m.Score(rows, &scores);
      EXPECT_EQ(e.score_gap, scores[e.queue] - scores[*e.runner_up]);
      EXPECT_GE(e.score_gap, 0.0);
      // The library's compensated sum, and an independent one here over
      // every row (not only the listed ones), in long double.
      EXPECT_TRUE(WithinBound(e.contribution_sum, e.score_gap))
          << "model " << model_trial << " doc " << doc_trial << ": " << e.contribution_sum
          << " vs " << e.score_gap;
      long double sum = e.prior_share;
      for (const TermContribution& t : ComputeContributions(m, rows, e.queue, *e.runner_up)) {
        sum += t.contribution;
      }
      EXPECT_TRUE(WithinBound(static_cast<double>(sum), e.score_gap));
      worst = std::max(worst, std::fabs(e.contribution_sum - e.score_gap) /
                                  std::max(1.0, std::fabs(e.score_gap)));
      ++checked;
    }
  }
  EXPECT_EQ(checked, 3000);
  EXPECT_LE(worst, 1e-9);
  RecordProperty("worst_relative_gap", std::to_string(worst));
  std::printf("largest |sum - gap| / max(1, |gap|) seen: %.3g\n", worst);
}

TEST(ExplanationTest, ListsHoldTheStrongestTermsInOrder) {
  std::mt19937_64 rng(7);
  for (int trial = 0; trial < 40; ++trial) {
    const RandomCase c = RandomModel(&rng);
    const Model m = Model::Build(c.counts, c.options);
    DocumentRows rows;
    std::vector<IgnoredTerm> ignored;
    RowsOf(m, MakeDocument(&rng, c.counts.terms.size()), &rows, &ignored);
    const size_t top = 1 + trial % 7;
    const Explanation e = Explain(m, rows, ignored, ExplainOptions{top});
    std::vector<double> positive, negative;
    for (const TermContribution& t : ComputeContributions(m, rows, e.queue, *e.runner_up)) {
      if (t.contribution > 0) positive.push_back(t.contribution);
      if (t.contribution < 0) negative.push_back(t.contribution);
    }
    std::sort(positive.rbegin(), positive.rend());
    std::sort(negative.begin(), negative.end());
    EXPECT_EQ(e.terms_toward_queue, positive.size());
    EXPECT_EQ(e.terms_toward_runner_up, negative.size());
    ASSERT_EQ(e.toward_queue.size(), std::min(top, positive.size()));
    ASSERT_EQ(e.toward_runner_up.size(), std::min(top, negative.size()));
    for (size_t i = 0; i < e.toward_queue.size(); ++i) {
      EXPECT_EQ(e.toward_queue[i].contribution, positive[i]);
    }
    for (size_t i = 0; i < e.toward_runner_up.size(); ++i) {
      EXPECT_EQ(e.toward_runner_up[i].contribution, negative[i]);
    }
    // Each listed term's contribution is its count times the log θ gap.
    for (const auto* list : {&e.toward_queue, &e.toward_runner_up}) {
      for (const TermContribution& t : *list) {
        const auto row = static_cast<uint32_t>(m.FindTerm(t.term));
        EXPECT_EQ(t.contribution, static_cast<double>(t.count) *
                                      (m.log_theta(row, e.queue) -
                                       m.log_theta(row, *e.runner_up)));
      }
    }
  }
}

TEST(ExplanationTest, EqualContributionsAreListedByTerm) {
  // Three terms, each once in queue a and never in b: equal pulls.
  const Model m = Model::Build(
      CountsOf({"a", "b"}, {{0, {"zeta", "alpha", "mu"}}, {1, {"other"}}}), ModelOptions{});
  const Explanation e = ExplainTerms(m, {"mu", "zeta", "alpha"}, ExplainOptions{2});
  ASSERT_EQ(e.toward_queue.size(), 2u);
  EXPECT_EQ(e.toward_queue[0].term, "alpha");
  EXPECT_EQ(e.toward_queue[1].term, "mu");
  EXPECT_EQ(e.terms_toward_queue, 3u);
  EXPECT_TRUE(e.toward_runner_up.empty());
}

TEST(ExplanationTest, UnknownTermsAreIgnoredWithTheirCounts) {
  const Model m = Model::Build(Example131(), ModelOptions{});
  std::vector<std::string> doc = kD5;
  doc.insert(doc.end(), {"osaka", "kyoto", "osaka", "nara", "kyoto", "osaka"});
  const Explanation with = ExplainTerms(m, doc);
  const Explanation without = ExplainTerms(m, kD5);
  ASSERT_EQ(with.ignored.size(), 3u);
  EXPECT_EQ(with.ignored[0].term, "osaka");
  EXPECT_EQ(with.ignored[0].count, 3);
  EXPECT_EQ(with.ignored[1].term, "kyoto");
  EXPECT_EQ(with.ignored[1].count, 2);
  EXPECT_EQ(with.ignored[2].term, "nara");
  EXPECT_EQ(with.ignored[2].count, 1);
  EXPECT_EQ(with.decision.unknown_terms, 6);
  EXPECT_EQ(with.decision.known_terms, 5);
  // Ignored terms change nothing else.
  EXPECT_EQ(with.score_gap, without.score_gap);
  EXPECT_EQ(with.contribution_sum, without.contribution_sum);
  ASSERT_EQ(with.toward_runner_up.size(), without.toward_runner_up.size());
  for (const auto& t : with.toward_queue) EXPECT_NE(t.term, "osaka");
}

TEST(ExplanationTest, DocumentWithNoKnownTermsIsExplainedByThePriorAlone) {
  const Model m = Model::Build(Example131(), ModelOptions{});
  for (const std::vector<std::string>& doc :
       {std::vector<std::string>{}, std::vector<std::string>{"osaka", "nara"}}) {
    const Explanation e = ExplainTerms(m, doc);
    EXPECT_TRUE(e.decision.no_terms());
    ASSERT_TRUE(e.runner_up.has_value());
    EXPECT_EQ(m.queues()[e.queue].name, "china");
    EXPECT_TRUE(e.toward_queue.empty());
    EXPECT_TRUE(e.toward_runner_up.empty());
    EXPECT_EQ(e.terms_toward_queue + e.terms_toward_runner_up, 0u);
    EXPECT_NEAR(e.prior_share, std::log(3.0), 1e-15);
    EXPECT_EQ(e.contribution_sum, e.prior_share);
    EXPECT_EQ(e.score_gap, e.prior_share);  // both log(3/4) − log(1/4)
    EXPECT_EQ(e.ignored.size(), doc.size());
  }
}

TEST(ExplanationTest, SingleQueueModelHasNoRunnerUp) {
  const Model m =
      Model::Build(CountsOf({"only"}, {{0, {"harbour", "dues"}}, {0, {"harbour"}}}),
                   ModelOptions{});
  const Explanation e = ExplainTerms(m, {"harbour", "dues", "crane"});
  EXPECT_FALSE(e.runner_up.has_value());
  EXPECT_EQ(e.queue, 0u);
  ASSERT_EQ(e.decision.ranked.size(), 1u);
  EXPECT_EQ(e.decision.ranked[0].posterior, 1.0);
  EXPECT_TRUE(e.toward_queue.empty());
  EXPECT_TRUE(e.toward_runner_up.empty());
  EXPECT_EQ(e.score_gap, 0.0);
  EXPECT_EQ(e.prior_share, 0.0);
  EXPECT_EQ(e.contribution_sum, 0.0);
  ASSERT_EQ(e.ignored.size(), 1u);
  EXPECT_EQ(e.ignored[0].term, "crane");
  EXPECT_EQ(e.decision.known_terms, 2);
}

TEST(ExplanationTest, QueueWithPriorZeroIsNeverTheRunnerUp) {
  // Priors set by hand take all the mass; queue c gets prior 0 even though
  // the document is made of its words.
  ModelCounts counts = CountsOf(
      {"a", "b", "c"}, {{0, {"x"}}, {1, {"y"}}, {2, {"z", "z", "z"}}});
  counts.queues[0].set_prior = 0.75;
  counts.queues[1].set_prior = 0.25;
  const Model m = Model::Build(counts, ModelOptions{});
  const Explanation e = ExplainTerms(m, {"z", "z", "x"});
  ASSERT_TRUE(e.runner_up.has_value());
  EXPECT_EQ(m.queues()[e.queue].name, "a");
  EXPECT_EQ(m.queues()[*e.runner_up].name, "b");
  EXPECT_TRUE(std::isfinite(e.score_gap));
  EXPECT_TRUE(WithinBound(e.contribution_sum, e.score_gap));
}

// Compensated summation keeps what a plain loop loses: 1 + 1e-16 added
// 10^6 times.
TEST(NeumaierSumTest, KeepsTheLowOrderBitsAPlainLoopLoses) {
  NeumaierSum s;
  double plain = 0.0;
  s.Add(1.0);
  plain += 1.0;
  for (int i = 0; i < 1000000; ++i) {
    s.Add(1e-16);
    plain += 1e-16;
  }
  EXPECT_EQ(plain, 1.0);  // each 1e-16 is below half an ulp of 1
  EXPECT_NEAR(s.value(), 1.0 + 1e-10, 3e-16);  // within an ulp of 1
  // Neumaier's case that defeats plain Kahan summation: 1 + 1e100 + 1 − 1e100.
  NeumaierSum t;
  for (double x : {1.0, 1e100, 1.0, -1e100}) t.Add(x);
  EXPECT_EQ(t.value(), 2.0);
}

}  // namespace
}  // namespace chute
