// Tests of queue-name validation (store/queue_name.h): a queue name becomes
// a folder name (DESIGN.md, "Non-negotiables").
#include "store/queue_name.h"

#include <gtest/gtest.h>
#include <unicode/utf8.h>

#include <cstdint>
#include <string>
#include <string_view>

namespace chute {
namespace {

struct Case {
  std::string name;
  bool valid;
};

std::string Repeat(std::string_view s, int times) {
  std::string out;
  for (int i = 0; i < times; ++i) out += s;
  return out;
}

// Printable form of a test name for failure messages.
std::string Escaped(std::string_view s) {
  std::string out;
  for (char ch : s) {
    auto c = static_cast<unsigned char>(ch);
    if (c < 0x20 || c >= 0x7F) {
      static const char kHex[] = "0123456789abcdef";
      out += "\\x";
      out += kHex[c >> 4];
      out += kHex[c & 15];
    } else {
      out += ch;
    }
  }
  return out;
}

// The message must be one line of well-formed UTF-8 with no control
// characters: C0 (which holds \n and \r), DEL, and C1 (which holds U+0085
// NEXT LINE, a line break in Unicode; UAX #14, class NL).
void ExpectOneLine(std::string_view message, std::string_view name) {
  const auto* p = reinterpret_cast<const uint8_t*>(message.data());
  const auto n = static_cast<int32_t>(message.size());
  for (int32_t i = 0; i < n;) {
    UChar32 c;
    U8_NEXT(p, i, n, c);
    ASSERT_GE(c, 0) << "ill-formed UTF-8 in the message for " << Escaped(name)
                    << ": " << Escaped(message);
    ASSERT_FALSE(c < 0x20 || (c >= 0x7F && c <= 0x9F))
        << "control character in the message for " << Escaped(name) << ": "
        << Escaped(message);
    // U+2028 LINE SEPARATOR and U+2029 PARAGRAPH SEPARATOR break lines too.
    ASSERT_FALSE(c == 0x2028 || c == 0x2029) << Escaped(message);
  }
}

TEST(QueueNameTest, AcceptsAndRefusesNames) {
  const Case cases[] = {
      // Valid.
      {"permits", true},
      {"berth-bookings", true},
      {"Zölle", true},
      {"日本", true},
      {"claims 2026", true},  // an inner space is fine
      {"a", true},
      {"a.b", true},  // a dot inside is fine
      {"x_", true},   // '_' only reserved at the start
      {std::string(100, 'q'), true},
      {Repeat("日", 33), true},  // 99 bytes
      // Empty and dot names.
      {"", false},
      {".", false},
      {"..", false},
      {".hidden", false},
      // Reserved for chute's own folders.
      {"_review", false},
      {"_", false},
      // Path separators.
      {"a/b", false},
      {"../x", false},
      {"/abs", false},
      {"a\\b", false},
      // Control characters: C0, DEL, C1.
      {"a\nb", false},
      {"a\tb", false},
      {"a\rb", false},
      {std::string("a\0b", 3), false},
      {"a\x7f", false},
      {"a\xc2\x85", false},  // U+0085 NEXT LINE
      {"a\xc2\x9f", false},  // U+009F
      // Too long: 101 bytes, and 34 three-byte characters (102 bytes).
      {std::string(101, 'q'), false},
      {Repeat("日", 34), false},
      // Ill-formed UTF-8.
      {"a\xff", false},
      {"caf\xc3", false},        // truncated sequence
      {"\xc0\xaf", false},       // overlong '/'
      {"x\xed\xa0\x80", false},  // encoded surrogate
      // Leading or trailing space.
      {" permits", false},
      {"permits ", false},
      {" ", false},
      // Invalid for its '/', with a line separator that the message must
      // not show raw.
      {"a/\u2028b", false},
      // Separators and invisible format characters (categories Zl, Zp, Cf).
      {"a\u2028b", false},
      {"a\u2029b", false},
      {"per\u202Emits", false},  // RIGHT-TO-LEFT OVERRIDE
      {"per\u2066mits", false},  // LEFT-TO-RIGHT ISOLATE
      {"per\u200Bmits", false},  // ZERO WIDTH SPACE
  };
  for (const Case& c : cases) {
    SCOPED_TRACE(Escaped(c.name));
    Status s = ValidateQueueName(c.name);
    EXPECT_EQ(s.ok(), c.valid) << s.message();
    if (!c.valid) {
      EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
      EXPECT_FALSE(s.message().empty());
      ExpectOneLine(s.message(), c.name);
    }
  }
}

TEST(QueueNameTest, MessageSaysWhy) {
  struct Why {
    std::string name;
    std::string_view reason;  // a part of the message
  };
  const Why cases[] = {
      {"", "empty"},
      {"..", "'.'"},
      {".hidden", "'.'"},
      {"_review", "reserved"},
      {"a/b", "'/'"},
      {"a\tb", "control"},
      {"a\xc2\x85", "control"},
      {std::string(101, 'q'), "100 bytes"},
      {"a\xff", "UTF-8"},
      {"permits ", "space"},
  };
  for (const Why& c : cases) {
    SCOPED_TRACE(Escaped(c.name));
    Status s = ValidateQueueName(c.name);
    ASSERT_FALSE(s.ok());
    EXPECT_NE(s.message().find(c.reason), std::string::npos) << s.message();
  }
}

TEST(QueueNameTest, MessageShowsUnprintableBytesEscaped) {
  struct Shown {
    std::string name;
    std::string_view shown;
  };
  const Shown cases[] = {
      {"bad\nname", "'bad\\x0aname'"},
      {"a\xc2\x85", "'a\\xc2\\x85'"},  // U+0085, as its two bytes
      {"a\xff", "'a\\xff'"},           // ill-formed byte
      {"a\\b", "'a\\x5cb'"},           // backslash
      {"日本/\xe2\x80\xa8", "'日本/\\xe2\\x80\\xa8'"},  // U+2028
  };
  for (const Shown& c : cases) {
    Status s = ValidateQueueName(c.name);
    ASSERT_FALSE(s.ok());
    EXPECT_NE(s.message().find(c.shown), std::string::npos)
        << Escaped(c.name) << ": " << s.message();
  }
}

}  // namespace
}  // namespace chute
