#include "classify/term_association.h"

#include <cmath>

namespace chute {

LogOdds WeightedLogOdds(int64_t y_i, int64_t n_i, int64_t y_j, int64_t n_j, double alpha0) {
  const int64_t y = y_i + y_j;
  const int64_t n = n_i + n_j;
  // α_w and what the prior gives every other term, α0 − α_w, each from the
  // integers so that the second is not a difference of two near numbers.
  const double share = static_cast<double>(y) / static_cast<double>(n);
  const double rest_share = static_cast<double>(n - y) / static_cast<double>(n);
  const double alpha_w = alpha0 * share;
  const double alpha_rest = alpha0 * rest_share;
  const double in_w = static_cast<double>(y_i) + alpha_w;
  const double in_rest = static_cast<double>(n_i - y_i) + alpha_rest;
  const double out_w = static_cast<double>(y_j) + alpha_w;
  const double out_rest = static_cast<double>(n_j - y_j) + alpha_rest;
  LogOdds r;
  r.delta = std::log(in_w / in_rest) - std::log(out_w / out_rest);
  r.variance = 1.0 / in_w + 1.0 / out_w;
  r.z = r.delta / std::sqrt(r.variance);
  return r;
}

bool PositivelyAssociated(const DocumentContingency& c) {
  // long double holds every product of two int64 counts below 2^32 exactly,
  // and larger ones to 64 bits.
  return static_cast<long double>(c.n11) * static_cast<long double>(c.n00) >
         static_cast<long double>(c.n10) * static_cast<long double>(c.n01);
}

double ChiSquare(const DocumentContingency& c) {
  using LD = long double;
  const LD n11 = static_cast<LD>(c.n11), n10 = static_cast<LD>(c.n10);
  const LD n01 = static_cast<LD>(c.n01), n00 = static_cast<LD>(c.n00);
  const LD margins = (n11 + n01) * (n11 + n10) * (n10 + n00) * (n01 + n00);
  if (margins == 0) return 0.0;
  const LD det = n11 * n00 - n10 * n01;
  return static_cast<double>((n11 + n10 + n01 + n00) * det * det / margins);
}

double MutualInformation(const DocumentContingency& c) {
  using LD = long double;
  const LD n11 = static_cast<LD>(c.n11), n10 = static_cast<LD>(c.n10);
  const LD n01 = static_cast<LD>(c.n01), n00 = static_cast<LD>(c.n00);
  const LD n = n11 + n10 + n01 + n00;
  if (n == 0) return 0.0;
  const LD with_t = n11 + n10, without_t = n01 + n00;  // N1., N0.
  const LD in_c = n11 + n01, not_c = n10 + n00;        // N.1, N.0
  auto cell = [n](LD n_ab, LD row, LD column) -> LD {
    if (n_ab == 0) return 0;  // 0 · log 0 = 0
    return n_ab / n * std::log2(n * n_ab / (row * column));
  };
  return static_cast<double>(cell(n11, with_t, in_c) + cell(n01, without_t, in_c) +
                             cell(n10, with_t, not_c) + cell(n00, without_t, not_c));
}

}  // namespace chute
