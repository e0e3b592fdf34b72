// Why a document went to its queue: the decision taken apart term by term.
//
// The scorer (classify/model.h) gives every queue
//   score(q) = log prior(q) + Σ_w n_w · log θ(q,w).
// For the chosen queue c and the runner-up r, the score gap splits exactly
// into one share per known term and one for the prior:
//   score(c) − score(r) = [log prior(c) − log prior(r)]                (prior share)
//                       + Σ_w n_w · (log θ(c,w) − log θ(r,w))          (contributions)
// A contribution above 0 pulled the document towards c, below 0 towards r.
// All of them are natural-log odds: the gap is log(P(c|d) / P(r|d)). Terms
// the model never learned take no part in the scores and are listed as
// ignored. This is the additive reading of multinomial naive Bayes in log
// space (Manning, Raghavan & Schütze, Introduction to Information Retrieval,
// 2008, §13.2, which reads each log P̂(t|c) as a weight saying how good an
// indicator t is for c, and log P̂(c) as the weight of the prior; wording
// recalled from memory).
//
// The runner-up is the second queue of Model::Decide's ranking, the one
// `chute route` shows, unless its score is −∞ (a prior of 0: it can never be
// chosen, so nothing is explained by comparing with it). A model with one
// queue, or whose other queues all have prior 0, has no runner-up: the
// explanation then holds the decision and the ignored terms only.
//
// Pure computation, no I/O.
#ifndef CHUTE_CLASSIFY_EXPLANATION_H_
#define CHUTE_CLASSIFY_EXPLANATION_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "classify/model.h"

namespace chute {

// One known term of the document and its share of the score gap.
struct TermContribution {
  std::string term;
  int64_t count = 0;          // n_w: occurrences in the document
  double contribution = 0.0;  // n_w · (log θ(c,w) − log θ(r,w))
};

// A term of the document the model does not know, with its occurrences.
struct IgnoredTerm {
  std::string term;
  int64_t count = 0;
};

struct ExplainOptions {
  // Terms listed on each side (towards the chosen queue, towards the
  // runner-up). The sums always cover every known term.
  size_t top = 15;
};

struct Explanation {
  // Every queue's score and posterior, best first (Model::Decide).
  Decision decision;
  uint32_t queue = 0;                 // the chosen queue (Model::queues() index)
  std::optional<uint32_t> runner_up;  // none: see the top of this file
  // score(c) − score(r) exactly as Model::Decide computed the two scores;
  // 0 without a runner-up.
  double score_gap = 0.0;
  // log prior(c) − log prior(r); 0 without a runner-up.
  double prior_share = 0.0;
  // prior_share plus the contributions of every known term, summed with
  // Neumaier's compensated summation (classify/neumaier_sum.h). Equals
  // score_gap up to the rounding of the scorer's own plain sums.
  double contribution_sum = 0.0;
  // The `top` largest positive contributions, largest first; ties by term.
  std::vector<TermContribution> toward_queue;
  // The `top` most negative contributions, most negative first; ties by term.
  std::vector<TermContribution> toward_runner_up;
  // How many distinct known terms pulled each way in all (the lists above
  // hold at most `top` of them); terms with a contribution of exactly 0 are
  // in neither count nor list.
  size_t terms_toward_queue = 0;
  size_t terms_toward_runner_up = 0;
  // Every term the model does not know: most frequent first, then by term
  // (bytewise).
  std::vector<IgnoredTerm> ignored;
};

// Splits a document's terms (in any order, repeats counted) into the rows the
// model knows, as Model::ToRows gives them, and the terms it ignores, sorted
// as Explanation::ignored.
void SplitTerms(const Model& model, const std::vector<std::string>& terms,
                DocumentRows* rows, std::vector<IgnoredTerm>* ignored);

// The contribution of every row of the document, in row order:
// n_w · (log θ(queue,w) − log θ(runner_up,w)).
// REQUIRES: queue, runner_up < model.queue_count().
std::vector<TermContribution> ComputeContributions(const Model& model,
                                                   const DocumentRows& rows,
                                                   uint32_t queue,
                                                   uint32_t runner_up);

// Decides the document and explains the decision. `ignored` is stored as
// given (SplitTerms sorts it). REQUIRES: model.queue_count() > 0; rows as
// Model::ToRows makes them.
Explanation Explain(const Model& model, const DocumentRows& rows,
                    std::vector<IgnoredTerm> ignored,
                    const ExplainOptions& options = {});

// SplitTerms, then Explain.
Explanation ExplainTerms(const Model& model, const std::vector<std::string>& terms,
                         const ExplainOptions& options = {});

}  // namespace chute

#endif  // CHUTE_CLASSIFY_EXPLANATION_H_
