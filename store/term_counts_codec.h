// The compact encoding of one document's term counts, stored in the ledger
// as one blob per document.
//
// Terms are sorted by their bytes and front-coded: each entry is
//   varint(bytes shared with the previous term) varint(suffix length)
//   suffix bytes  varint(count)
// with LEB128 varints (common practice; as in Protocol Buffers and SQLite4).
#ifndef CHUTE_STORE_TERM_COUNTS_CODEC_H_
#define CHUTE_STORE_TERM_COUNTS_CODEC_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace chute {

using TermCount = std::pair<std::string, int64_t>;

// REQUIRES: terms sorted by bytes and distinct; counts > 0.
std::string EncodeTermCounts(const std::vector<TermCount>& terms);
// The same, for terms held elsewhere (the views must stay valid during the
// call).
std::string EncodeTermCounts(const std::vector<std::pair<std::string_view, int64_t>>& terms);

// Returns false when the blob is malformed: a varint cut short or wider
// than 64 bits, a shared prefix longer than the previous term, a suffix past
// the end, a count of 0 or above INT64_MAX, or terms that are not sorted by
// bytes and distinct.
bool DecodeTermCounts(std::string_view blob, std::vector<TermCount>* terms);

// Reads a blob's entries one at a time without a string per term (for
// callers that sum many documents). The blob must outlive the reader; a
// term's view lasts until the next call of Next.
//   TermCountsReader reader(blob);
//   std::string_view term; int64_t n;
//   while (reader.Next(&term, &n)) ...;
//   if (!reader.ok()) ...malformed (as DecodeTermCounts says)...
class TermCountsReader {
 public:
  explicit TermCountsReader(std::string_view blob) : rest_(blob) {}
  // False at the end of the blob, or when it is malformed (then ok() is false).
  bool Next(std::string_view* term, int64_t* n);
  bool ok() const { return ok_; }

 private:
  std::string_view rest_;
  std::string term_;
  bool first_ = true;
  bool ok_ = true;
};

}  // namespace chute

#endif  // CHUTE_STORE_TERM_COUNTS_CODEC_H_
