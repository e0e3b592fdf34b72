// Seeded, stratified k-fold assignment for cross-validation.
//
// Reproducible everywhere: the generator is std::mt19937_64, whose output
// the C++ standard fixes exactly ([rand.predef]: the 10000th value of a
// default-seeded engine is 9981545732273789042), and the shuffle draws its
// integers with the reduction written out below instead of
// std::uniform_int_distribution or std::shuffle, whose algorithms the
// standard leaves to each library. The same seed gives the same folds with
// any compiler.
#ifndef CHUTE_CLASSIFY_FOLDS_H_
#define CHUTE_CLASSIFY_FOLDS_H_

#include <cstdint>
#include <random>
#include <span>
#include <vector>

namespace chute {

// A uniform integer in [0, n) from 64-bit draws: draws below 2^64 mod n are
// rejected, so the accepted range is a whole multiple of n, and the rest is
// reduced modulo n (common practice: unbiased rejection sampling).
// REQUIRES: n > 0.
uint64_t UniformBelow(std::mt19937_64* generator, uint64_t n);

// Shuffles items in place: Durstenfeld's form of the Fisher–Yates shuffle
// (R. Durstenfeld, "Algorithm 235: Random permutation", CACM 7(7), 1964;
// Knuth, The Art of Computer Programming vol. 2, §3.4.2, Algorithm P):
// for i = n−1 down to 1, swap item i with item UniformBelow(i + 1).
void Shuffle(std::mt19937_64* generator, std::span<uint32_t> items);

// The fold (0 .. folds−1) of each item, stratified by label: the items of
// each label, in the order given, are shuffled and dealt round-robin to the
// folds, each label starting on the fold after the one where the previous
// label stopped; labels are taken in increasing order, all from one
// generator seeded with `seed`. So every fold holds ⌊n_q/k⌋ or ⌈n_q/k⌉ of
// the n_q items of label q (its share of q is within one item of the
// whole's), and fold sizes differ by at most one.
// The result depends on the order of `labels`: give items in an order that
// does not depend on chance (chute uses the document digests' order).
// REQUIRES: folds >= 1; every label < label_count.
std::vector<uint32_t> AssignStratifiedFolds(std::span<const uint32_t> labels,
                                            uint32_t label_count, uint32_t folds,
                                            uint64_t seed);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_FOLDS_H_
