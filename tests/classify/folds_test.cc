#include "classify/folds.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <map>
#include <numeric>
#include <vector>

namespace chute {
namespace {

// The C++ standard fixes mt19937_64 exactly: "Required behavior: The
// 10000th consecutive invocation of a default-constructed object of type
// mt19937_64 shall produce the value 9981545732273789042" (ISO/IEC
// 14882:2020, [rand.predef] 29.6.6). Folds rest on this engine, so check it.
TEST(FoldsTest, GeneratorIsTheOneTheStandardFixes) {
  std::mt19937_64 g;
  for (int i = 1; i < 10000; ++i) g();
  EXPECT_EQ(g(), 9981545732273789042ull);
}

// UniformBelow is the reduction written out in folds.h: reject draws below
// 2^64 mod n, reduce the rest modulo n. Checked against the raw draws.
TEST(FoldsTest, UniformBelowIsRejectionThenModulo) {
  for (uint64_t n : {1ull, 2ull, 3ull, 7ull, 1000ull, (1ull << 63) + 5}) {
    std::mt19937_64 a(42), b(42);
    const uint64_t reject_below = (~n + 1) % n;  // 2^64 mod n
    for (int i = 0; i < 200; ++i) {
      uint64_t x;
      do {
        x = b();
      } while (x < reject_below);
      ASSERT_EQ(UniformBelow(&a, n), x % n) << "n " << n << " draw " << i;
    }
  }
}

TEST(FoldsTest, ShuffleIsAPermutationAndUniformOnThreeItems) {
  std::mt19937_64 g(7);
  std::map<std::vector<uint32_t>, int> seen;
  const int kRounds = 60000;
  for (int i = 0; i < kRounds; ++i) {
    std::vector<uint32_t> v = {0, 1, 2};
    Shuffle(&g, v);
    ++seen[v];
  }
  ASSERT_EQ(seen.size(), 6u);  // every permutation of three items
  // Each has probability 1/6: 10000 expected, standard deviation ≈ 91;
  // 6 standard deviations is a generous band for a fixed seed.
  for (const auto& [perm, n] : seen) EXPECT_NEAR(n, kRounds / 6, 550);
}

std::vector<uint32_t> Labels(const std::vector<int>& sizes) {
  std::vector<uint32_t> labels;
  for (size_t q = 0; q < sizes.size(); ++q) labels.insert(labels.end(), sizes[q], static_cast<uint32_t>(q));
  // Interleave so that the order given is not sorted by label.
  std::mt19937_64 g(99);
  Shuffle(&g, labels);
  return labels;
}

// Stratified: each fold holds ⌊n_q/k⌋ or ⌈n_q/k⌉ of queue q, so its share
// of q is within one document of the whole's; fold sizes differ by at most
// one. Several shapes, including queues smaller than k.
TEST(FoldsTest, FoldsAreStratified) {
  const std::vector<std::vector<int>> shapes = {
      {160, 95, 20, 70, 41, 33, 27, 30}, {1, 2, 3, 4, 5, 6}, {1000}, {7, 1}, {3, 3, 3}};
  for (const auto& sizes : shapes) {
    for (uint32_t k : {2u, 3u, 5u, 10u}) {
      const std::vector<uint32_t> labels = Labels(sizes);
      const std::vector<uint32_t> fold =
          AssignStratifiedFolds(labels, static_cast<uint32_t>(sizes.size()), k, 1);
      ASSERT_EQ(fold.size(), labels.size());
      std::vector<std::vector<int>> count(k, std::vector<int>(sizes.size(), 0));
      std::vector<int> size(k, 0);
      for (size_t i = 0; i < labels.size(); ++i) {
        ASSERT_LT(fold[i], k);
        ++count[fold[i]][labels[i]];
        ++size[fold[i]];
      }
      for (uint32_t f = 0; f < k; ++f) {
        for (size_t q = 0; q < sizes.size(); ++q) {
          const int lo = sizes[q] / static_cast<int>(k);
          const int hi = lo + (sizes[q] % static_cast<int>(k) != 0);
          EXPECT_TRUE(count[f][q] == lo || count[f][q] == hi)
              << "fold " << f << " queue " << q << ": " << count[f][q] << " of " << sizes[q];
        }
      }
      auto [mn, mx] = std::minmax_element(size.begin(), size.end());
      EXPECT_LE(*mx - *mn, 1);
    }
  }
}

TEST(FoldsTest, SameSeedGivesSameFoldsAndAnotherSeedOthers) {
  const std::vector<uint32_t> labels = Labels({50, 30, 20});
  const auto a = AssignStratifiedFolds(labels, 3, 5, 1);
  const auto b = AssignStratifiedFolds(labels, 3, 5, 1);
  const auto c = AssignStratifiedFolds(labels, 3, 5, 2);
  EXPECT_EQ(a, b);
  EXPECT_NE(a, c);
}

// The folds of a small case as an independent implementation computes
// them: tests/reference/independent_folds.py writes mt19937_64 out in
// Python from its published parameters (Matsumoto & Nishimura's 64-bit
// Mersenne Twister as fixed by [rand.predef]) together with the reduction
// and shuffle of folds.h. Agreement means the folds do not depend on this
// compiler's library.
TEST(FoldsTest, FoldsOfASmallCaseMatchAnIndependentImplementation) {
  const std::vector<uint32_t> labels = {0, 1, 0, 2, 1, 0, 0, 2, 1, 0};
  EXPECT_EQ(AssignStratifiedFolds(labels, 3, 3, 1),
            (std::vector<uint32_t>{2, 1, 0, 0, 0, 0, 1, 2, 2, 1}));
}

}  // namespace
}  // namespace chute
