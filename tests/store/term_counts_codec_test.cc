// Tests of the ledger's term-count blob (store/term_counts_codec.h).
#include "store/term_counts_codec.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cstdint>
#include <initializer_list>
#include <limits>
#include <random>
#include <string>
#include <vector>

namespace chute {
namespace {

using Counts = std::vector<TermCount>;

// A string of the given byte values.
std::string Bytes(std::initializer_list<int> bytes) {
  std::string out;
  for (int b : bytes) out.push_back(static_cast<char>(b));
  return out;
}

// Sorted, distinct terms made of a few pieces (so that many share prefixes),
// ASCII and not, with counts spread over every varint length.
Counts RandomCounts(std::mt19937_64* rng) {
  static const char* const kPieces[] = {"a",    "ab",   "b", "berth", "ä", "ß",
                                        "日本", "東京", "ñ", "😀",     "-", "0"};
  std::uniform_int_distribution<size_t> pick(0, std::size(kPieces) - 1);
  std::uniform_int_distribution<int> pieces(1, 6);
  std::uniform_int_distribution<int> size(0, 60);
  std::uniform_int_distribution<int> bits(0, 62);
  Counts counts;
  const int n = size(*rng);
  for (int i = 0; i < n; ++i) {
    std::string term;
    for (int p = pieces(*rng); p > 0; --p) term += kPieces[pick(*rng)];
    // A count of 1 to 2^63 - 1, of a random bit length.
    const int b = bits(*rng);
    const int64_t high = b == 62 ? std::numeric_limits<int64_t>::max()
                                 : (int64_t{1} << (b + 1)) - 1;
    const int64_t count =
        std::uniform_int_distribution<int64_t>(int64_t{1} << b, high)(*rng);
    counts.emplace_back(std::move(term), count);
  }
  std::sort(counts.begin(), counts.end());
  counts.erase(std::unique(counts.begin(), counts.end(),
                           [](const TermCount& x, const TermCount& y) {
                             return x.first == y.first;
                           }),
               counts.end());
  return counts;
}

TEST(TermCountsCodecTest, RandomSortedListsRoundTrip) {
  std::mt19937_64 rng(42);
  int with_shared_prefix = 0;
  for (int round = 0; round < 500; ++round) {
    const Counts counts = RandomCounts(&rng);
    for (size_t i = 1; i < counts.size(); ++i) {
      if (counts[i].first.compare(0, counts[i - 1].first.size(),
                                  counts[i - 1].first) == 0) {
        ++with_shared_prefix;
      }
    }
    const std::string blob = EncodeTermCounts(counts);
    Counts decoded = {{"stale", 1}};
    ASSERT_TRUE(DecodeTermCounts(blob, &decoded)) << "round " << round;
    ASSERT_EQ(decoded, counts) << "round " << round;
  }
  // The generator does exercise front coding.
  EXPECT_GT(with_shared_prefix, 100);
}

TEST(TermCountsCodecTest, EmptyListIsEmptyBlob) {
  const std::string blob = EncodeTermCounts(std::vector<TermCount>{});
  EXPECT_TRUE(blob.empty());
  Counts decoded = {{"stale", 1}};
  ASSERT_TRUE(DecodeTermCounts(blob, &decoded));
  EXPECT_TRUE(decoded.empty());
}

TEST(TermCountsCodecTest, EncodingFollowsTheDocumentedLayout) {
  // varint(shared) varint(suffix length) suffix varint(count), per entry;
  // 300 is the two-byte LEB128 varint AC 02.
  const Counts counts = {{"ab", 1}, {"abc", 300}, {"b", 2}, {"日", 1}};
  const std::string expected = Bytes({0, 2}) + "ab" + Bytes({1}) +  //
                               Bytes({2, 1}) + "c" + Bytes({0xAC, 0x02}) +
                               Bytes({0, 1}) + "b" + Bytes({2}) +  //
                               Bytes({0, 3}) + "日" + Bytes({1});
  EXPECT_EQ(EncodeTermCounts(counts), expected);
  Counts decoded;
  ASSERT_TRUE(DecodeTermCounts(expected, &decoded));
  EXPECT_EQ(decoded, counts);
}

TEST(TermCountsCodecTest, SharedPrefixIsCountedInBytes) {
  // "日本" and "日本語" share the 6 bytes of "日本"; "日本語" (E6 97 A5 ...)
  // and "旦" (E6 97 A6) share two bytes, which are not a whole character:
  // front coding works on bytes, and the round trip restores characters.
  const Counts counts = {{"日", 1}, {"日本", 2}, {"日本語", 3}, {"旦", 4}};
  const std::string blob = EncodeTermCounts(counts);
  Counts decoded;
  ASSERT_TRUE(DecodeTermCounts(blob, &decoded));
  EXPECT_EQ(decoded, counts);
  // 4 entries of 3 one-byte varints each, plus suffixes of 3 bytes ("日"
  // whole), 3 ("本"), 3 ("語") and 1 (A6).
  EXPECT_EQ(blob.size(), 4u * 3u + 3u + 3u + 3u + 1u);
}

struct Malformed {
  const char* why;
  std::string blob;
};

TEST(TermCountsCodecTest, MalformedBlobsAreRejected) {
  const std::string nine_zero_groups =
      Bytes({0x80, 0x80, 0x80, 0x80, 0x80, 0x80, 0x80, 0x80, 0x80});
  const Malformed cases[] = {
      {"truncated varint (continuation bit on the last byte)", Bytes({0x80})},
      {"truncated suffix-length varint", Bytes({0, 0x81})},
      {"truncated count varint", Bytes({0, 1}) + "a" + Bytes({0x81})},
      {"missing count", Bytes({0, 1}) + "a"},
      {"suffix past the end", Bytes({0, 5}) + "abc"},
      {"huge suffix length",
       Bytes({0, 0xFF, 0xFF, 0xFF, 0xFF, 0xFF, 0xFF, 0xFF, 0xFF, 0x7F})},
      {"zero count", Bytes({0, 1}) + "a" + Bytes({0})},
      {"first entry shares bytes", Bytes({1, 1}) + "a" + Bytes({1})},
      {"shared longer than the previous term",
       Bytes({0, 1}) + "a" + Bytes({1}) + Bytes({2, 1}) + "b" + Bytes({1})},
      // 2^63: nine zero groups with the continuation bit, then 1.
      {"count above 2^63 - 1",
       Bytes({0, 1}) + "a" + nine_zero_groups + Bytes({0x01})},
      // A suffix length of 1 + 2^64: the bit past 64 must not be dropped.
      {"varint longer than 64 bits", Bytes({0, 0x81}) +
                                         nine_zero_groups.substr(1) +
                                         Bytes({0x02}) + "a" + Bytes({1})},
      {"varint of 11 bytes",
       Bytes({0, 1}) + "a" + Bytes({0x81}) + nine_zero_groups + Bytes({0})},
      {"terms out of order",
       Bytes({0, 1}) + "b" + Bytes({1}) + Bytes({0, 1}) + "a" + Bytes({1})},
      {"term repeated", Bytes({0, 1}) + "a" + Bytes({1}) + Bytes({1, 0, 1})},
  };
  for (const Malformed& c : cases) {
    Counts decoded;
    EXPECT_FALSE(DecodeTermCounts(c.blob, &decoded)) << c.why;
  }
}

TEST(TermCountsCodecTest, EveryTruncationIsRejectedOrAPrefix) {
  // Cutting a valid blob anywhere gives either a malformed blob or, at an
  // entry boundary, the leading entries: never anything else.
  const Counts counts = {{"berth", 1}, {"berthing", 128}, {"bookings", 16384},
                         {"zölle", 3}, {"日本", 70000},   {"😀", 1}};
  const std::string blob = EncodeTermCounts(counts);
  int prefixes = 0;
  for (size_t cut = 0; cut < blob.size(); ++cut) {
    Counts decoded;
    if (!DecodeTermCounts(std::string_view(blob).substr(0, cut), &decoded)) {
      continue;
    }
    ASSERT_LT(decoded.size(), counts.size()) << "cut " << cut;
    EXPECT_TRUE(std::equal(decoded.begin(), decoded.end(), counts.begin()))
        << "cut " << cut;
    ++prefixes;
  }
  // One prefix per entry boundary: after 0, 1, ..., 5 entries.
  EXPECT_EQ(prefixes, static_cast<int>(counts.size()));
}

}  // namespace
}  // namespace chute
