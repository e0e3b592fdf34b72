#include "store/queue_name.h"

#include <unicode/utf8.h>

#include <string>

namespace chute {

namespace {

// The name as it can be shown on one line: control bytes and backslashes as
// \xNN escapes.
std::string Printable(std::string_view name) {
  static const char kHex[] = "0123456789abcdef";
  std::string out;
  for (char ch : name) {
    auto c = static_cast<unsigned char>(ch);
    if (c < 0x20 || c == 0x7F || c == '\\') {
      out += "\\x";
      out += kHex[c >> 4];
      out += kHex[c & 15];
    } else {
      out += ch;
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
  }
  return Status::Ok();
}

}  // namespace chute
