// The Wilson score interval of a proportion: a confidence interval for the
// share p of successes behind k successes in n independent trials.
//
// E. B. Wilson, "Probable inference, the law of succession, and statistical
// inference", Journal of the American Statistical Association 22(158),
// 1927, pp. 209-212. With p̂ = k/n and z the standard normal quantile:
//
//   centre     = (p̂ + z²/(2n)) / (1 + z²/n)
//   half-width = z / (1 + z²/n) · sqrt(p̂(1 − p̂)/n + z²/(4n²))
//   interval   = [centre − half-width, centre + half-width]
//
// Unlike the plain p̂ ± z·sqrt(p̂(1 − p̂)/n), it stays inside [0, 1] and is
// not empty at k = 0 or k = n, which matters for the small audit samples
// of a queue (R. G. Newcombe, "Two-sided confidence intervals for the
// single proportion: comparison of seven methods", Statistics in Medicine
// 17, 1998, pp. 857-872, method 3).
#ifndef CHUTE_CLASSIFY_WILSON_INTERVAL_H_
#define CHUTE_CLASSIFY_WILSON_INTERVAL_H_

#include <cstdint>
#include <optional>

namespace chute {

// z for a two-sided 95% interval: the 0.975 quantile of the standard normal
// distribution (scipy.stats.norm.ppf(0.975) gives 1.959963984540054).
inline constexpr double kZ95 = 1.959963984540054;

struct ProportionInterval {
  double estimate = 0;  // k / n
  double low = 0;
  double high = 0;
};

// The Wilson score interval of k successes in n trials; nullopt when
// n = 0 (nothing was observed: no estimate). The bounds are clamped to
// [0, 1] against rounding, and are exactly 0 at k = 0 and 1 at k = n.
// REQUIRES: 0 <= k <= n, z > 0.
std::optional<ProportionInterval> WilsonInterval(int64_t k, int64_t n, double z = kZ95);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_WILSON_INTERVAL_H_
