#ifndef CHUTE_CLASSIFY_LOG_SUM_EXP_H_
#define CHUTE_CLASSIFY_LOG_SUM_EXP_H_

#include <span>

namespace chute {

// log(Σ exp(x_i)), computed as m + log(Σ exp(x_i − m)) with m = max x_i so
// that nothing overflows or underflows to a wrong zero (common practice; see
// e.g. Murphy, Machine Learning: A Probabilistic Perspective, 2012, §3.5.3).
// Entries of −∞ contribute nothing; returns −∞ when every entry is −∞ or
// the span is empty.
double LogSumExp(std::span<const double> x);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_LOG_SUM_EXP_H_
