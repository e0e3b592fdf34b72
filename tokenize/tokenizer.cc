#include "tokenize/tokenizer.h"

#include <unicode/normalizer2.h>
#include <unicode/uchar.h>
#include <unicode/unistr.h>
#include <unicode/ustring.h>
#include <unicode/utf16.h>

#include <stdexcept>

namespace chute {

namespace {

// Number of code points in a UTF-16 string.
int32_t CodePoints(std::u16string_view s) {
  int32_t n = 0;
  for (char16_t c : s) n += U16_IS_TRAIL(c) ? 0 : 1;
  return n;
}

// ICU gives "v2" and "A1" the number status (their last character is a
// digit); they are names, not numbers, so they are never folded.
bool HasLetter(std::u16string_view s) {
  for (size_t i = 0; i < s.size();) {
    UChar32 c;
    U16_NEXT(s.data(), i, s.size(), c);
    if (u_isalpha(c)) return true;
  }
  return false;
}

bool IsAscii(std::u16string_view s) {
  for (char16_t c : s) {
    if (c >= 0x80) return false;
  }
  return true;
}

// UTF-16 (well-formed after normalization) to UTF-8, appended to *out.
void AppendUtf8(std::u16string_view s, std::string* out) {
  icu::UnicodeString(false, s.data(), static_cast<int32_t>(s.size()))
      .toUTF8String(*out);
}

}  // namespace

Tokenizer::Tokenizer(const TokenizerOptions& options) : options_(options) {
  UErrorCode status = U_ZERO_ERROR;
  nfkc_casefold_ = icu::Normalizer2::getNFKCCasefoldInstance(status);
  if (U_FAILURE(status)) {
    throw std::runtime_error(std::string("ICU NFKC_Casefold: ") +
                             u_errorName(status));
  }
}

void Tokenizer::Tokenize(std::string_view utf8_text,
                         std::vector<std::string>* terms) {
  terms->clear();
  // UTF-8 to UTF-16 with U+FFFD for ill-formed bytes.
  text_.resize(utf8_text.size() + 1);  // UTF-16 never needs more units
  int32_t length = 0;
  int32_t substitutions = 0;
  UErrorCode status = U_ZERO_ERROR;
  u_strFromUTF8WithSub(reinterpret_cast<UChar*>(text_.data()),
                       static_cast<int32_t>(text_.size()), &length,
                       utf8_text.data(),
                       static_cast<int32_t>(utf8_text.size()), 0xFFFD,
                       &substitutions, &status);
  if (U_FAILURE(status)) {
    throw std::runtime_error(std::string("UTF-8 to UTF-16: ") +
                             u_errorName(status));
  }
  text_.resize(static_cast<size_t>(length));

  segmenter_.Split(text_, &segments_);
  for (const Segment& seg : segments_) {
    if (seg.kind != SegmentKind::kNone) EmitSegment(seg, terms);
  }

  if (options_.bigrams && terms->size() > 1) {
    const size_t unigrams = terms->size();
    terms->reserve(unigrams * 2 - 1);
    for (size_t i = 0; i + 1 < unigrams; ++i) {
      std::string bigram;
      bigram.reserve((*terms)[i].size() + 1 + (*terms)[i + 1].size());
      bigram.append((*terms)[i]).push_back(' ');
      bigram.append((*terms)[i + 1]);
      terms->push_back(std::move(bigram));
    }
  }
}

void Tokenizer::EmitSegment(const Segment& seg,
                            std::vector<std::string>* terms) {
  std::u16string_view raw(text_.data() + seg.begin,
                          static_cast<size_t>(seg.end - seg.begin));
  if (seg.kind == SegmentKind::kNumber &&
      options_.numbers == NumberMode::kFold && !HasLetter(raw)) {
    terms->emplace_back(kNumberTerm);
    return;
  }
  std::string term;
  int32_t code_points = 0;
  if (IsAscii(raw)) {
    // ASCII is stable under NFKC; case folding only maps A-Z to a-z.
    term.resize(raw.size());
    for (size_t i = 0; i < raw.size(); ++i) {
      char c = static_cast<char>(raw[i]);
      term[i] = (c >= 'A' && c <= 'Z') ? static_cast<char>(c + ('a' - 'A')) : c;
    }
    code_points = static_cast<int32_t>(raw.size());
  } else {
    UErrorCode status = U_ZERO_ERROR;
    icu::UnicodeString folded = nfkc_casefold_->normalize(
        icu::UnicodeString(false, raw.data(), static_cast<int32_t>(raw.size())),
        status);
    if (U_FAILURE(status)) return;  // cannot happen on valid UTF-16
    std::u16string_view view(folded.getBuffer(),
                             static_cast<size_t>(folded.length()));
    code_points = CodePoints(view);
    AppendUtf8(view, &term);
  }
  if (code_points < options_.min_length || code_points > options_.max_length) {
    return;
  }
  terms->push_back(std::move(term));
}

}  // namespace chute
