#ifndef CHUTE_CLI_READ_UTF8_H_
#define CHUTE_CLI_READ_UTF8_H_

#include <cstdint>
#include <string>
#include <string_view>

namespace chute {

// Copies bytes into *out as well-formed UTF-8, each maximal ill-formed
// subsequence replaced by U+FFFD (Unicode Standard 15.0, §3.9, "U+FFFD
// Substitution of Maximal Subparts", as ICU's U8_NEXT finds them).
// Returns how many replacements were made.
int64_t ToValidUtf8(std::string_view bytes, std::string* out);

// True when bytes are well-formed UTF-8.
bool IsValidUtf8(std::string_view bytes);

}  // namespace chute

#endif  // CHUTE_CLI_READ_UTF8_H_
