// A running sum of doubles with its rounding error carried along, so that
// a mean over many documents does not drift with their order: Neumaier's
// improvement of Kahan summation (A. Neumaier, "Rundungsfehleranalyse
// einiger Verfahren zur Summation endlicher Summen", ZAMM 54, 1974;
// reference recalled from memory).
#ifndef CHUTE_CLASSIFY_COMPENSATED_SUM_H_
#define CHUTE_CLASSIFY_COMPENSATED_SUM_H_

#include <cmath>

namespace chute {

class CompensatedSum {
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
  double value() const { return sum_ + compensation_; }

 private:
  double sum_ = 0;
  double compensation_ = 0;
};

}  // namespace chute

#endif  // CHUTE_CLASSIFY_COMPENSATED_SUM_H_
