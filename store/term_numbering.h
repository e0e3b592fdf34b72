// Numbers distinct terms 0, 1, 2, ... in the order they are first met.
// Summing a correction looks up every term of every moved document (about
// 600,000 lookups for 10 % of the 100 MB benchmark corpus); a node-based
// std::unordered_map spent most of that time on cache misses, so this is an
// open-addressing table (linear probing, common practice) whose slots hold
// the hash and, for short terms, the term's bytes, so that a lookup mostly
// reads one slot.
#ifndef CHUTE_STORE_TERM_NUMBERING_H_
#define CHUTE_STORE_TERM_NUMBERING_H_

#include <cstdint>
#include <cstring>
#include <deque>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

namespace chute {

class TermNumbering {
 public:
  TermNumbering() { Rehash(1024); }

  // The term's number, made on first sight.
  uint32_t Number(std::string_view term) { return Number(term, Hash(term)); }

  // The same in two steps, for a caller that looks up many terms: Hash and
  // Prefetch each, then Number each, so that the table's cache misses
  // overlap instead of coming one after the other.
  static uint64_t Hash(std::string_view term) { return std::hash<std::string_view>{}(term); }
  void Prefetch(uint64_t hash) const { __builtin_prefetch(&slots_[hash & mask_]); }
  uint32_t Number(std::string_view term, uint64_t hash) {
    size_t i = hash & mask_;
    while (true) {
      Slot& slot = slots_[i];
      if (slot.number == kEmpty) break;
      if (slot.hash == hash && Same(slot, term)) return slot.number;
      i = (i + 1) & mask_;
    }
    const auto number = static_cast<uint32_t>(terms_.size());
    const std::string& kept = store_.emplace_back(term);
    terms_.push_back(&kept);
    Fill(&slots_[i], hash, number, kept);
    if (2 * terms_.size() > slots_.size()) Rehash(2 * slots_.size());
    return number;
  }

  size_t size() const { return terms_.size(); }
  // The term numbered n (the reference stays valid as terms are added).
  const std::string& term(uint32_t n) const { return *terms_[n]; }

 private:
  static constexpr uint32_t kEmpty = UINT32_MAX;
  static constexpr size_t kInline = 19;  // bytes of a term kept in its slot

  struct Slot {
    uint64_t hash = 0;
    uint32_t number = kEmpty;
    uint8_t length = 0;  // of the inline bytes; terms longer are compared whole
    char bytes[kInline] = {};
  };

  bool Same(const Slot& slot, std::string_view term) const {
    if (term.size() <= kInline) {
      return slot.length == term.size() && std::memcmp(slot.bytes, term.data(), term.size()) == 0;
    }
    return slot.length == kInline + 1 && *terms_[slot.number] == term;
  }

  static void Fill(Slot* slot, uint64_t hash, uint32_t number, std::string_view term) {
    slot->hash = hash;
    slot->number = number;
    if (term.size() <= kInline) {
      slot->length = static_cast<uint8_t>(term.size());
      std::memcpy(slot->bytes, term.data(), term.size());
    } else {
      slot->length = kInline + 1;  // compared through terms_
    }
  }

  void Rehash(size_t size) {  // REQUIRES: size a power of two
    std::vector<Slot> old;
    old.swap(slots_);
    slots_.assign(size, Slot());
    mask_ = size - 1;
    for (const Slot& slot : old) {
      if (slot.number == kEmpty) continue;
      size_t i = slot.hash & mask_;
      while (slots_[i].number != kEmpty) i = (i + 1) & mask_;
      slots_[i] = slot;
    }
  }

  std::vector<Slot> slots_;
  size_t mask_ = 0;
  std::deque<std::string> store_;          // the terms; a deque never moves them
  std::vector<const std::string*> terms_;  // by number
};

}  // namespace chute

#endif  // CHUTE_STORE_TERM_NUMBERING_H_
