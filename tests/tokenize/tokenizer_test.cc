// Tests of tokenize/: the Segmenter (UAX #29 word boundaries through ICU 72)
// and the Tokenizer (segments to folded terms).
//
// Where an expected term comes from a Unicode data file or rule, the source
// is named beside the case. Results of ICU's dictionary segmentation
// (Chinese, Japanese, Thai) were observed with ICU 72.1 (Debian 12,
// libicu72 72.1-3) and are the reference: a later fast path must give the
// same terms.
#include "tokenize/tokenizer.h"

#include <gtest/gtest.h>
#include <unicode/utf16.h>
#include <unicode/utf8.h>

#include <cstdint>
#include <random>
#include <string>
#include <string_view>
#include <vector>

#include "tokenize/segmenter.h"
#include "tokenize/tokenizer_options.h"

namespace chute {
namespace {

using Terms = std::vector<std::string>;

struct Case {
  std::string input;
  TokenizerOptions options;
  Terms expected;
};

// Tokenizes every case with a fresh Tokenizer and compares the terms.
void ExpectTerms(const std::vector<Case>& cases) {
  for (const Case& c : cases) {
    Tokenizer tokenizer(c.options);
    Terms terms;
    tokenizer.Tokenize(c.input, &terms);
    EXPECT_EQ(terms, c.expected) << "input: \"" << c.input << "\"";
  }
}

// True when s is well-formed UTF-8 (ICU's U8_NEXT rejects ill-formed,
// overlong and surrogate sequences).
bool IsValidUtf8(std::string_view s) {
  const auto* p = reinterpret_cast<const uint8_t*>(s.data());
  const auto n = static_cast<int32_t>(s.size());
  for (int32_t i = 0; i < n;) {
    UChar32 c;
    U8_NEXT(p, i, n, c);
    if (c < 0) return false;
  }
  return true;
}

int32_t CodePointsOf(std::string_view s) {
  const auto* p = reinterpret_cast<const uint8_t*>(s.data());
  const auto n = static_cast<int32_t>(s.size());
  int32_t count = 0;
  for (int32_t i = 0; i < n; ++count) {
    UChar32 c;
    U8_NEXT(p, i, n, c);
  }
  return count;
}

const TokenizerOptions kDefault{};
const TokenizerOptions kFold{.numbers = NumberMode::kFold};
const TokenizerOptions kBigrams{.bigrams = true};

TEST(TokenizerTest, AsciiWordsAreLowercased) {
  ExpectTerms({
      {"Hello World", kDefault, {"hello", "world"}},
      {"PERMIT permit Permit", kDefault, {"permit", "permit", "permit"}},
      {"x_y", kDefault, {"x_y"}},  // '_' is ExtendNumLet (UAX #29, WB13a/b)
  });
}

TEST(TokenizerTest, PunctuationAndSpacesAreDropped) {
  ExpectTerms({
      {"Hello, World!", kDefault, {"hello", "world"}},
      {"  tabs\tand\nnewlines\r\n ", kDefault, {"tabs", "and", "newlines"}},
      {"(quoted) \"words\" -- [here]; {there}?",
       kDefault,
       {"quoted", "words", "here", "there"}},
      // A hyphen is not MidLetter in UAX #29, so it splits (WB999).
      {"foo-bar", kDefault, {"foo", "bar"}},
      {"... ,,, !!! ???", kDefault, {}},
  });
}

TEST(TokenizerTest, NfkcCaseFoldingJoinsVariantsOfOneWord) {
  ExpectTerms({
      // Full case folding maps U+00DF to "ss" (Unicode CaseFolding.txt,
      // "00DF; F; 0073 0073"; recalled from memory, confirmed here by ICU).
      {"Straße STRASSE strasse", kDefault, {"strasse", "strasse", "strasse"}},
      // Fullwidth forms decompose to ASCII under NFKC (UAX #15, <wide>).
      {"ＡＢＣ", kDefault, {"abc"}},
      {"ｓｔｒａｓｓｅ", kDefault, {"strasse"}},
      // U+FB01 LATIN SMALL LIGATURE FI is <compat> 0066 0069 (UAX #15).
      {"ﬁle", kDefault, {"file"}},
      // U+01C4..U+01C6 (DŽ, Dž, dž) all fold to "dž" (NFKC then case fold).
      {"Ǆ ǅ ǆ", kDefault, {"dž", "dž", "dž"}},
      // U+216B ROMAN NUMERAL TWELVE is <compat> "XII" (UAX #15).
      {"Ⅻ", kDefault, {"xii"}},
  });
}

TEST(TokenizerTest, GreekFinalSigmaFoldsToSigma) {
  // Case folding maps both U+03A3 (Σ) and U+03C2 (ς, final) to U+03C3 (σ)
  // (Unicode CaseFolding.txt, "03A3; C; 03C3" and "03C2; C; 03C3";
  // recalled from memory, confirmed here by ICU).
  ExpectTerms({
      {"ΟΔΟΣ οδος", kDefault, {"οδοσ", "οδοσ"}},
      {"Σίσυφος", kDefault, {"σίσυφοσ"}},
  });
}

TEST(TokenizerTest, TurkishDottedCapitalIFoldsAsNfkcCasefold) {
  // NFKC_Casefold uses the default (not Turkic) full folding: U+0130 İ
  // becomes "i" + U+0307 COMBINING DOT ABOVE (CaseFolding.txt,
  // "0130; F; 0069 0307"); plain I becomes i; dotless ı (U+0131) has no
  // folding and stays. Recalled from memory, confirmed here by ICU 72.
  ExpectTerms({
      {"İstanbul", kDefault, {"i\u0307stanbul"}},
      {"ISTANBUL", kDefault, {"istanbul"}},
      {"ıi", kDefault, {"ıi"}},
  });
}

TEST(TokenizerTest, WordInternalPunctuationKeepsOneTerm) {
  // UAX #29 (Unicode 15.0), section 4.1.1: WB6/WB7 keep letters joined
  // across MidLetter/MidNumLet (apostrophe, full stop); WB11/WB12 keep
  // digits joined across MidNum/MidNumLet (comma, full stop). A trailing
  // full stop is not followed by a letter, so it is its own segment and
  // is dropped: "e.g." gives "e.g".
  ExpectTerms({
      {"don't O'Brien l'amour", kDefault, {"don't", "o'brien", "l'amour"}},
      {"It's", kDefault, {"it's"}},
      {"e.g. i.e. U.S.A.", kDefault, {"e.g", "i.e", "u.s.a"}},
      {"3.14", kDefault, {"3.14"}},
      {"1,000", kDefault, {"1,000"}},
      {"３．１４", kDefault, {"3.14"}},  // fullwidth, folded by NFKC
      // A trailing apostrophe is not between letters: it is dropped.
      {"dogs' bones", kDefault, {"dogs", "bones"}},
      // A colon and a hyphen split numbers (WB999).
      {"12:30 2026-05-01", kDefault, {"12", "30", "2026", "05", "01"}},
  });
}

TEST(TokenizerTest, NumbersAreKeptByDefault) {
  ExpectTerms({
      {"2026 4.5 1,000", kDefault, {"2026", "4.5", "1,000"}},
      {"２０２６", kDefault, {"2026"}},  // fullwidth digits, NFKC
  });
}

TEST(TokenizerTest, NumbersFoldToOneTerm) {
  ExpectTerms({
      {"2026 4.5 1,000 ２０２６", kFold, {"<num>", "<num>", "<num>", "<num>"}},
      // Arabic-Indic digit three is Nd, hence Numeric (UAX #29, WB table).
      {"٣", kFold, {"<num>"}},
      {"paid 300 on 12:30", kFold, {"paid", "<num>", "on", "<num>", "<num>"}},
      // ICU gives a word that begins with digits and ends with letters the
      // letter status, so it stays a word ...
      {"4.5kg 2nd", kFold, {"4.5kg", "2nd"}},
      // ... and one of letters then digits the number status (observed
      // with ICU 72); holding a letter, it is a name, not a number, and is
      // never folded.
      {"v2 A1 Ａ４", kFold, {"v2", "a1", "a4"}},
      // Folded numbers are never dropped by the length limits.
      {"7 at 12", {.min_length = 3, .numbers = NumberMode::kFold}, {"<num>", "<num>"}},
  });
}

TEST(TokenizerTest, LengthLimitsCountCodePointsNotBytes) {
  // "ñandú" is 5 code points and 7 bytes of UTF-8.
  ASSERT_EQ(std::string("ñandú").size(), 7u);
  ExpectTerms({
      {"ñandú", {.min_length = 5, .max_length = 5}, {"ñandú"}},
      {"ñandú", {.min_length = 6, .max_length = 20}, {}},
      {"ñandú", {.min_length = 1, .max_length = 4}, {}},
      // 東京 is 2 code points (6 bytes).
      {"東京", {.min_length = 2, .max_length = 2}, {"東京"}},
      // U+1D49C is one code point, two UTF-16 units, four bytes.
      {"𝒜", {.min_length = 1, .max_length = 1}, {"a"}},
      {"a bb ccc dddd", {.min_length = 2, .max_length = 3}, {"bb", "ccc"}},
  });
}

TEST(TokenizerTest, LengthIsMeasuredAfterFolding) {
  // "ß" is one code point but folds to "ss", two (CaseFolding.txt, as above);
  // "ﬁ" is one and folds to "fi".
  ExpectTerms({
      {"ß", {.min_length = 2, .max_length = 2}, {"ss"}},
      {"ß", {.min_length = 1, .max_length = 1}, {}},
      {"ﬁ", {.min_length = 2, .max_length = 2}, {"fi"}},
  });
}

TEST(TokenizerTest, BigramsFollowUnigrams) {
  ExpectTerms({
      {"a b c", kBigrams, {"a", "b", "c", "a b", "b c"}},
      {"Permit, for the BERTH!",
       kBigrams,
       {"permit", "for", "the", "berth", "permit for", "for the", "the berth"}},
      // Bigrams join the kept terms: dropped short terms leave no gap.
      {"a bb c dd", {.min_length = 2, .bigrams = true}, {"bb", "dd", "bb dd"}},
      {"paid 300",
       {.numbers = NumberMode::kFold, .bigrams = true},
       {"paid", "<num>", "paid <num>"}},
  });
}

TEST(TokenizerTest, NoBigramsForDocumentsOfOneTerm) {
  ExpectTerms({
      {"alone", kBigrams, {"alone"}},
      {"  alone!! ", kBigrams, {"alone"}},
      {"", kBigrams, {}},
      {"?!", kBigrams, {}},
  });
}

TEST(TokenizerTest, JapaneseIsSegmentedByDictionary) {
  // One run of kanji and kana, split into several words by ICU's
  // dictionary (observed with ICU 72.1; the reference for chute).
  ExpectTerms({
      {"東京都に住んでいます",
       kDefault,
       {"東京", "都", "に", "住", "んで", "い", "ます"}},
      {"カタカナ", kDefault, {"カタカナ"}},
  });
}

TEST(TokenizerTest, ChineseIsSegmentedByDictionary) {
  // Observed with ICU 72.1.
  ExpectTerms({
      {"我住在北京市", kDefault, {"我", "住在", "北京市"}},
  });
}

TEST(TokenizerTest, ThaiIsSegmentedByDictionary) {
  // Thai is written without spaces; ICU's dictionary splits it (observed
  // with ICU 72.1).
  ExpectTerms({
      {"ภาษาไทยง่ายนิดเดียว", kDefault, {"ภาษา", "ไทย", "ง่าย", "นิด", "เดียว"}},
  });
}

TEST(TokenizerTest, EmojiAreDropped) {
  // Emoji, with variation selectors, skin tones and ZWJ sequences, get no
  // word status from ICU and are dropped like punctuation.
  ExpectTerms({
      {"I ❤️ chute 😀👍🏽 ok", kDefault, {"i", "chute", "ok"}},
      {"👩‍👩‍👧", kDefault, {}},
      {"🇩🇪", kDefault, {}},
  });
}

TEST(TokenizerTest, ReplacementCharacterIsDropped) {
  // U+FFFD is a symbol (So), never part of a word.
  ExpectTerms({
      {"a \uFFFD b", kDefault, {"a", "b"}},
      {"a\uFFFDb", kDefault, {"a", "b"}},
      {"\uFFFD", kDefault, {}},
  });
}

TEST(TokenizerTest, InvalidUtf8BytesBecomeBreaks) {
  // The tokenizer gets raw bytes: each ill-formed sequence becomes U+FFFD,
  // which splits words and is dropped.
  ExpectTerms({
      {std::string("a\xFF\xFE") + "b", kDefault, {"a", "b"}},
      {"caf\xC3", kDefault, {"caf"}},        // truncated sequence at the end
      {"x\xC0\xAFy", kDefault, {"x", "y"}},  // overlong '/'
      {"x\xED\xA0\x80y", kDefault, {"x", "y"}},  // encoded surrogate
      {"\x80\x80\x80", kDefault, {}},
      {std::string("nul\0byte", 8), kDefault, {"nul", "byte"}},
  });
}

TEST(TokenizerTest, RandomBytesNeverCrashAndGiveWellFormedTerms) {
  std::mt19937 rng(20260501);
  std::uniform_int_distribution<int> byte(0, 255);
  std::uniform_int_distribution<int> length(0, 200);
  for (const TokenizerOptions& options :
       {kDefault, kFold,
        TokenizerOptions{.min_length = 2, .max_length = 5, .bigrams = true}}) {
    Tokenizer tokenizer(options);
    Terms terms;
    size_t total_terms = 0;
    for (int round = 0; round < 500; ++round) {
      std::string bytes(static_cast<size_t>(length(rng)), '\0');
      for (char& b : bytes) b = static_cast<char>(byte(rng));
      tokenizer.Tokenize(bytes, &terms);
      total_terms += terms.size();
      for (const std::string& term : terms) {
        ASSERT_TRUE(IsValidUtf8(term)) << "round " << round;
        ASSERT_FALSE(term.empty());
        ASSERT_EQ(term.find("\xEF\xBF\xBD"), std::string::npos);
        if (term.find(' ') == std::string::npos) {
          const int32_t n = CodePointsOf(term);
          ASSERT_GE(n, options.min_length) << term;
          ASSERT_LE(n, options.max_length) << term;
        }
      }
    }
    // The random bytes hold letters and digits, so some terms come out.
    EXPECT_GT(total_terms, 0u);
  }
}

TEST(TokenizerTest, EmptyInputGivesNoTerms) {
  Tokenizer tokenizer(kDefault);
  Terms terms = {"left", "over"};
  tokenizer.Tokenize("", &terms);
  EXPECT_TRUE(terms.empty());
}

TEST(TokenizerTest, TokenizeReplacesEarlierTerms) {
  Tokenizer tokenizer(kBigrams);
  Terms terms;
  tokenizer.Tokenize("first document here", &terms);
  tokenizer.Tokenize("Second one", &terms);
  EXPECT_EQ(terms, (Terms{"second", "one", "second one"}));
}

TEST(TokenizerTest, VeryLongInput) {
  // 200,000 words (about 1.4 MB) in one document.
  const int kWords = 200000;
  std::string text;
  for (int i = 0; i < kWords; ++i) text += (i % 2 == 0) ? "Berth, " : "ñandú ";
  Tokenizer tokenizer(kBigrams);
  Terms terms;
  tokenizer.Tokenize(text, &terms);
  ASSERT_EQ(terms.size(), static_cast<size_t>(2 * kWords - 1));
  EXPECT_EQ(terms[0], "berth");
  EXPECT_EQ(terms[kWords - 1], "ñandú");
  EXPECT_EQ(terms[kWords], "berth ñandú");
  EXPECT_EQ(terms.back(), "berth ñandú");

  // One run of 1,000,000 letters with no break: one segment, longer than
  // max_length, so dropped.
  tokenizer.Tokenize(std::string(1000000, 'a'), &terms);
  EXPECT_TRUE(terms.empty());
}

// --- Segmenter ---------------------------------------------------------------

// The segments of text must be non-empty, in order, start at 0, end at the
// end, and each begin where the previous one ended.
void ExpectContiguousCover(std::u16string_view text,
                           const std::vector<Segment>& segments) {
  if (text.empty()) {
    EXPECT_TRUE(segments.empty());
    return;
  }
  ASSERT_FALSE(segments.empty());
  EXPECT_EQ(segments.front().begin, 0);
  EXPECT_EQ(segments.back().end, static_cast<int32_t>(text.size()));
  for (size_t i = 0; i < segments.size(); ++i) {
    EXPECT_LT(segments[i].begin, segments[i].end) << "segment " << i;
    if (i > 0) {
      EXPECT_EQ(segments[i].begin, segments[i - 1].end) << "segment " << i;
    }
  }
}

TEST(SegmenterTest, SegmentsCoverTheWholeTextContiguously) {
  const std::u16string texts[] = {
      u"",
      u"word",
      u"  Hello, World!  ",
      u"東京都に住んでいます。我住在北京市",
      u"ภาษาไทยง่ายนิดเดียว",
      u"I ❤️ chute 😀👍🏽 👩‍👩‍👧 🇩🇪",
      u"𝒜𝒝 e.g. 3.14 1,000 don't",
      u"\uFFFD\uFFFD x \uFFFD",
      u"a\xD800 b\xDC00 \xDC00\xD800",  // lone surrogates
  };
  Segmenter segmenter;
  std::vector<Segment> segments;
  for (const std::u16string& text : texts) {
    SCOPED_TRACE(testing::Message() << "text of " << text.size() << " units");
    segmenter.Split(text, &segments);
    ExpectContiguousCover(text, segments);
  }
}

TEST(SegmenterTest, RandomTextIsCoveredAndSurrogatePairsStayWhole) {
  // Random mixes of ASCII, Latin-1, CJK, Thai, emoji (surrogate pairs),
  // combining marks and punctuation.
  const char16_t kPieces[][3] = {
      u"a",  u"Z", u" ",      u".", u",", u"'",      u"1",      u"é", u"東",
      u"に", u"ภ", u"\u0301", u"😀", u"𝒜", u"\u200D", u"\uFE0F", u"\n"};
  std::mt19937 rng(7);
  std::uniform_int_distribution<size_t> pick(0, std::size(kPieces) - 1);
  Segmenter segmenter;
  std::vector<Segment> segments;
  for (int round = 0; round < 300; ++round) {
    std::u16string text;
    const int pieces = round % 60;
    for (int i = 0; i < pieces; ++i) text += kPieces[pick(rng)];
    segmenter.Split(text, &segments);
    ExpectContiguousCover(text, segments);
    for (const Segment& s : segments) {
      // No boundary falls between a lead and a trail surrogate.
      ASSERT_FALSE(U16_IS_TRAIL(text[static_cast<size_t>(s.begin)]))
          << "round " << round;
    }
  }
}

TEST(SegmenterTest, KindsFollowIcuRuleStatus) {
  const std::u16string text = u"word 3.14 東京, ";
  Segmenter segmenter;
  std::vector<Segment> segments;
  segmenter.Split(text, &segments);
  struct Expected {
    std::u16string_view text;
    SegmentKind kind;
  };
  const Expected expected[] = {
      {u"word", SegmentKind::kLetter}, {u" ", SegmentKind::kNone},
      {u"3.14", SegmentKind::kNumber}, {u" ", SegmentKind::kNone},
      {u"東京", SegmentKind::kIdeo},   {u",", SegmentKind::kNone},
      {u" ", SegmentKind::kNone},
  };
  ASSERT_EQ(segments.size(), std::size(expected));
  for (size_t i = 0; i < segments.size(); ++i) {
    std::u16string_view got(
        text.data() + segments[i].begin,
        static_cast<size_t>(segments[i].end - segments[i].begin));
    EXPECT_TRUE(got == expected[i].text) << "segment " << i;
    EXPECT_EQ(segments[i].kind, expected[i].kind) << "segment " << i;
  }
}

TEST(SegmenterTest, SplitReplacesEarlierSegments) {
  Segmenter segmenter;
  std::vector<Segment> segments;
  segmenter.Split(u"one two three", &segments);
  segmenter.Split(u"x", &segments);
  ASSERT_EQ(segments.size(), 1u);
  EXPECT_EQ(segments[0].begin, 0);
  EXPECT_EQ(segments[0].end, 1);
  EXPECT_EQ(segments[0].kind, SegmentKind::kLetter);
  segmenter.Split(u"", &segments);
  EXPECT_TRUE(segments.empty());
}

}  // namespace
}  // namespace chute
