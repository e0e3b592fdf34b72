// An accurate running sum of doubles: Neumaier's improvement of Kahan's
// compensated summation. Each addition keeps the low-order bits that the
// rounded sum lost in a separate compensation term, choosing the right
// operand whichever of the two is larger in magnitude (plain Kahan summation
// loses them when an addend is larger than the running sum). The error bound
// is about 2·eps·Σ|x_i|, independent of the number of terms, instead of
// n·eps·Σ|x_i| for a plain loop.
//
// Sources (citations recalled from memory): W. Kahan, "Further remarks on
// reducing truncation errors", Communications of the ACM 8(1), 1965, p. 40;
// A. Neumaier, "Rundungsfehleranalyse einiger Verfahren zur Summation
// endlicher Summen", ZAMM 54(1), 1974, pp. 39-51; N. J. Higham, Accuracy and
// Stability of Numerical Algorithms, 2nd ed., SIAM, 2002, §4.3.
//
// Relies on IEEE arithmetic without value-changing optimisations
// (-ffast-math would remove the compensation).
#ifndef CHUTE_CLASSIFY_NEUMAIER_SUM_H_
#define CHUTE_CLASSIFY_NEUMAIER_SUM_H_

#include <cmath>

namespace chute {

class NeumaierSum {
 public:
  void Add(double x) {
    const double t = sum_ + x;
    if (std::fabs(sum_) >= std::fabs(x)) {
      compensation_ += (sum_ - t) + x;
    } else {
      compensation_ += (x - t) + sum_;
    }
    sum_ = t;
  }
  // The sum so far, with the compensation applied.
  double value() const { return sum_ + compensation_; }

 private:
  double sum_ = 0.0;
  double compensation_ = 0.0;
};

}  // namespace chute

#endif  // CHUTE_CLASSIFY_NEUMAIER_SUM_H_
