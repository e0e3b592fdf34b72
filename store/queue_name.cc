#include "store/queue_name.h"

#include <unicode/uchar.h>
#include <unicode/utf8.h>

#include <string>

namespace chute {

namespace {

// The name as it can be shown on one line of well-formed UTF-8: the bytes
// of control characters (C0, DEL, C1), of U+2028 and U+2029, of ill-formed
// sequences, and backslashes, as \xNN escapes. U+0085 (a C1 control) and
// U+2028/U+2029 break lines like \n (Unicode Standard Annex #14, "Unicode
// Line Breaking Algorithm": classes NL and BK; recalled from memory).
std::string Printable(std::string_view name) {
  static const char kHex[] = "0123456789abcdef";
  std::string out;
  const auto* s = reinterpret_cast<const uint8_t*>(name.data());
  const auto n = static_cast<int32_t>(name.size());
  int32_t i = 0;
  while (i < n) {
    const int32_t start = i;
    UChar32 c;
    U8_NEXT(s, i, n, c);
    const bool escape = c < 0x20 || (c >= 0x7F && c <= 0x9F) || c == '\\' ||
                        c == 0x2028 || c == 0x2029;  // c < 0: ill-formed
    for (int32_t k = start; k < i; ++k) {
      if (escape) {
        out += "\\x";
        out += kHex[s[k] >> 4];
        out += kHex[s[k] & 15];
      } else {
        out += static_cast<char>(s[k]);
      }
    }
  }
  return out;
}

}  // namespace

Status ValidateQueueName(std::string_view name) {
  auto bad = [&](const char* why) {
    return Status::InvalidArgument("queue name '" + Printable(name) + "': " + why);
  };
  if (name.empty()) return Status::InvalidArgument("queue name is empty");
  if (name.size() > kMaxQueueNameBytes) return bad("longer than 100 bytes");
  if (name == "." || name == "..") return bad("'.' and '..' are not names");
  if (name.front() == '.') return bad("may not begin with '.'");
  if (name.front() == '_') return bad("names beginning with '_' are reserved for chute");
  if (name.front() == ' ' || name.back() == ' ') {
    return bad("may not begin or end with a space");
  }
  const auto* s = reinterpret_cast<const uint8_t*>(name.data());
  int32_t i = 0;
  const auto n = static_cast<int32_t>(name.size());
  while (i < n) {
    UChar32 c;
    U8_NEXT(s, i, n, c);
    if (c < 0) return bad("not valid UTF-8");
    if (c == '/' || c == '\\') return bad("may not contain '/' or '\\'");
    if (c < 0x20 || (c >= 0x7F && c <= 0x9F)) return bad("may not contain control characters");
    // Line and paragraph separators break lines; format characters (bidi
    // overrides and isolates, zero-width joiners) make a name look like
    // another one in a folder listing.
    const int8_t type = u_charType(c);
    if (type == U_LINE_SEPARATOR || type == U_PARAGRAPH_SEPARATOR || type == U_FORMAT_CHAR) {
      return bad("may not contain line separators or invisible format characters");
    }
  }
  return Status::Ok();
}

}  // namespace chute
