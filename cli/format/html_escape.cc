#include "cli/format/html_escape.h"

#include "cli/read/utf8.h"

namespace chute {

std::string HtmlEscape(std::string_view text) {
  std::string valid;
  if (!IsValidUtf8(text)) {
    ToValidUtf8(text, &valid);
    text = valid;
  }
  std::string out;
  out.reserve(text.size());
  for (char ch : text) {
    switch (ch) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&#39;"; break;
      default: {
        const auto c = static_cast<unsigned char>(ch);
        if ((c < 0x20 && c != '\t' && c != '\n') || c == 0x7F) {
          out += "\xEF\xBF\xBD";
        } else {
          out += ch;
        }
      }
    }
  }
  return out;
}

}  // namespace chute
