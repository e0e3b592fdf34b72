// Word segmentation: the one entry point through which chute splits text.
//
// The reference is ICU 72's word break iterator, which implements the word
// boundary rules of Unicode Standard Annex #29 ("Unicode Text Segmentation",
// Unicode 15.0) and adds dictionary-based segmentation for Thai, Lao,
// Khmer, Burmese, Chinese and Japanese. Later fast paths must keep exactly
// these boundaries (tests/reference/word_break_test.cc checks them against
// Unicode's WordBreakTest.txt).
#ifndef CHUTE_TOKENIZE_SEGMENTER_H_
#define CHUTE_TOKENIZE_SEGMENTER_H_

#include <cstdint>
#include <memory>
#include <string_view>
#include <vector>

#include <unicode/uversion.h>

U_NAMESPACE_BEGIN
class BreakIterator;
U_NAMESPACE_END

namespace chute {

// What ICU's rule status says a segment is.
enum class SegmentKind : uint8_t {
  kNone,    // spaces, punctuation, symbols: never a term
  kNumber,  // digits, possibly with separators ("4.5", "1,000")
  kLetter,  // letters (alphabetic words)
  kKana,    // hiragana / katakana
  kIdeo,    // ideographs
};

// One segment of a UTF-16 text: [begin, end) in UTF-16 code units.
struct Segment {
  int32_t begin;
  int32_t end;
  SegmentKind kind;
};

// Splits text into segments after UAX #29. Not thread-safe: keep one per
// thread. Construction is costly (ICU loads its rules and dictionaries);
// reuse an instance across documents.
class Segmenter {
 public:
  Segmenter();
  ~Segmenter();
  Segmenter(const Segmenter&) = delete;  // owns an ICU iterator
  Segmenter& operator=(const Segmenter&) = delete;

  // Replaces *out with the segments of text, in order, covering all of it.
  // The text must stay alive only during the call.
  void Split(std::u16string_view text, std::vector<Segment>* out);

 private:
  std::unique_ptr<icu::BreakIterator> iterator_;
};

}  // namespace chute

#endif  // CHUTE_TOKENIZE_SEGMENTER_H_
