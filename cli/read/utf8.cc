#include "cli/read/utf8.h"

#include <unicode/utf8.h>

namespace chute {

namespace {

// Length of the longest prefix of bytes that is well-formed UTF-8.
size_t ValidPrefix(std::string_view bytes) {
  const auto* s = reinterpret_cast<const uint8_t*>(bytes.data());
  const size_t n = bytes.size();
  size_t i = 0;
  while (i < n) {
    if (s[i] < 0x80) {  // ASCII run: the common case
      ++i;
      continue;
    }
    int32_t j = static_cast<int32_t>(i);
    UChar32 c;
    U8_NEXT(s, j, static_cast<int32_t>(n), c);
    if (c < 0) return i;
    i = static_cast<size_t>(j);
  }
  return n;
}

}  // namespace

bool IsValidUtf8(std::string_view bytes) { return ValidPrefix(bytes) == bytes.size(); }

int64_t ToValidUtf8(std::string_view bytes, std::string* out) {
  out->clear();
  size_t valid = ValidPrefix(bytes);
  if (valid == bytes.size()) {
    out->assign(bytes);
    return 0;
  }
  out->reserve(bytes.size() + 16);
  int64_t replaced = 0;
  const auto* s = reinterpret_cast<const uint8_t*>(bytes.data());
  const auto n = static_cast<int32_t>(bytes.size());
  out->append(bytes.substr(0, valid));
  int32_t i = static_cast<int32_t>(valid);
  while (i < n) {
    int32_t start = i;
    UChar32 c;
    U8_NEXT(s, i, n, c);
    if (c < 0) {
      out->append("\xEF\xBF\xBD");  // U+FFFD
      ++replaced;
    } else {
      out->append(bytes.substr(static_cast<size_t>(start), static_cast<size_t>(i - start)));
    }
  }
  return replaced;
}

}  // namespace chute
