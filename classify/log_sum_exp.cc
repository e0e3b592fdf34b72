#include "classify/log_sum_exp.h"

#include <cmath>
#include <limits>

namespace chute {

double LogSumExp(std::span<const double> x) {
  double m = -std::numeric_limits<double>::infinity();
  for (double v : x) m = v > m ? v : m;
  if (std::isinf(m)) return m;  // empty, all −∞, or some +∞
  double sum = 0.0;
  for (double v : x) sum += std::exp(v - m);
  return m + std::log(sum);
}

}  // namespace chute
