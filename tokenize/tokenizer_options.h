// Settings of the tokenizer. They are part of a model: fixed when a store is
// created and saved with it, because terms counted under one setting cannot
// be compared with terms counted under another.
#ifndef CHUTE_TOKENIZE_TOKENIZER_OPTIONS_H_
#define CHUTE_TOKENIZE_TOKENIZER_OPTIONS_H_

#include <cstdint>

namespace chute {

enum class NumberMode {
  kKeep,  // every number is a term of its own ("2026", "4.5")
  kFold,  // every number becomes the one term kNumberTerm, which the length
          // limits never drop; a segment with a letter ("v2", "A1") is a word
};

struct TokenizerOptions {
  // Terms shorter than this many code points (after NFKC case folding) are
  // dropped. REQUIRES: 1 <= min_length <= max_length.
  int32_t min_length = 1;
  // Terms longer than this many code points are dropped.
  int32_t max_length = 64;
  // What happens to numbers (segments ICU classifies as numeric).
  NumberMode numbers = NumberMode::kKeep;
  // Also emit word bigrams: each pair of adjacent kept terms joined by one
  // space (a character no term can hold), after the unigrams.
  bool bigrams = false;
};

// The single term every number becomes under NumberMode::kFold. Punctuation
// is never part of a term, so this cannot collide with a word.
inline constexpr char kNumberTerm[] = "<num>";

}  // namespace chute

#endif  // CHUTE_TOKENIZE_TOKENIZER_OPTIONS_H_
