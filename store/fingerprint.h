// The fingerprint of a model: SHA-256 (FIPS 180-4) over its settings, its
// queues and its counts, such that two stores whose models route every
// document alike have the same fingerprint whatever order their documents
// were learned in, and any difference in a count changes it.
//
// The counts enter through their sum: each non-zero count N(q, w) has a row
// digest, SHA-256 of "t <len>:<term> <len>:<queue> <N>", and the digests are
// added as 256-bit numbers (modulo 2^256). A sum does not depend on the
// order of its terms, as a hash over sorted counts would not, and it can be
// kept up to date with each change, a few rows at a time, instead of reading
// every count of the model (the additive construction AdHASH of Bellare &
// Micciancio, "A New Paradigm for Collision-Free Hashing: Incrementality at
// Reduced Cost", EUROCRYPT 1997, recalled from memory). With a modulus of
// 2^256 the sum is no defence against someone crafting counts on purpose;
// it identifies versions and finds damage, which is what chute uses it for.
#ifndef CHUTE_STORE_FINGERPRINT_H_
#define CHUTE_STORE_FINGERPRINT_H_

#include <array>
#include <cstdint>
#include <string>
#include <string_view>

#include "classify/model_counts.h"
#include "store/store_settings.h"

namespace chute {

// A sum of row digests: four 64-bit limbs, least significant first.
class CountsSum {
 public:
  // Adds (or with sign -1 subtracts) the digest of the count (term, queue,
  // n). REQUIRES: n > 0.
  void Add(std::string_view term, std::string_view queue, int64_t n, int sign = 1);
  // The same for a count that changes from `before` to `after` (either may
  // be 0, meaning no row).
  void Change(std::string_view term, std::string_view queue, int64_t before, int64_t after) {
    if (before > 0) Add(term, queue, before, -1);
    if (after > 0) Add(term, queue, after, 1);
  }
  // Adds another sum (modulo 2^256): sums kept apart, say on two threads,
  // then added, equal the one sum.
  void Add(const CountsSum& other);
  std::string Hex() const;  // 64 hex digits, most significant first
  // False for anything but 64 hex digits.
  static bool FromHex(std::string_view hex, CountsSum* out);
  bool operator==(const CountsSum&) const = default;

 private:
  std::array<uint64_t, 4> limbs_{};
};

// The sum over every non-zero count of counts.
CountsSum SumOfCounts(const ModelCounts& counts);

// The canonical text hashed, line by line ('\n' after each):
//   chute-model 2
//   alpha <shortest decimal>, prior learned|uniform, bigrams on|off,
//   numbers keep|fold, min_length <n>, max_length <n>   (one per line)
//   q <name length>:<name> <documents> <tokens> <hand-set prior or ->
//        for each queue with documents, in byte order of names
//   counts <the sum of the row digests, 64 hex digits>
// Queues without documents do not route, so they are left out, and so is
// keep_text, which does not change the model. Only the queue fields of
// counts.queues are read. Returns 64 lowercase hex digits.
std::string ModelFingerprint(const StoreSettings& settings, const ModelCounts& queues,
                             const CountsSum& sum);
// The same with the sum computed from counts.
std::string ModelFingerprint(const StoreSettings& settings, const ModelCounts& counts);

}  // namespace chute

#endif  // CHUTE_STORE_FINGERPRINT_H_
