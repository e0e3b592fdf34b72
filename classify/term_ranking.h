// The terms that most set one queue apart from all the other queues taken
// together ("one against the rest"), ranked by one of three measures
// (term_association.h):
//
//   kLogOdds            the weighted log-odds ratio with an informative
//                       Dirichlet prior (Monroe, Colaresi & Quinn 2008), on
//                       occurrences; ranked by its z-score.
//   kChiSquare          Pearson's χ² (Manning, Raghavan & Schütze 2008,
//                       §13.5.2), on documents that contain the term.
//   kMutualInformation  the expected mutual information in bits (same book,
//                       §13.5.1), on documents that contain the term.
//
// Every method lists only terms tied positively to the queue: for log-odds
// δ > 0 (relatively more frequent in the queue than outside, after the
// prior); for χ² and mutual information N11·N00 > N10·N01 (both measures are
// also high for a term that avoids the queue, which is not what "marks the
// queue" means). Terms that occur fewer than min_count times in the queue's
// documents are left out, whatever the method.
#ifndef CHUTE_CLASSIFY_TERM_RANKING_H_
#define CHUTE_CLASSIFY_TERM_RANKING_H_

#include <cstdint>
#include <string>
#include <vector>

#include "classify/term_table.h"

namespace chute {

enum class TermMethod { kLogOdds, kChiSquare, kMutualInformation };

struct TermRankingOptions {
  TermMethod method = TermMethod::kLogOdds;
  // Terms listed per queue, best first. REQUIRES: top >= 1.
  int64_t top = 25;
  // Terms with fewer occurrences than this in the queue's documents are left
  // out. REQUIRES: min_count >= 1.
  int64_t min_count = 5;
  // α0, the strength of the log-odds prior, in pseudo-occurrences.
  // REQUIRES: finite, > 0.
  double prior_strength = 500;
};

struct RankedTerm {
  std::string term;
  int64_t count = 0;          // occurrences in the queue's documents
  double rate_in = 0;         // occurrences per 10,000 terms of the queue
  double rate_out = 0;        // occurrences per 10,000 terms of all other queues
  double log_odds = 0;        // δ (kLogOdds only; else 0)
  double z = 0;               // δ / σ (kLogOdds only; else 0)
  double score = 0;           // what the list is ranked by: z, χ² or I (bits)
  int64_t documents_in = 0;   // documents of the queue with the term (χ², MI)
  int64_t documents_out = 0;  // other documents with the term (χ², MI)
};

struct QueueTerms {
  std::string queue;
  int64_t documents = 0;  // documents learned for the queue
  int64_t tokens = 0;     // occurrences of all terms in the queue
  // Best first: score descending, ties by term bytes. At most `top`.
  std::vector<RankedTerm> terms;
};

// Ranks the terms of queue `q` against all the other queues.
// The list is empty when the queue, or the rest, has no counted terms (or,
// for χ² and MI, no documents): there is nothing to compare.
// REQUIRES: q < table.queue_count(); options as documented; for kChiSquare
// and kMutualInformation, table.has_document_counts.
QueueTerms RankTerms(const TermTable& table, size_t q, const TermRankingOptions& options);

// The number of queues with at least one document: rankings need two.
size_t QueuesWithDocuments(const TermTable& table);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_TERM_RANKING_H_
