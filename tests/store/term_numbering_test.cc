// Tests of the open-addressing term numbering (store/term_numbering.h),
// against std::map as the reference.
#include "store/term_numbering.h"

#include <gtest/gtest.h>

#include <map>
#include <random>
#include <string>

namespace chute {
namespace {

TEST(TermNumberingTest, NumbersTermsInTheOrderFirstMet) {
  TermNumbering numbering;
  EXPECT_EQ(numbering.Number("quay"), 0u);
  EXPECT_EQ(numbering.Number("berth"), 1u);
  EXPECT_EQ(numbering.Number("quay"), 0u);
  EXPECT_EQ(numbering.Number(""), 2u);
  EXPECT_EQ(numbering.size(), 3u);
  EXPECT_EQ(numbering.term(1), "berth");
  EXPECT_EQ(numbering.term(2), "");
}

// Terms short enough to sit in a slot and longer ones, sharing prefixes and
// lengths (the bytes compared differ only at the end), many enough that the
// table grows several times.
TEST(TermNumberingTest, AgreesWithAnOrderedMapOverManyTerms) {
  std::mt19937 rng(11);
  TermNumbering numbering;
  std::map<std::string, uint32_t> reference;
  std::vector<const std::string*> kept;  // references taken along the way
  for (int i = 0; i < 200000; ++i) {
    const auto length = static_cast<unsigned>(rng() % 40);
    std::string term(length, 'x');
    if (length > 0) term.back() = static_cast<char>('a' + rng() % 26);
    if (length > 1) term[length / 2] = static_cast<char>('a' + rng() % 26);
    if (length > 2) term[0] = static_cast<char>(rng() % 256);
    const auto [it, inserted] =
        reference.emplace(term, static_cast<uint32_t>(reference.size()));
    const uint32_t got = numbering.Number(term);
    ASSERT_EQ(got, it->second) << term;
    if (inserted) kept.push_back(&numbering.term(got));
  }
  ASSERT_EQ(numbering.size(), reference.size());
  for (const auto& [term, n] : reference) {
    EXPECT_EQ(numbering.term(n), term);
    EXPECT_EQ(*kept[n], term);  // still valid after the table grew
  }
}

TEST(TermNumberingTest, TwoStepLookupGivesTheSameNumbers) {
  TermNumbering a, b;
  for (const char* t : {"harbour-master", "a-term-longer-than-nineteen-bytes", "fee", "fee"}) {
    const uint64_t hash = TermNumbering::Hash(t);
    b.Prefetch(hash);
    EXPECT_EQ(a.Number(t), b.Number(t, hash));
  }
  EXPECT_EQ(a.size(), 3u);
}

}  // namespace
}  // namespace chute
