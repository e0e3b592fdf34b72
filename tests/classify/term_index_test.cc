#include "classify/term_index.h"

#include <gtest/gtest.h>

#include <random>
#include <string>
#include <unordered_map>

namespace chute {
namespace {

TEST(TermIndexTest, IdsAreDenseInInsertionOrder) {
  TermIndex index;
  EXPECT_EQ(index.Insert("harbour"), 0u);
  EXPECT_EQ(index.Insert("pilot"), 1u);
  EXPECT_EQ(index.Insert("harbour"), 0u);  // already there
  EXPECT_EQ(index.Insert(""), 2u);         // the empty string is a key too
  EXPECT_EQ(index.size(), 3u);
  EXPECT_EQ(index.term(1), "pilot");
  EXPECT_EQ(index.Find("pilot"), 1);
  EXPECT_EQ(index.Find(""), 2);
  EXPECT_EQ(index.Find("berth"), -1);
}

// Checked against the obvious reference, std::unordered_map, on many random
// terms of every length (crossing the 8-byte word boundary of the hash) so
// that the table grows many times.
TEST(TermIndexTest, AgreesWithUnorderedMapThroughManyRehashes) {
  std::mt19937 rng(7);
  std::uniform_int_distribution<int> len(0, 20), byte(0, 255);
  TermIndex index;
  std::unordered_map<std::string, uint32_t> reference;
  for (int i = 0; i < 50000; ++i) {
    std::string t;
    for (int n = len(rng); n > 0; --n) t += static_cast<char>(byte(rng) % 6 + 'a');
    auto [it, inserted] = reference.emplace(t, static_cast<uint32_t>(reference.size()));
    EXPECT_EQ(index.Insert(t), it->second);
  }
  ASSERT_EQ(index.size(), reference.size());
  for (const auto& [t, id] : reference) {
    ASSERT_EQ(index.Find(t), static_cast<int64_t>(id)) << t;
    ASSERT_EQ(index.term(id), t);
  }
  EXPECT_EQ(index.Find("not-a-term-of-the-alphabet"), -1);
}

TEST(TermIndexTest, ReserveKeepsWhatIsThere) {
  TermIndex index;
  index.Insert("a");
  index.Insert("b");
  index.Reserve(100000, 1 << 20);
  EXPECT_EQ(index.Find("a"), 0);
  EXPECT_EQ(index.Find("b"), 1);
  EXPECT_EQ(index.Insert("c"), 2u);
}

}  // namespace
}  // namespace chute
