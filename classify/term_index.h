// A compact map from term text to a dense id (0, 1, 2, ... in order of
// insertion): open addressing with linear probing over one array of slots,
// the terms' bytes kept in one buffer. Looking a term up touches one slot
// (its hash, checked before the bytes are compared) and the bytes, where a
// node-based std::unordered_map<std::string, ...> follows three pointers.
// The hot path of learning and routing is this lookup.
#ifndef CHUTE_CLASSIFY_TERM_INDEX_H_
#define CHUTE_CLASSIFY_TERM_INDEX_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace chute {

class TermIndex {
 public:
  TermIndex() { Rehash(16); }

  // The id of term, or -1 when it is not in the index.
  int64_t Find(std::string_view term) const;
  // The id of term, adding it with the next id when it is new.
  uint32_t Insert(std::string_view term);

  size_t size() const { return offsets_.size() - 1; }
  std::string_view term(uint32_t id) const {
    return std::string_view(bytes_).substr(offsets_[id], offsets_[id + 1] - offsets_[id]);
  }
  // Makes room for n terms holding about `bytes` bytes in all.
  void Reserve(size_t n, size_t bytes);

 private:
  struct Slot {
    uint32_t hash = 0;  // high bits of the term's hash
    uint32_t id = 0;    // id + 1; 0 marks an empty slot
  };
  static uint64_t Hash(std::string_view s);
  void Rehash(size_t slots);

  std::vector<Slot> slots_;     // a power of two in size, at most 1/2 full
  std::vector<uint64_t> offsets_ = {0};  // term i is bytes_[offsets_[i], offsets_[i+1])
  std::string bytes_;
};

}  // namespace chute

#endif  // CHUTE_CLASSIFY_TERM_INDEX_H_
