// Tests of the model fingerprint (store/fingerprint.h): the sum of row
// digests is a true sum (order-free, subtraction undoes addition, carries
// cross limbs), and the fingerprint changes with anything that changes the
// model and with nothing else.
#include "store/fingerprint.h"

#include <gtest/gtest.h>

#include <string>

namespace chute {
namespace {

ModelCounts Small() {
  ModelCounts mc;
  mc.queues = {{"billing", 2, 5, std::nullopt}, {"marina", 1, 3, std::nullopt}};
  mc.terms = {"dues", "invoice", "pontoon"};
  mc.counts = {2, 0, 3, 0, 0, 3};
  return mc;
}

TEST(CountsSumTest, OrderDoesNotMatterAndSubtractionUndoesAddition) {
  CountsSum a, b;
  a.Add("dues", "billing", 2);
  a.Add("invoice", "billing", 3);
  a.Add("pontoon", "marina", 3);
  b.Add("pontoon", "marina", 3);
  b.Add("dues", "billing", 2);
  b.Add("invoice", "billing", 3);
  EXPECT_EQ(a, b);
  b.Add("extra", "marina", 7);
  EXPECT_NE(a, b);
  b.Add("extra", "marina", 7, -1);
  EXPECT_EQ(a, b);
  CountsSum zero;
  for (int i = 1; i < 200; ++i) zero.Add("t" + std::to_string(i), "q", i);
  for (int i = 1; i < 200; ++i) zero.Add("t" + std::to_string(i), "q", i, -1);
  EXPECT_EQ(zero.Hex(), std::string(64, '0'));  // every carry and borrow undone
}

TEST(CountsSumTest, ChangeIsSubtractThenAdd) {
  CountsSum a, b;
  a.Add("dues", "billing", 2);
  a.Change("dues", "billing", 2, 5);
  b.Add("dues", "billing", 5);
  EXPECT_EQ(a, b);
  a.Change("dues", "billing", 5, 0);
  EXPECT_EQ(a, CountsSum());
}

// Sums kept apart (as two threads keep them) and then added equal the one
// sum, carries included; so do sums with subtractions in them.
TEST(CountsSumTest, SumsKeptApartAddUpToTheOneSum) {
  CountsSum whole, even, odd;
  for (int i = 1; i < 500; ++i) {
    const std::string term = "t" + std::to_string(i);
    const int sign = i % 7 == 0 ? -1 : 1;
    whole.Add(term, "q", i, sign);
    (i % 2 ? odd : even).Add(term, "q", i, sign);
  }
  CountsSum added = even;
  added.Add(odd);
  EXPECT_EQ(added, whole);
  CountsSum other_way = odd;
  other_way.Add(even);
  EXPECT_EQ(other_way, whole);
  CountsSum nothing;
  nothing.Add(CountsSum());
  EXPECT_EQ(nothing, CountsSum());
}

TEST(CountsSumTest, HexRoundTrips) {
  CountsSum a;
  a.Add("harbour", "berths", 41);
  CountsSum back;
  ASSERT_TRUE(CountsSum::FromHex(a.Hex(), &back));
  EXPECT_EQ(back, a);
  EXPECT_FALSE(CountsSum::FromHex("12", &back));
  EXPECT_FALSE(CountsSum::FromHex(std::string(63, '0') + "g", &back));
}

TEST(FingerprintTest, SumFromCountsEqualsSumKeptRowByRow) {
  ModelCounts mc = Small();
  CountsSum kept;
  kept.Add("pontoon", "marina", 3);
  kept.Add("invoice", "billing", 3);
  kept.Add("dues", "billing", 2);
  EXPECT_EQ(SumOfCounts(mc), kept);
  EXPECT_EQ(ModelFingerprint(StoreSettings{}, mc), ModelFingerprint(StoreSettings{}, mc, kept));
}

TEST(FingerprintTest, ChangesWithTheModelOnly) {
  const StoreSettings st;
  const std::string base = ModelFingerprint(st, Small());
  EXPECT_EQ(base.size(), 64u);
  ModelCounts count = Small();
  count.counts[0] = 3;
  EXPECT_NE(ModelFingerprint(st, count), base);
  ModelCounts renamed = Small();
  renamed.queues[1].name = "marinas";
  EXPECT_NE(ModelFingerprint(st, renamed), base);
  ModelCounts prior = Small();
  prior.queues[0].set_prior = 0.4;
  EXPECT_NE(ModelFingerprint(st, prior), base);
  StoreSettings alpha;
  alpha.model.alpha = 0.5;
  EXPECT_NE(ModelFingerprint(alpha, Small()), base);
  StoreSettings bigrams;
  bigrams.tokenizer.bigrams = true;
  EXPECT_NE(ModelFingerprint(bigrams, Small()), base);
  // A queue without documents does not route, and keep_text is not the model.
  ModelCounts empty_queue = Small();
  empty_queue.queues.push_back({"aaa-new", 0, 0, std::nullopt});
  for (size_t row = 3; row-- > 0;) empty_queue.counts.insert(empty_queue.counts.begin() + static_cast<long>(row * 2 + 2), 0);
  EXPECT_EQ(ModelFingerprint(st, empty_queue), base);
  StoreSettings no_text;
  no_text.keep_text = false;
  EXPECT_EQ(ModelFingerprint(no_text, Small()), base);
}

}  // namespace
}  // namespace chute
