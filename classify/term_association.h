// How strongly one term is tied to one queue, three ways. Pure functions of
// counts; term_ranking.h applies them to every term of a queue.
#ifndef CHUTE_CLASSIFY_TERM_ASSOCIATION_H_
#define CHUTE_CLASSIFY_TERM_ASSOCIATION_H_

#include <cstdint>

namespace chute {

// The weighted log-odds ratio with an informative Dirichlet prior, of Monroe,
// Colaresi & Quinn, "Fightin' Words: Lexical Feature Selection and Evaluation
// for Identifying the Content of Political Conflict", Political Analysis
// 16(4), 2008, §3.5. For a term w, group i (the queue) and group j (all other
// queues):
//
//   δ_w  = log((y_i + α_w) / (n_i + α0 − y_i − α_w))
//        − log((y_j + α_w) / (n_j + α0 − y_j − α_w))
//   σ²_w ≈ 1/(y_i + α_w) + 1/(y_j + α_w)
//   z_w  = δ_w / √σ²_w
//
// y_i, y_j: occurrences of w in i and in j; n_i, n_j: all occurrences in i
// and in j; α0 the prior's strength and α_w = α0 · y_w / n its share for w
// (y_w = y_i + y_j, n = n_i + n_j): an informative prior built from the
// term's share of all counted terms. The formulas and the paper's equation
// numbers (16 for δ, 19-20 for σ², 22 for z) are recalled from memory and
// agree with secondary descriptions of the method; the paper's own text was
// not at hand to check them against.
struct LogOdds {
  double delta = 0;     // δ_w, natural logarithm
  double variance = 0;  // σ²_w
  double z = 0;         // δ_w / σ_w
};

// REQUIRES: 0 <= y_i <= n_i, 0 <= y_j <= n_j, y_i + y_j > 0,
// y_i + y_j < n_i + n_j (some other term was counted), alpha0 > 0.
LogOdds WeightedLogOdds(int64_t y_i, int64_t n_i, int64_t y_j, int64_t n_j, double alpha0);

// The 2×2 table of documents for a term t and a class c, in the notation of
// Manning, Raghavan & Schütze, Introduction to Information Retrieval, 2008,
// §13.5.1: the first index says whether the document contains t, the second
// whether it is in c.
struct DocumentContingency {
  int64_t n11 = 0;  // contain t, in c
  int64_t n10 = 0;  // contain t, not in c
  int64_t n01 = 0;  // without t, in c
  int64_t n00 = 0;  // without t, not in c
};

// True when t goes with c more often than independence would give:
// N11·N00 > N10·N01 (the sign of the odds ratio; χ² and mutual information
// are high for a term that avoids the class too).
bool PositivelyAssociated(const DocumentContingency& c);

// Pearson's χ² of the table, Manning et al. 2008, §13.5.2, eq. 13.19:
//   X² = N (N11 N00 − N10 N01)² / ((N11+N01)(N11+N10)(N10+N00)(N01+N00)).
// 0 when a row or column of the table is empty (no evidence either way; our
// convention, the book leaves it undefined). Computed in long double.
double ChiSquare(const DocumentContingency& c);

// The expected mutual information I(U; C) in bits, Manning et al. 2008,
// §13.5.1, eq. 13.17, with maximum-likelihood probabilities:
//   Σ_{a,b ∈ {0,1}} N_ab/N · log2(N · N_ab / (N_a. · N_.b)),
// a cell with N_ab = 0 adding 0 (0 · log 0 = 0, as the book takes it).
// 0 for an empty table. Computed in long double.
double MutualInformation(const DocumentContingency& c);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_TERM_ASSOCIATION_H_
