#include "classify/term_index.h"

#include <cstring>

namespace chute {

uint64_t TermIndex::Hash(std::string_view s) {
  // FNV-1a over 8-byte words, then a final avalanche (the finaliser of
  // MurmurHash3's fmix64; common practice).
  uint64_t h = 0xcbf29ce484222325ULL ^ s.size();
  size_t i = 0;
  for (; i + 8 <= s.size(); i += 8) {
    uint64_t w;
    std::memcpy(&w, s.data() + i, 8);
    h = (h ^ w) * 0x100000001b3ULL;
  }
  uint64_t tail = 0;
  if (i < s.size()) std::memcpy(&tail, s.data() + i, s.size() - i);
  h = (h ^ tail) * 0x100000001b3ULL;
  h ^= h >> 33;
  h *= 0xff51afd7ed558ccdULL;
  h ^= h >> 33;
  h *= 0xc4ceb9fe1a85ec53ULL;
  h ^= h >> 33;
  return h;
}

int64_t TermIndex::Find(std::string_view term) const {
  const uint64_t h = Hash(term);
  const auto tag = static_cast<uint32_t>(h >> 32);
  const size_t mask = slots_.size() - 1;
  for (size_t i = h & mask;; i = (i + 1) & mask) {
    const Slot& s = slots_[i];
    if (s.id == 0) return -1;
    if (s.hash == tag && this->term(s.id - 1) == term) return s.id - 1;
  }
}

uint32_t TermIndex::Insert(std::string_view term) {
  if (2 * (size() + 1) > slots_.size()) Rehash(slots_.size() * 2);
  const uint64_t h = Hash(term);
  const auto tag = static_cast<uint32_t>(h >> 32);
  const size_t mask = slots_.size() - 1;
  size_t i = h & mask;
  for (;; i = (i + 1) & mask) {
    const Slot& s = slots_[i];
    if (s.id == 0) break;
    if (s.hash == tag && this->term(s.id - 1) == term) return s.id - 1;
  }
  const auto id = static_cast<uint32_t>(size());
  bytes_.append(term);
  offsets_.push_back(bytes_.size());
  slots_[i] = {tag, id + 1};
  return id;
}

void TermIndex::Reserve(size_t n, size_t bytes) {
  offsets_.reserve(n + 1);
  bytes_.reserve(bytes);
  size_t want = 16;
  while (want < 2 * n) want *= 2;
  if (want > slots_.size()) Rehash(want);
}

void TermIndex::Rehash(size_t slots) {
  std::vector<Slot> old = std::move(slots_);
  slots_.assign(slots, Slot());
  const size_t mask = slots - 1;
  for (uint32_t id = 0; id < size(); ++id) {
    const uint64_t h = Hash(term(id));
    size_t i = h & mask;
    while (slots_[i].id != 0) i = (i + 1) & mask;
    slots_[i] = {static_cast<uint32_t>(h >> 32), id + 1};
  }
}

}  // namespace chute
