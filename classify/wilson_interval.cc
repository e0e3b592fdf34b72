#include "classify/wilson_interval.h"

#include <algorithm>
#include <cmath>

namespace chute {

std::optional<ProportionInterval> WilsonInterval(int64_t k, int64_t n, double z) {
  if (n <= 0) return std::nullopt;
  const double nn = static_cast<double>(n);
  const double p = static_cast<double>(k) / nn;
  const double z2 = z * z;
  const double denominator = 1 + z2 / nn;
  const double centre = (p + z2 / (2 * nn)) / denominator;
  const double half = z / denominator * std::sqrt(p * (1 - p) / nn + z2 / (4 * nn * nn));
  ProportionInterval out;
  out.estimate = p;
  // At k = 0 the lower bound is exactly 0 (and at k = n the upper one 1):
  // centre and half-width are then equal in exact arithmetic.
  out.low = k == 0 ? 0.0 : std::clamp(centre - half, 0.0, 1.0);
  out.high = k == n ? 1.0 : std::clamp(centre + half, 0.0, 1.0);
  return out;
}

}  // namespace chute
