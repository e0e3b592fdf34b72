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

bool DecodeTermCounts(std::string_view blob, std::vector<TermCount>* terms) {
  terms->clear();
  while (!blob.empty()) {
    uint64_t shared, suffix, count;
    if (!GetVarint(&blob, &shared) || !GetVarint(&blob, &suffix)) return false;
    if (suffix > blob.size()) return false;
    if (terms->empty() ? shared != 0 : shared > terms->back().first.size()) {
      return false;
    }
    std::string term = terms->empty() ? std::string()
                                      : terms->back().first.substr(0, shared);
    term.append(blob.substr(0, suffix));
    blob.remove_prefix(suffix);
    // Terms are sorted by bytes and distinct (std::string compares bytes as
    // unsigned char, as the encoder's callers sort them).
    if (!terms->empty() && term <= terms->back().first) return false;
    if (!GetVarint(&blob, &count) || count == 0 ||
        count > static_cast<uint64_t>(std::numeric_limits<int64_t>::max())) {
      return false;
    }
    terms->emplace_back(std::move(term), static_cast<int64_t>(count));
  }
  return true;
}

}  // namespace chute
