#ifndef CHUTE_CLI_FORMAT_HTML_ESCAPE_H_
#define CHUTE_CLI_FORMAT_HTML_ESCAPE_H_

#include <string>
#include <string_view>

namespace chute {

// Text made safe for HTML and SVG text and attribute values: & < > " '
// become character references (HTML Living Standard, §13.1.4 "Character
// references"); bytes that are not UTF-8 become U+FFFD; control
// characters other than tab and line feed become U+FFFD too, as XML 1.0
// does not allow them.
std::string HtmlEscape(std::string_view text);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_HTML_ESCAPE_H_
