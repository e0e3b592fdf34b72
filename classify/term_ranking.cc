#include "classify/term_ranking.h"

#include <algorithm>

#include "classify/term_association.h"

namespace chute {

namespace {

constexpr double kPerTenThousand = 10000.0;

double Rate(int64_t count, int64_t total) {
  return total > 0 ? kPerTenThousand * static_cast<double>(count) / static_cast<double>(total)
                   : 0.0;
}

}  // namespace

size_t QueuesWithDocuments(const TermTable& table) {
  size_t n = 0;
  for (int64_t d : table.documents) n += d > 0 ? 1 : 0;
  return n;
}

QueueTerms RankTerms(const TermTable& table, size_t q, const TermRankingOptions& options) {
  const size_t nq = table.queue_count();
  const size_t rows = table.term_count();
  QueueTerms out;
  out.queue = table.queues[q];
  out.documents = table.documents[q];

  // Totals: occurrences in the queue and in all, documents likewise.
  int64_t all_tokens = 0;
  for (int64_t c : table.counts) all_tokens += c;
  for (size_t row = 0; row < rows; ++row) out.tokens += table.count(row, q);
  const int64_t tokens_out = all_tokens - out.tokens;
  int64_t all_documents = 0;
  for (int64_t d : table.documents) all_documents += d;
  const int64_t documents_out = all_documents - out.documents;

  const bool by_documents = options.method != TermMethod::kLogOdds;
  if (out.tokens == 0 || tokens_out == 0) return out;
  if (by_documents && documents_out == 0) return out;

  std::vector<RankedTerm> ranked;
  for (size_t row = 0; row < rows; ++row) {
    const int64_t y_i = table.count(row, q);
    if (y_i < options.min_count) continue;
    int64_t y = 0;
    for (size_t k = 0; k < nq; ++k) y += table.count(row, k);
    const int64_t y_j = y - y_i;

    RankedTerm t;
    t.count = y_i;
    t.rate_in = Rate(y_i, out.tokens);
    t.rate_out = Rate(y_j, tokens_out);
    if (!by_documents) {
      // A term that is every counted term cannot set anything apart (and
      // its prior would leave nothing for the rest of the vocabulary).
      if (y == all_tokens) continue;
      LogOdds lo = WeightedLogOdds(y_i, out.tokens, y_j, tokens_out, options.prior_strength);
      if (!(lo.delta > 0)) continue;
      t.log_odds = lo.delta;
      t.z = lo.z;
      t.score = lo.z;
    } else {
      int64_t with_term = 0;
      for (size_t k = 0; k < nq; ++k) with_term += table.document_count(row, k);
      DocumentContingency c;
      c.n11 = table.document_count(row, q);
      c.n10 = with_term - c.n11;
      c.n01 = out.documents - c.n11;
      c.n00 = documents_out - c.n10;
      if (!PositivelyAssociated(c)) continue;
      t.documents_in = c.n11;
      t.documents_out = c.n10;
      t.score = options.method == TermMethod::kChiSquare ? ChiSquare(c) : MutualInformation(c);
    }
    t.term = table.terms[row];
    ranked.push_back(std::move(t));
  }

  auto better = [](const RankedTerm& a, const RankedTerm& b) {
    if (a.score != b.score) return a.score > b.score;
    return a.term < b.term;
  };
  const size_t keep = std::min(ranked.size(), static_cast<size_t>(options.top));
  std::partial_sort(ranked.begin(), ranked.begin() + static_cast<std::ptrdiff_t>(keep),
                    ranked.end(), better);
  ranked.resize(keep);
  out.terms = std::move(ranked);
  return out;
}

}  // namespace chute
