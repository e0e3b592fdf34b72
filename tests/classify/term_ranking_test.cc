#include "classify/term_ranking.h"

#include <gtest/gtest.h>

#include <cmath>
#include <string>
#include <utility>
#include <vector>

#include "classify/term_association.h"
#include "classify/term_table.h"

namespace chute {
namespace {

using Doc = std::pair<std::string, std::vector<std::pair<std::string, int64_t>>>;

TermTable TableOf(const std::vector<Doc>& docs) {
  TermTableBuilder b;
  for (const auto& [queue, terms] : docs) b.AddDocument(queue, terms);
  return b.Build();
}

const RankedTerm* Find(const QueueTerms& qt, const std::string& term) {
  for (const RankedTerm& t : qt.terms) {
    if (t.term == term) return &t;
  }
  return nullptr;
}

// --- The 2×2 document statistics ------------------------------------------

// Manning, Raghavan & Schütze, Introduction to Information Retrieval, 2008,
// §13.5.1, Example 13.3 and §13.5.2, Example 13.4: class poultry, term
// export, Reuters-RCV1, N11 = 49, N10 = 27,652, N01 = 141, N00 = 774,106.
// The book prints I(U;C) ≈ 0.0001105 and X² ≈ 284 (both recalled from
// memory; the figures chute computes, 0.00011053559 and 284.286, agree with
// them to the printed precision).
TEST(TermAssociationTest, ManningExamples133And134ExportPoultry) {
  const DocumentContingency c{49, 27652, 141, 774106};
  EXPECT_NEAR(MutualInformation(c), 0.0001105, 0.5e-7);
  EXPECT_NEAR(ChiSquare(c), 284, 0.5);
  EXPECT_TRUE(PositivelyAssociated(c));
}

struct ContingencyCase {
  const char* name;
  DocumentContingency c;
  double chi_square;
  double mutual_information;  // bits
  bool positive;
};

// Worked by hand from eq. 13.17 and 13.19 of Manning et al. (2008).
const ContingencyCase kContingencyCases[] = {
    // Perfect association: I = H(C) = 1 bit; X² = N φ² with φ = 1.
    {"term exactly marks the class", {2, 0, 0, 2}, 4.0, 1.0, true},
    // Perfect avoidance: as informative, but negative.
    {"term exactly avoids the class", {0, 2, 2, 0}, 4.0, 1.0, false},
    {"independent", {1, 1, 1, 1}, 0.0, 0.0, false},
    // N1. = 1, N0. = 3, N.1 = 2, N.0 = 2, N = 4:
    // I = 1/4 log2(4/2) + 1/4 log2(4/6) + 0 (N10 = 0) + 2/4 log2(8/6);
    // X² = 4 (1·2 − 0·1)² / (2·1·2·3).
    {"a zero cell adds 0 (0 log 0 = 0)",
     {1, 0, 1, 2},
     16.0 / 12.0,
     0.25 * std::log2(2.0) + 0.25 * std::log2(4.0 / 6.0) + 0.5 * std::log2(8.0 / 6.0),
     true},
    // Every document contains the term: a column of the table is empty.
    {"term in every document", {3, 2, 0, 0}, 0.0, 0.0, false},
    {"empty table", {0, 0, 0, 0}, 0.0, 0.0, false},
};

TEST(TermAssociationTest, HandWorkedTables) {
  for (const ContingencyCase& k : kContingencyCases) {
    SCOPED_TRACE(k.name);
    EXPECT_NEAR(ChiSquare(k.c), k.chi_square, 1e-12);
    EXPECT_NEAR(MutualInformation(k.c), k.mutual_information, 1e-12);
    EXPECT_EQ(PositivelyAssociated(k.c), k.positive);
  }
}

struct LogOddsCase {
  const char* name;
  int64_t y_i, n_i, y_j, n_j;
  double alpha0;
  double delta, variance;
};

// Monroe, Colaresi & Quinn (2008), §3.5, worked by hand: α_w = α0 y_w / n.
const LogOddsCase kLogOddsCases[] = {
    // y = 4, n = 20, α_w = 0.4, α0 − α_w = 1.6.
    {"more frequent in the queue", 3, 10, 1, 10, 2.0, std::log(3.4 / 8.6) - std::log(1.4 / 10.6),
     1 / 3.4 + 1 / 1.4},
    // The same counts seen from the other side: δ changes sign only.
    {"less frequent in the queue", 1, 10, 3, 10, 2.0, std::log(1.4 / 10.6) - std::log(3.4 / 8.6),
     1 / 1.4 + 1 / 3.4},
    // y = 20, n = 400, α_w = 25: δ = log(30/570) − log(40/760) = 0.
    {"same rate on both sides", 5, 100, 15, 300, 500.0, 0.0, 1 / 30.0 + 1 / 40.0},
    // Absent outside: the prior keeps δ finite. y = 7, n = 57, α0 = 10.
    {"absent outside", 7, 50, 0, 7, 10.0,
     std::log((7 + 70.0 / 57) / (43 + 500.0 / 57)) - std::log((70.0 / 57) / (7 + 500.0 / 57)),
     1 / (7 + 70.0 / 57) + 1 / (70.0 / 57)},
};

TEST(TermAssociationTest, WeightedLogOddsHandWorked) {
  for (const LogOddsCase& k : kLogOddsCases) {
    SCOPED_TRACE(k.name);
    LogOdds lo = WeightedLogOdds(k.y_i, k.n_i, k.y_j, k.n_j, k.alpha0);
    EXPECT_NEAR(lo.delta, k.delta, 1e-14);
    EXPECT_NEAR(lo.variance, k.variance, 1e-14);
    EXPECT_NEAR(lo.z, k.delta / std::sqrt(k.variance), 1e-13);
  }
}

TEST(TermAssociationTest, AStrongPriorShrinksTheLogOddsTowardsZero) {
  double last = INFINITY;
  for (double alpha0 : {1.0, 10.0, 100.0, 1e4, 1e8}) {
    LogOdds lo = WeightedLogOdds(30, 100, 5, 100, alpha0);
    EXPECT_GT(lo.delta, 0);
    EXPECT_LT(lo.delta, last);
    last = lo.delta;
  }
  EXPECT_LT(last, 1e-5);
}

// --- The table --------------------------------------------------------------

TEST(TermTableTest, BuilderOrdersQueuesAndTermsByBytesAndCountsDocuments) {
  TermTableBuilder b;
  b.AddQueue("empty");
  b.AddDocument("zeta", {{"b", 2}, {"a", 1}});
  b.AddDocument("alpha", {{"c", 4}});
  b.AddDocument("zeta", {{"b", 1}});
  TermTable t = b.Build();
  ASSERT_EQ(t.queues, (std::vector<std::string>{"alpha", "empty", "zeta"}));
  EXPECT_EQ(t.documents, (std::vector<int64_t>{1, 0, 2}));
  ASSERT_EQ(t.terms, (std::vector<std::string>{"a", "b", "c"}));
  EXPECT_TRUE(t.has_document_counts);
  EXPECT_EQ(t.counts, (std::vector<int64_t>{0, 0, 1, 0, 0, 3, 4, 0, 0}));
  EXPECT_EQ(t.document_counts, (std::vector<int64_t>{0, 0, 1, 0, 0, 2, 1, 0, 0}));
  EXPECT_EQ(t.FindQueue("zeta"), 2);
  EXPECT_EQ(t.FindQueue("nope"), -1);
}

TEST(TermTableTest, FromCountsKeepsTheCountsWithoutDocumentCounts) {
  ModelCounts mc;
  mc.queues = {{"a", 2, 5, std::nullopt}, {"b", 1, 1, std::nullopt}};
  mc.terms = {"x", "y"};
  mc.counts = {3, 1, 2, 0};
  TermTable t = TermTableFromCounts(mc);
  EXPECT_EQ(t.queues, (std::vector<std::string>{"a", "b"}));
  EXPECT_EQ(t.documents, (std::vector<int64_t>{2, 1}));
  EXPECT_EQ(t.counts, mc.counts);
  EXPECT_FALSE(t.has_document_counts);
}

// --- Ranking ------------------------------------------------------------------

// Three queues; occurrences chosen so that every rule shows.
TermTable ThreeQueues() {
  return TableOf({
      {"claims", {{"damage", 6}, {"hull", 5}, {"the", 10}, {"rare", 1}}},
      {"claims", {{"damage", 4}, {"the", 10}, {"berth", 1}}},
      {"berths", {{"berth", 9}, {"the", 30}, {"hull", 1}}},
      {"fees", {{"invoice", 8}, {"the", 20}, {"damage", 1}}},
  });
}

TEST(TermRankingTest, LogOddsListsOnlyPositiveTermsAboveMinCountBestFirst) {
  TermTable t = ThreeQueues();
  TermRankingOptions o;
  o.min_count = 2;
  o.prior_strength = 10;
  QueueTerms claims = RankTerms(t, static_cast<size_t>(t.FindQueue("claims")), o);
  EXPECT_EQ(claims.queue, "claims");
  EXPECT_EQ(claims.documents, 2);
  EXPECT_EQ(claims.tokens, 37);
  // "the" is rarer in claims (20/37) than elsewhere (50/69); "rare" and
  // "berth" are below the minimum count.
  ASSERT_EQ(claims.terms.size(), 2u);
  EXPECT_EQ(claims.terms[0].term, "damage");
  EXPECT_EQ(claims.terms[1].term, "hull");
  EXPECT_EQ(Find(claims, "the"), nullptr);
  EXPECT_EQ(Find(claims, "rare"), nullptr);
  for (size_t i = 1; i < claims.terms.size(); ++i) {
    EXPECT_GE(claims.terms[i - 1].score, claims.terms[i].score);
  }
  const RankedTerm& damage = claims.terms[0];
  EXPECT_EQ(damage.count, 10);
  EXPECT_DOUBLE_EQ(damage.rate_in, 10000.0 * 10 / 37);
  EXPECT_DOUBLE_EQ(damage.rate_out, 10000.0 * 1 / 69);
  LogOdds lo = WeightedLogOdds(10, 37, 1, 69, 10);
  EXPECT_DOUBLE_EQ(damage.log_odds, lo.delta);
  EXPECT_DOUBLE_EQ(damage.z, lo.z);
  EXPECT_DOUBLE_EQ(damage.score, lo.z);
}

TEST(TermRankingTest, MinCountCountsOccurrencesInTheQueue) {
  TermTable t = ThreeQueues();
  TermRankingOptions o;
  o.prior_strength = 10;
  const size_t claims = static_cast<size_t>(t.FindQueue("claims"));
  o.min_count = 5;  // hull has 5, damage 10
  EXPECT_NE(Find(RankTerms(t, claims, o), "hull"), nullptr);
  o.min_count = 6;
  EXPECT_EQ(Find(RankTerms(t, claims, o), "hull"), nullptr);
  EXPECT_NE(Find(RankTerms(t, claims, o), "damage"), nullptr);
  o.min_count = 11;
  EXPECT_TRUE(RankTerms(t, claims, o).terms.empty());
}

TEST(TermRankingTest, TopCutsTheListAndTiesGoByTermBytes) {
  // Two terms with identical counts everywhere tie exactly.
  TermTable t = TableOf({
      {"a", {{"pear", 5}, {"apple", 5}, {"fig", 7}, {"x", 1}}},
      {"b", {{"x", 20}, {"fig", 1}}},
  });
  TermRankingOptions o;
  o.min_count = 1;
  QueueTerms a = RankTerms(t, 0, o);
  ASSERT_EQ(a.terms.size(), 3u);
  EXPECT_EQ(a.terms[0].term, "fig");
  EXPECT_EQ(a.terms[1].term, "apple");
  EXPECT_EQ(a.terms[2].term, "pear");
  EXPECT_EQ(a.terms[1].score, a.terms[2].score);
  o.top = 2;
  a = RankTerms(t, 0, o);
  ASSERT_EQ(a.terms.size(), 2u);
  EXPECT_EQ(a.terms[1].term, "apple");
}

TEST(TermRankingTest, NothingToCompareGivesAnEmptyList) {
  TermTableBuilder b;
  b.AddQueue("empty");
  b.AddDocument("only", {{"a", 9}, {"b", 9}});
  TermTable t = b.Build();
  EXPECT_EQ(QueuesWithDocuments(t), 1u);
  for (TermMethod m :
       {TermMethod::kLogOdds, TermMethod::kChiSquare, TermMethod::kMutualInformation}) {
    TermRankingOptions o;
    o.method = m;
    o.min_count = 1;
    EXPECT_TRUE(RankTerms(t, 0, o).terms.empty());  // "empty": no terms
    EXPECT_TRUE(RankTerms(t, 1, o).terms.empty());  // "only": no rest
  }
}

// Example 13.1 of Manning et al. (2008) as documents: China (1-3) against
// not-China (4). "chinese" is in every document: not tied to either class.
TEST(TermRankingTest, ChiSquareAndMutualInformationUseDocumentCounts) {
  TermTable t = TableOf({
      {"china", {{"beijing", 1}, {"chinese", 2}}},
      {"china", {{"chinese", 2}, {"shanghai", 1}}},
      {"china", {{"chinese", 1}, {"macao", 1}}},
      {"japan", {{"chinese", 1}, {"japan", 1}, {"tokyo", 1}}},
  });
  TermRankingOptions o;
  o.min_count = 1;
  o.method = TermMethod::kChiSquare;
  QueueTerms china = RankTerms(t, 0, o);
  EXPECT_EQ(Find(china, "chinese"), nullptr);
  ASSERT_EQ(china.terms.size(), 3u);  // beijing, macao, shanghai
  // beijing: N11 = 1, N10 = 0, N01 = 2, N00 = 1; X² = 4·1 / (3·1·1·3).
  const RankedTerm* beijing = Find(china, "beijing");
  ASSERT_NE(beijing, nullptr);
  EXPECT_NEAR(beijing->score, 4.0 / 9.0, 1e-15);
  EXPECT_EQ(beijing->documents_in, 1);
  EXPECT_EQ(beijing->documents_out, 0);
  EXPECT_EQ(china.terms[0].term, "beijing");  // tie broken by bytes
  EXPECT_DOUBLE_EQ(beijing->rate_in, 10000.0 / 8);
  EXPECT_DOUBLE_EQ(beijing->rate_out, 0.0);

  o.method = TermMethod::kMutualInformation;
  QueueTerms japan = RankTerms(t, 1, o);
  ASSERT_EQ(japan.terms.size(), 2u);  // japan, tokyo
  const RankedTerm* tokyo = Find(japan, "tokyo");
  ASSERT_NE(tokyo, nullptr);
  // Against japan: N11 = 1, N10 = 0, N01 = 0, N00 = 3: I = H(C) for
  // P(C) = 1/4.
  const double h = -(0.25 * std::log2(0.25) + 0.75 * std::log2(0.75));
  EXPECT_NEAR(tokyo->score, h, 1e-15);
  EXPECT_EQ(tokyo->count, 1);
  EXPECT_EQ(tokyo->log_odds, 0.0);
  EXPECT_EQ(tokyo->z, 0.0);
}

// For occurrences, a table from the builder and one from model counts give
// the same log-odds ranking.
TEST(TermRankingTest, LogOddsIsTheSameFromLedgerAndFromModelCounts) {
  TermTable from_docs = ThreeQueues();
  ModelCounts mc;
  for (size_t q = 0; q < from_docs.queue_count(); ++q) {
    mc.queues.push_back({from_docs.queues[q], from_docs.documents[q], 0, std::nullopt});
  }
  mc.terms = from_docs.terms;
  mc.counts = from_docs.counts;
  TermTable from_counts = TermTableFromCounts(mc);
  TermRankingOptions o;
  o.min_count = 1;
  for (size_t q = 0; q < from_docs.queue_count(); ++q) {
    QueueTerms a = RankTerms(from_docs, q, o), b = RankTerms(from_counts, q, o);
    ASSERT_EQ(a.terms.size(), b.terms.size());
    for (size_t i = 0; i < a.terms.size(); ++i) {
      EXPECT_EQ(a.terms[i].term, b.terms[i].term);
      EXPECT_EQ(a.terms[i].z, b.terms[i].z);
    }
  }
}

}  // namespace
}  // namespace chute
