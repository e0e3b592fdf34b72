#include "classify/folds.h"

#include <utility>

namespace chute {

uint64_t UniformBelow(std::mt19937_64* generator, uint64_t n) {
  // 2^64 mod n, computed in 64 bits as (2^64 − n) mod n.
  const uint64_t reject_below = (uint64_t{0} - n) % n;
  for (;;) {
    const uint64_t x = (*generator)();
    if (x >= reject_below) return x % n;
  }
}

void Shuffle(std::mt19937_64* generator, std::span<uint32_t> items) {
  for (size_t i = items.size(); i > 1; --i) {
    const size_t j = static_cast<size_t>(UniformBelow(generator, i));
    std::swap(items[i - 1], items[j]);
  }
}

std::vector<uint32_t> AssignStratifiedFolds(std::span<const uint32_t> labels,
                                            uint32_t label_count, uint32_t folds,
                                            uint64_t seed) {
  std::vector<std::vector<uint32_t>> by_label(label_count);
  for (size_t i = 0; i < labels.size(); ++i) {
    by_label[labels[i]].push_back(static_cast<uint32_t>(i));
  }
  std::mt19937_64 generator(seed);
  std::vector<uint32_t> fold(labels.size(), 0);
  uint64_t next = 0;  // position in one round-robin over all labels
  for (std::vector<uint32_t>& items : by_label) {
    Shuffle(&generator, items);
    for (uint32_t item : items) fold[item] = static_cast<uint32_t>(next++ % folds);
  }
  return fold;
}

}  // namespace chute
