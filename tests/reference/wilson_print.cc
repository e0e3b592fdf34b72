// Prints the Wilson score interval (classify/wilson_interval.h) of each
// "k n" line of standard input as "k n low high" with 17 significant
// digits, for tests/reference/wilson_statsmodels.py.
#include <cstdio>
#include <iostream>

#include "classify/wilson_interval.h"

int main() {
  long long k = 0, n = 0;
  while (std::cin >> k >> n) {
    const auto w = chute::WilsonInterval(k, n);
    if (!w) {
      std::printf("%lld %lld none\n", k, n);
    } else {
      std::printf("%lld %lld %.17g %.17g\n", k, n, w->low, w->high);
    }
  }
  return 0;
}
