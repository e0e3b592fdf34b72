// Text to terms: the tokenizer every command uses, for learning and routing
// alike, so that a document is always seen the same way.
//
// Steps, in order (DESIGN.md, "Data flow"):
//   1. UTF-8 to UTF-16; ill-formed bytes become U+FFFD (the reader has
//      already reported them).
//   2. Segmentation by Segmenter (UAX #29 word boundaries, ICU 72).
//   3. Segments that are not words or numbers (spaces, punctuation,
//      symbols) are dropped.
//   4. NFKC case folding (Unicode NFKC_Casefold, UAX #15 / UAX #44): width,
//      compatibility forms and case are folded, so "Straße", "STRASSE" and
//      "ｓｔｒａｓｓｅ" are one term.
//   5. Numbers are kept or folded to kNumberTerm; terms outside
//      [min_length, max_length] code points are dropped.
//   6. With bigrams on, each pair of adjacent kept terms, joined by a space,
//      is added after the unigrams.
#ifndef CHUTE_TOKENIZE_TOKENIZER_H_
#define CHUTE_TOKENIZE_TOKENIZER_H_

#include <string>
#include <string_view>
#include <vector>

#include "tokenize/segmenter.h"
#include "tokenize/tokenizer_options.h"

#include <unicode/uversion.h>

U_NAMESPACE_BEGIN
class Normalizer2;
U_NAMESPACE_END

namespace chute {

class Tokenizer {
 public:
  // REQUIRES: options.min_length >= 1, options.min_length <= max_length.
  explicit Tokenizer(const TokenizerOptions& options);
  Tokenizer(const Tokenizer&) = delete;  // owns a Segmenter
  Tokenizer& operator=(const Tokenizer&) = delete;

  // Replaces *terms with the terms of text, in document order (unigrams,
  // then bigrams when on). Not thread-safe; reuses internal buffers.
  void Tokenize(std::string_view utf8_text, std::vector<std::string>* terms);

  const TokenizerOptions& options() const { return options_; }

 private:
  // Appends the folded form of text_[seg] to *terms when it is kept.
  void EmitSegment(const Segment& seg, std::vector<std::string>* terms);

  TokenizerOptions options_;
  Segmenter segmenter_;
  const icu::Normalizer2* nfkc_casefold_;  // owned by ICU, never freed
  std::u16string text_;                    // reused UTF-16 buffer
  std::vector<Segment> segments_;          // reused segment buffer
};

}  // namespace chute

#endif  // CHUTE_TOKENIZE_TOKENIZER_H_
