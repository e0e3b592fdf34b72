#include "tokenize/segmenter.h"

#include <unicode/brkiter.h>
#include <unicode/locid.h>
#include <unicode/utext.h>

#include <stdexcept>
#include <string>

namespace chute {

namespace {

// Rule-status ranges of ICU's word break iterator (unicode/ubrk.h).
SegmentKind KindOfStatus(int32_t status) {
  if (status >= UBRK_WORD_IDEO) return SegmentKind::kIdeo;
  if (status >= UBRK_WORD_KANA) return SegmentKind::kKana;
  if (status >= UBRK_WORD_LETTER) return SegmentKind::kLetter;
  if (status >= UBRK_WORD_NUMBER) return SegmentKind::kNumber;
  return SegmentKind::kNone;
}

}  // namespace

Segmenter::Segmenter() {
  UErrorCode status = U_ZERO_ERROR;
  iterator_.reset(
      icu::BreakIterator::createWordInstance(icu::Locale::getRoot(), status));
  if (U_FAILURE(status) || iterator_ == nullptr) {
    throw std::runtime_error(std::string("ICU word break iterator: ") +
                             u_errorName(status));
  }
}

Segmenter::~Segmenter() = default;

void Segmenter::Split(std::u16string_view text, std::vector<Segment>* out) {
  out->clear();
  if (text.empty()) return;
  UErrorCode status = U_ZERO_ERROR;
  UText ut = UTEXT_INITIALIZER;
  utext_openUChars(&ut, text.data(), static_cast<int64_t>(text.size()),
                   &status);
  iterator_->setText(&ut, status);
  if (U_FAILURE(status)) {
    utext_close(&ut);
    throw std::runtime_error(std::string("ICU setText: ") +
                             u_errorName(status));
  }
  int32_t begin = iterator_->first();
  for (int32_t end = iterator_->next(); end != icu::BreakIterator::DONE;
       begin = end, end = iterator_->next()) {
    out->push_back({begin, end, KindOfStatus(iterator_->getRuleStatus())});
  }
  utext_close(&ut);
}

}  // namespace chute
