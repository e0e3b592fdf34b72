#ifndef CHUTE_CLASSIFY_PRIOR_H_
#define CHUTE_CLASSIFY_PRIOR_H_

#include <vector>

#include "classify/model_counts.h"

namespace chute {

// The prior of each queue, in the order of `queues`.
//
// Queues with a prior set by hand keep it. The rest share what is left,
// 1 − Σ set priors: in proportion to their documents (PriorMode::kLearned,
// the maximum-likelihood estimate documents(q) / documents) or equally
// (kUniform). With no prior set by hand this is the usual multinomial naive
// Bayes prior (Manning, Raghavan & Schütze, Introduction to Information
// Retrieval, 2008, §13.2, eq. 13.5).
// A queue can get prior 0 (all mass set by hand elsewhere); its log prior is
// then −∞ and it is never chosen.
// REQUIRES: every set prior in (0, 1), their sum <= 1.
std::vector<double> ComputePriors(const std::vector<QueueCounts>& queues,
                                  PriorMode mode);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_PRIOR_H_
