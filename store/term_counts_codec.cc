#include "store/term_counts_codec.h"

#include <algorithm>
#include <limits>

namespace chute {

namespace {

void PutVarint(uint64_t v, std::string* out) {
  while (v >= 0x80) {
    out->push_back(static_cast<char>((v & 0x7F) | 0x80));
    v >>= 7;
  }
  out->push_back(static_cast<char>(v));
}

bool GetVarint(std::string_view* in, uint64_t* v) {
  *v = 0;
  for (int shift = 0; shift < 64 && !in->empty(); shift += 7) {
    auto byte = static_cast<uint8_t>(in->front());
    in->remove_prefix(1);
    // The tenth byte carries only bit 63; anything more does not fit.
    if (shift == 63 && (byte & 0x7F) > 1) return false;
    *v |= static_cast<uint64_t>(byte & 0x7F) << shift;
    if ((byte & 0x80) == 0) return true;
  }
  return false;
}

template <typename Pairs>
std::string Encode(const Pairs& terms) {
  std::string out;
  std::string_view previous;
  for (const auto& [term, count] : terms) {
    size_t shared = 0;
    size_t limit = std::min(previous.size(), term.size());
    while (shared < limit && previous[shared] == term[shared]) ++shared;
    PutVarint(shared, &out);
    PutVarint(term.size() - shared, &out);
    out.append(term, shared);
    PutVarint(static_cast<uint64_t>(count), &out);
    previous = term;
  }
  return out;
}

}  // namespace

std::string EncodeTermCounts(const std::vector<TermCount>& terms) { return Encode(terms); }

std::string EncodeTermCounts(const std::vector<std::pair<std::string_view, int64_t>>& terms) {
  return Encode(terms);
}

bool TermCountsReader::Next(std::string_view* term, int64_t* n) {
  if (!ok_ || rest_.empty()) return false;
  ok_ = false;  // until the entry has proved whole
  uint64_t shared, suffix, count;
  if (!GetVarint(&rest_, &shared) || !GetVarint(&rest_, &suffix)) return false;
  if (suffix > rest_.size()) return false;
  if (first_ ? shared != 0 : shared > term_.size()) return false;
  // Terms are sorted by bytes and distinct (std::string compares bytes as
  // unsigned char, as the encoder's callers sort them): the new term is
  // greater than the previous one, which shares its first `shared` bytes.
  const std::string_view added = rest_.substr(0, suffix);
  if (!first_) {
    const std::string_view old_rest = std::string_view(term_).substr(shared);
    if (added <= old_rest) return false;
  }
  term_.resize(shared);
  term_.append(added);
  rest_.remove_prefix(suffix);
  if (!GetVarint(&rest_, &count) || count == 0 ||
      count > static_cast<uint64_t>(std::numeric_limits<int64_t>::max())) {
    return false;
  }
  first_ = false;
  ok_ = true;
  *term = term_;
  *n = static_cast<int64_t>(count);
  return true;
}

bool DecodeTermCounts(std::string_view blob, std::vector<TermCount>* terms) {
  terms->clear();
  TermCountsReader reader(blob);
  std::string_view term;
  int64_t n = 0;
  while (reader.Next(&term, &n)) terms->emplace_back(std::string(term), n);
  return reader.ok();
}

}  // namespace chute
