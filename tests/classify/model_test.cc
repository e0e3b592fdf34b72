#include "classify/model.h"

#include <gtest/gtest.h>

#include <cmath>
#include <map>
#include <random>
#include <string>
#include <vector>

namespace chute {
namespace {

// Builds ModelCounts from documents given as (queue, terms).
struct TinyCorpus {
  std::vector<std::string> queues;
  std::vector<std::pair<size_t, std::vector<std::string>>> docs;

  ModelCounts Counts(std::map<size_t, double> set_priors = {}) const {
    ModelCounts c;
    std::map<std::string, std::vector<int64_t>> by_term;
    for (const std::string& q : queues) c.queues.push_back({q, 0, 0, std::nullopt});
    for (const auto& [q, terms] : docs) {
      ++c.queues[q].documents;
      for (const std::string& t : terms) {
        auto& row = by_term[t];
        row.resize(queues.size(), 0);
        ++row[q];
        ++c.queues[q].tokens;
      }
    }
    for (const auto& [q, p] : set_priors) c.queues[q].set_prior = p;
    for (const auto& [t, row] : by_term) {
      c.terms.push_back(t);
      c.counts.insert(c.counts.end(), row.begin(), row.end());
    }
    return c;
  }
};

DocumentRows Rows(const Model& m, const std::vector<std::string>& terms, int64_t* unknown) {
  DocumentRows rows;
  m.ToRows(terms, &rows, unknown);
  return rows;
}

// Manning, Raghavan & Schütze, Introduction to Information Retrieval,
// Cambridge University Press, 2008, chapter 13, Example 13.1 (Table 13.1):
// training documents 1-3 in class China ("c"), 4 not; test document 5.
// The book gives P̂(c) = 3/4, P̂(Chinese|c) = 6/14 = 3/7,
// P̂(Tokyo|c) = P̂(Japan|c) = 1/14, P̂(Chinese|c̄) = 2/9,
// P̂(Tokyo|c̄) = P̂(Japan|c̄) = 2/9, and the unnormalised scores
// P̂(c|d5) ∝ 3/4·(3/7)^3·1/14·1/14 ≈ 0.0003 and
// P̂(c̄|d5) ∝ 1/4·(2/9)^3·2/9·2/9 ≈ 0.0001, so d5 is assigned to China.
TinyCorpus Example131() {
  return {{"china", "not-china"},
          {{0, {"chinese", "beijing", "chinese"}},
           {0, {"chinese", "chinese", "shanghai"}},
           {0, {"chinese", "macao"}},
           {1, {"tokyo", "japan", "chinese"}}}};
}

TEST(ModelTest, Example131SmoothedProbabilitiesMatchTheBook) {
  Model m = Model::Build(Example131().Counts(), ModelOptions{1.0, PriorMode::kLearned});
  ASSERT_EQ(m.queue_count(), 2u);
  EXPECT_EQ(m.vocabulary_size(), 6u);
  EXPECT_DOUBLE_EQ(m.prior(0), 3.0 / 4.0);
  EXPECT_DOUBLE_EQ(m.prior(1), 1.0 / 4.0);
  const auto chinese = static_cast<uint32_t>(m.FindTerm("chinese"));
  const auto tokyo = static_cast<uint32_t>(m.FindTerm("tokyo"));
  const auto japan = static_cast<uint32_t>(m.FindTerm("japan"));
  EXPECT_NEAR(std::exp(m.log_theta(chinese, 0)), 3.0 / 7.0, 1e-15);
  EXPECT_NEAR(std::exp(m.log_theta(tokyo, 0)), 1.0 / 14.0, 1e-15);
  EXPECT_NEAR(std::exp(m.log_theta(japan, 0)), 1.0 / 14.0, 1e-15);
  EXPECT_NEAR(std::exp(m.log_theta(chinese, 1)), 2.0 / 9.0, 1e-15);
  EXPECT_NEAR(std::exp(m.log_theta(tokyo, 1)), 2.0 / 9.0, 1e-15);
  EXPECT_NEAR(std::exp(m.log_theta(japan, 1)), 2.0 / 9.0, 1e-15);
}

TEST(ModelTest, Example131ScoresPosteriorAndDecisionMatchTheBook) {
  Model m = Model::Build(Example131().Counts(), ModelOptions{1.0, PriorMode::kLearned});
  int64_t unknown = 0;
  DocumentRows rows =
      Rows(m, {"chinese", "chinese", "chinese", "tokyo", "japan"}, &unknown);
  EXPECT_EQ(unknown, 0);
  Decision d = m.Decide(rows, unknown);
  // Unnormalised scores, exactly: 3/4·(3/7)^3·(1/14)^2 = 81/268912 and
  // 1/4·(2/9)^5 = 8/59049; the book rounds them to 0.0003 and 0.0001.
  const double c = 81.0 / 268912.0, not_c = 8.0 / 59049.0;
  ASSERT_EQ(d.ranked.size(), 2u);
  EXPECT_EQ(m.queues()[d.ranked[0].queue].name, "china");
  EXPECT_NEAR(std::exp(d.ranked[0].score), c, 1e-15);
  EXPECT_NEAR(std::exp(d.ranked[1].score), not_c, 1e-15);
  EXPECT_NEAR(std::round(std::exp(d.ranked[0].score) * 1e4) / 1e4, 0.0003, 1e-12);
  EXPECT_NEAR(std::round(std::exp(d.ranked[1].score) * 1e4) / 1e4, 0.0001, 1e-12);
  EXPECT_NEAR(d.ranked[0].posterior, c / (c + not_c), 1e-14);
  EXPECT_NEAR(d.ranked[0].posterior + d.ranked[1].posterior, 1.0, 1e-15);
  EXPECT_FALSE(d.no_terms());
}

// The deliberately slow reference: multiplies probabilities in long double,
// straight from the definition in DESIGN.md, with no logarithms.
std::vector<long double> SlowPosteriors(const TinyCorpus& corpus, double alpha, PriorMode mode,
                                        const std::map<size_t, double>& set_priors,
                                        const std::vector<std::string>& doc) {
  const size_t nq = corpus.queues.size();
  std::vector<long double> docs(nq, 0), tokens(nq, 0);
  std::map<std::string, std::vector<long double>> n;
  for (const auto& [q, terms] : corpus.docs) {
    docs[q] += 1;
    for (const auto& t : terms) {
      n[t].resize(nq, 0);
      n[t][q] += 1;
      tokens[q] += 1;
    }
  }
  const long double v = static_cast<long double>(n.size());
  long double set_mass = 0, free_docs = 0, free_queues = 0;
  for (size_t q = 0; q < nq; ++q) {
    if (set_priors.count(q)) {
      set_mass += set_priors.at(q);
    } else {
      free_docs += docs[q];
      free_queues += 1;
    }
  }
  std::vector<long double> joint(nq);
  long double total = 0;
  for (size_t q = 0; q < nq; ++q) {
    long double p;
    if (set_priors.count(q)) {
      p = set_priors.at(q);
    } else if (mode == PriorMode::kUniform) {
      p = (1 - set_mass) / free_queues;
    } else {
      p = (1 - set_mass) * docs[q] / free_docs;
    }
    for (const auto& t : doc) {
      auto it = n.find(t);
      if (it == n.end()) continue;  // unseen terms are left out
      p *= (it->second[q] + alpha) / (tokens[q] + alpha * v);
    }
    joint[q] = p;
    total += p;
  }
  for (auto& p : joint) p /= total;
  return joint;
}

TinyCorpus RandomCorpus(std::mt19937* rng, size_t queues, size_t docs, size_t vocabulary) {
  TinyCorpus c;
  for (size_t q = 0; q < queues; ++q) c.queues.push_back("q" + std::to_string(q));
  std::uniform_int_distribution<size_t> queue_of(0, queues - 1), len(1, 8);
  for (size_t d = 0; d < docs; ++d) {
    size_t q = d < queues ? d : queue_of(*rng);  // every queue has a document
    // Each queue prefers its own slice of the vocabulary.
    std::uniform_int_distribution<size_t> word(q * vocabulary / (2 * queues),
                                               q * vocabulary / (2 * queues) + vocabulary / 2);
    std::vector<std::string> terms;
    for (size_t i = len(*rng); i > 0; --i) terms.push_back("w" + std::to_string(word(*rng)));
    c.docs.emplace_back(q, terms);
  }
  return c;
}

TEST(ModelTest, FastScorerAgreesWithSlowReferenceOnTinyCorpora) {
  std::mt19937 rng(20261202);
  int checked = 0;
  for (int trial = 0; trial < 40; ++trial) {
    TinyCorpus corpus = RandomCorpus(&rng, 2 + trial % 4, 6 + trial % 9, 12);
    for (double alpha : {1.0, 0.3, 0.01}) {
      for (PriorMode mode : {PriorMode::kLearned, PriorMode::kUniform}) {
        std::map<size_t, double> set;
        if (trial % 3 == 0) set[0] = 0.15;
        Model m = Model::Build(corpus.Counts(set), ModelOptions{alpha, mode});
        std::vector<std::string> doc;
        for (int i = 0; i < 6; ++i) doc.push_back("w" + std::to_string((trial * 7 + i * 5) % 14));
        int64_t unknown = 0;
        Decision d = m.Decide(Rows(m, doc, &unknown), unknown);
        std::vector<long double> ref = SlowPosteriors(corpus, alpha, mode, set, doc);
        for (const QueuePosterior& p : d.ranked) {
          EXPECT_NEAR(p.posterior, static_cast<double>(ref[p.queue]), 1e-12)
              << "trial " << trial << " alpha " << alpha;
        }
        size_t best = 0;
        for (size_t q = 1; q < ref.size(); ++q) best = ref[q] > ref[best] ? q : best;
        EXPECT_NEAR(static_cast<double>(ref[d.ranked[0].queue]), static_cast<double>(ref[best]),
                    1e-15);
        ++checked;
      }
    }
  }
  EXPECT_EQ(checked, 240);
}

TEST(ModelTest, UnseenTermsAreLeftOutOfTheSum) {
  Model m = Model::Build(Example131().Counts(), ModelOptions{});
  int64_t unknown = 0;
  DocumentRows with = Rows(m, {"chinese", "tokyo", "osaka", "kyoto"}, &unknown);
  EXPECT_EQ(unknown, 2);
  int64_t none = 0;
  DocumentRows without = Rows(m, {"chinese", "tokyo"}, &none);
  Decision a = m.Decide(with, unknown), b = m.Decide(without, none);
  EXPECT_EQ(a.ranked[0].score, b.ranked[0].score);
  EXPECT_EQ(a.ranked[1].score, b.ranked[1].score);
  EXPECT_EQ(a.unknown_terms, 2);
  EXPECT_EQ(a.known_terms, 2);
}

TEST(ModelTest, DocumentWithNoKnownTermsRoutesOnThePriorAlone) {
  Model m = Model::Build(Example131().Counts(), ModelOptions{});
  int64_t unknown = 0;
  Decision d = m.Decide(Rows(m, {"osaka"}, &unknown), unknown);
  EXPECT_TRUE(d.no_terms());
  EXPECT_EQ(m.queues()[d.ranked[0].queue].name, "china");
  EXPECT_NEAR(d.ranked[0].posterior, 0.75, 1e-15);
}

TEST(ModelTest, QueuesWithoutDocumentsAndZeroRowsAreLeftOut) {
  ModelCounts c = Example131().Counts();
  c.queues.push_back({"empty", 0, 0, std::nullopt});
  // Re-lay the counts with a third, all-zero column and a zero row.
  std::vector<int64_t> counts;
  for (size_t r = 0; r < c.terms.size(); ++r) {
    counts.push_back(c.counts[2 * r]);
    counts.push_back(c.counts[2 * r + 1]);
    counts.push_back(0);
  }
  c.terms.push_back("forgotten");
  counts.insert(counts.end(), {0, 0, 0});
  c.counts = counts;
  Model m = Model::Build(c, ModelOptions{});
  EXPECT_EQ(m.queue_count(), 2u);
  EXPECT_EQ(m.vocabulary_size(), 6u);  // |V| counts only terms with a count
  EXPECT_EQ(m.FindTerm("forgotten"), -1);
  EXPECT_NEAR(std::exp(m.log_theta(static_cast<uint32_t>(m.FindTerm("chinese")), 0)), 3.0 / 7.0,
              1e-15);
}

TEST(ModelTest, LongDocumentsDoNotUnderflow) {
  Model m = Model::Build(Example131().Counts(), ModelOptions{});
  std::vector<std::string> doc(200000, "tokyo");
  doc.insert(doc.end(), 100000, "chinese");
  int64_t unknown = 0;
  Decision d = m.Decide(Rows(m, doc, &unknown), unknown);
  double sum = 0;
  for (const auto& p : d.ranked) {
    EXPECT_TRUE(std::isfinite(p.log_posterior));
    sum += p.posterior;
  }
  EXPECT_NEAR(sum, 1.0, 1e-12);
  EXPECT_EQ(m.queues()[d.ranked[0].queue].name, "not-china");
}

TEST(ModelTest, RankingIsBestFirstAndStableOnTies) {
  TinyCorpus c{{"a", "b", "c"}, {{0, {"x"}}, {1, {"x"}}, {2, {"x"}}}};
  Model m = Model::Build(c.Counts(), ModelOptions{});
  int64_t unknown = 0;
  Decision d = m.Decide(Rows(m, {"x"}, &unknown), unknown);
  ASSERT_EQ(d.ranked.size(), 3u);
  EXPECT_EQ(d.ranked[0].queue, 0u);
  EXPECT_EQ(d.ranked[1].queue, 1u);
  EXPECT_EQ(d.ranked[2].queue, 2u);
  EXPECT_NEAR(d.ranked[0].posterior, 1.0 / 3.0, 1e-15);
}

}  // namespace
}  // namespace chute
