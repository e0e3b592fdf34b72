// Checks chute's word segmentation against Unicode's own conformance data.
//
// Source: Unicode Standard Annex #29, "Unicode Text Segmentation", revision
// for Unicode 15.0 (Unicode Consortium, 2022), §4 "Word Boundaries", rules
// WB1-WB999; and its test file WordBreakTest.txt (WordBreakTest-15.0.0.txt,
// dated 2022-02-26), shipped by Debian's package unicode-data as
// /usr/share/unicode/auxiliary/WordBreakTest.txt. Each test line lists code
// points in hex with "÷" where the standard puts a word boundary and "×"
// where it does not.
//
// chute segments through chute::Segmenter::Split, which is ICU 72's word
// break iterator (ICU 72 implements Unicode 15.0). ICU applies CLDR's root
// tailoring of the word rules, so a few lines of the file knowingly come out
// differently. Those lines are listed in kKnownDifferences below, by line
// number and content, with ICU's boundaries and the reason; every other line
// must match the file exactly, and every listed line must still come out
// exactly as listed (so the list cannot silently rot in either direction).
#include <gtest/gtest.h>

#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <string_view>
#include <vector>

#include "tokenize/segmenter.h"

namespace chute {
namespace {

constexpr char kWordBreakTestPath[] =
    "/usr/share/unicode/auxiliary/WordBreakTest.txt";

// A line where ICU 72 (and so chute) knowingly departs from the file.
struct KnownDifference {
  int line;              // 1-based line number in WordBreakTest.txt
  const char* expected;  // the line's test part, as in the file
  const char* icu;       // the same code points with ICU's boundaries
  const char* reason;
};

// Why ICU differs. UAX #29 §4.1 gives U+003A COLON (and U+FE55 SMALL COLON,
// U+FF1A FULLWIDTH COLON) Word_Break=MidLetter, so rules WB6/WB7 keep
// "a:a" together as one word. The Unicode Common Locale Data Repository
// tailors this in its root segmentation rules (CLDR, common/segments/
// root.xml: $MidLetter = [\p{Word_Break = MidLetter} - [\: \uFE55 \uFF1A]]),
// because the colon joins words only in Swedish and Finnish abbreviations,
// and ICU builds its word rules from CLDR. So ICU breaks on both sides of a
// colon between letters ("a:a" is "a", ":", "a"). For chute this is the
// better behaviour: "subject:permits" yields the terms "subject" and
// "permits". (The CLDR rule is quoted from CLDR's published root.xml; the
// Swedish/Finnish motivation is recalled from memory.)
constexpr char kColonNotMidLetter[] =
    "CLDR root removes ':' (U+003A) from MidLetter, so WB6/WB7 do not hold "
    "letters together across a colon";

// Every line of WordBreakTest-15.0.0.txt on which ICU 72.1 (Debian libicu72
// 72.1-3) differs; found by running this test. All are WB6/WB7 across a
// colon.
const KnownDifference kKnownDifferences[] = {
    {1253, "÷ 0061 × 003A × 0041 ÷", "÷ 0061 ÷ 003A ÷ 0041 ÷",
     kColonNotMidLetter},
    {1254, "÷ 0061 × 003A × 0308 × 0041 ÷", "÷ 0061 ÷ 003A × 0308 ÷ 0041 ÷",
     kColonNotMidLetter},
    {1267, "÷ 0061 × 003A × 05D0 ÷", "÷ 0061 ÷ 003A ÷ 05D0 ÷",
     kColonNotMidLetter},
    {1268, "÷ 0061 × 003A × 0308 × 05D0 ÷", "÷ 0061 ÷ 003A × 0308 ÷ 05D0 ÷",
     kColonNotMidLetter},
    {1283, "÷ 0061 × 003A × 0061 × 2060 ÷", "÷ 0061 ÷ 003A ÷ 0061 × 2060 ÷",
     kColonNotMidLetter},
    {1284, "÷ 0061 × 003A × 0308 × 0061 × 2060 ÷",
     "÷ 0061 ÷ 003A × 0308 ÷ 0061 × 2060 ÷", kColonNotMidLetter},
    {1285, "÷ 0061 × 003A × 0061 ÷ 003A ÷", "÷ 0061 ÷ 003A ÷ 0061 ÷ 003A ÷",
     kColonNotMidLetter},
    {1286, "÷ 0061 × 003A × 0308 × 0061 ÷ 003A ÷",
     "÷ 0061 ÷ 003A × 0308 ÷ 0061 ÷ 003A ÷", kColonNotMidLetter},
    {1287, "÷ 0061 × 003A × 0061 ÷ 0027 ÷", "÷ 0061 ÷ 003A ÷ 0061 ÷ 0027 ÷",
     kColonNotMidLetter},
    {1288, "÷ 0061 × 003A × 0308 × 0061 ÷ 0027 ÷",
     "÷ 0061 ÷ 003A × 0308 ÷ 0061 ÷ 0027 ÷", kColonNotMidLetter},
    {1289, "÷ 0061 × 003A × 0061 ÷ 0027 × 2060 ÷",
     "÷ 0061 ÷ 003A ÷ 0061 ÷ 0027 × 2060 ÷", kColonNotMidLetter},
    {1290, "÷ 0061 × 003A × 0308 × 0061 ÷ 0027 × 2060 ÷",
     "÷ 0061 ÷ 003A × 0308 ÷ 0061 ÷ 0027 × 2060 ÷", kColonNotMidLetter},
    {1291, "÷ 0061 × 003A × 0061 ÷ 002C ÷", "÷ 0061 ÷ 003A ÷ 0061 ÷ 002C ÷",
     kColonNotMidLetter},
    {1292, "÷ 0061 × 003A × 0308 × 0061 ÷ 002C ÷",
     "÷ 0061 ÷ 003A × 0308 ÷ 0061 ÷ 002C ÷", kColonNotMidLetter},
    {1712, "÷ 0041 × 003A × 0041 ÷", "÷ 0041 ÷ 003A ÷ 0041 ÷",
     kColonNotMidLetter},
};

// One parsed test line: the code points and, for each of the size()+1
// positions between them, whether the file puts a boundary there.
struct TestCase {
  int line = 0;
  std::string text;  // the test part of the line, before '#', trimmed
  std::vector<char32_t> code_points;
  std::vector<bool> breaks;
};

std::string Trim(std::string_view s) {
  const char* ws = " \t\r\n";
  size_t b = s.find_first_not_of(ws);
  if (b == std::string_view::npos) return "";
  size_t e = s.find_last_not_of(ws);
  return std::string(s.substr(b, e - b + 1));
}

// Parses "÷ 0041 × 0308 ÷" into a TestCase. Returns false (with *error set)
// for a line that does not follow the file's format.
bool ParseLine(int number, std::string_view raw, TestCase* out,
               std::string* error) {
  out->line = number;
  out->text = Trim(raw.substr(0, raw.find('#')));
  out->code_points.clear();
  out->breaks.clear();
  std::istringstream in(out->text);
  std::string token;
  bool expect_marker = true;
  while (in >> token) {
    if (expect_marker) {
      if (token == "\u00F7") {
        out->breaks.push_back(true);
      } else if (token == "\u00D7") {
        out->breaks.push_back(false);
      } else {
        *error = "expected \u00F7 or \u00D7, found '" + token + "'";
        return false;
      }
    } else {
      char* end = nullptr;
      unsigned long cp = std::strtoul(token.c_str(), &end, 16);
      if (end == token.c_str() || *end != '\0' || cp > 0x10FFFF) {
        *error = "bad code point '" + token + "'";
        return false;
      }
      out->code_points.push_back(static_cast<char32_t>(cp));
    }
    expect_marker = !expect_marker;
  }
  if (out->code_points.empty() || expect_marker ||
      out->breaks.size() != out->code_points.size() + 1) {
    *error = "line does not alternate markers and code points";
    return false;
  }
  return true;
}

// Runs chute's segmenter over the code points and returns, for each of the
// size()+1 positions between code points, whether it found a boundary.
std::vector<bool> ChuteBreaks(Segmenter* segmenter,
                              const std::vector<char32_t>& code_points) {
  std::u16string text;
  std::map<int32_t, size_t> offset_of_position;
  for (size_t i = 0; i < code_points.size(); ++i) {
    offset_of_position[static_cast<int32_t>(text.size())] = i;
    char32_t cp = code_points[i];
    if (cp >= 0x10000) {
      cp -= 0x10000;
      text.push_back(static_cast<char16_t>(0xD800 + (cp >> 10)));
      text.push_back(static_cast<char16_t>(0xDC00 + (cp & 0x3FF)));
    } else {
      text.push_back(static_cast<char16_t>(cp));
    }
  }
  offset_of_position[static_cast<int32_t>(text.size())] = code_points.size();

  std::vector<Segment> segments;
  segmenter->Split(text, &segments);
  std::vector<bool> breaks(code_points.size() + 1, false);
  breaks[0] = true;  // the start of text (WB1), always
  // Split's contract: the segments cover the text, in order, without gaps.
  int32_t covered = 0;
  for (const Segment& seg : segments) {
    EXPECT_EQ(seg.begin, covered) << "segments leave a gap or overlap";
    EXPECT_LT(seg.begin, seg.end) << "empty segment";
    covered = seg.end;
  }
  EXPECT_EQ(covered, static_cast<int32_t>(text.size()))
      << "segments do not reach the end of the text";
  for (const Segment& seg : segments) {
    auto it = offset_of_position.find(seg.end);
    // A boundary inside a surrogate pair cannot be expressed in the file's
    // terms (it splits a code point): a failure of its own.
    if (it == offset_of_position.end()) {
      ADD_FAILURE() << "segment ends inside a surrogate pair at UTF-16 offset "
                    << seg.end;
      continue;
    }
    breaks[it->second] = true;
  }
  return breaks;
}

// The same code points written in the file's notation with the given breaks.
std::string Render(const std::vector<char32_t>& code_points,
                   const std::vector<bool>& breaks) {
  std::string s;
  for (size_t i = 0; i <= code_points.size(); ++i) {
    s += breaks[i] ? "\u00F7" : "\u00D7";
    if (i == code_points.size()) break;
    char hex[16];
    std::snprintf(hex, sizeof hex, " %04X ",
                  static_cast<unsigned>(code_points[i]));
    s += hex;
  }
  return s;
}

TEST(WordBreakTest, MatchesUnicodeWordBreakTestExceptKnownDifferences) {
  std::ifstream file(kWordBreakTestPath);
  if (!file) {
    GTEST_SKIP() << kWordBreakTestPath
                 << " is absent: install Debian's unicode-data package "
                    "(make test does) to run this check";
  }

  std::map<int, const KnownDifference*> known;
  for (const KnownDifference& k : kKnownDifferences) {
    ASSERT_TRUE(known.emplace(k.line, &k).second)
        << "line " << k.line << " is listed twice in kKnownDifferences";
  }
  std::set<int> known_seen;

  Segmenter segmenter;
  std::string raw;
  int number = 0;
  int cases = 0;
  int matched = 0;
  while (std::getline(file, raw)) {
    ++number;
    if (Trim(raw.substr(0, raw.find('#'))).empty()) continue;  // comment
    TestCase tc;
    std::string error;
    ASSERT_TRUE(ParseLine(number, raw, &tc, &error))
        << kWordBreakTestPath << ":" << number << ": " << error;
    ++cases;
    const std::vector<bool> got = ChuteBreaks(&segmenter, tc.code_points);
    const std::string got_text = Render(tc.code_points, got);

    auto k = known.find(number);
    if (k == known.end()) {
      EXPECT_EQ(got, tc.breaks)
          << kWordBreakTestPath << ":" << number << "\n  file:  " << tc.text
          << "\n  chute: " << got_text << "\n  line:  " << raw;
      if (got == tc.breaks) ++matched;
      continue;
    }
    // A listed difference: the line must be the one we wrote down, it must
    // still differ from the file, and chute must give ICU's boundaries.
    known_seen.insert(number);
    EXPECT_EQ(tc.text, k->second->expected)
        << "known difference at line " << number
        << " no longer names this line of the file";
    EXPECT_NE(got, tc.breaks)
        << "line " << number << " is listed as a known difference ("
        << k->second->reason << ") but now matches the file; remove it from "
        << "kKnownDifferences";
    EXPECT_EQ(got_text, k->second->icu)
        << "line " << number << " differs from the file, but not as listed ("
        << k->second->reason << ")";
  }
  for (const KnownDifference& k : kKnownDifferences) {
    EXPECT_TRUE(known_seen.count(k.line))
        << "known difference at line " << k.line << " is not a test line";
  }
  // WordBreakTest-15.0.0.txt has 1823 test lines; a much smaller count means
  // the file was not parsed as intended.
  EXPECT_GT(cases, 1800);
  std::printf("WordBreakTest.txt: %d lines, %d match, %zu known differences\n",
              cases, matched, known_seen.size());
}

}  // namespace
}  // namespace chute
