#include "cli/parallel.h"

#include <gtest/gtest.h>

#include <atomic>
#include <set>
#include <stdexcept>
#include <thread>
#include <vector>

namespace chute {
namespace {

TEST(ParallelForTest, CallsEveryIndexOnceOnTheGivenWorkers) {
  for (size_t workers : {1u, 2u, 3u, 8u}) {
    std::vector<int> calls(1000, 0);
    std::vector<std::atomic<int>> per_worker(workers);
    ParallelFor(calls.size(), workers, [&](size_t i, size_t w) {
      ++calls[i];
      ASSERT_LT(w, workers);
      ++per_worker[w];
    });
    for (int c : calls) EXPECT_EQ(c, 1);
    int total = 0;
    for (auto& n : per_worker) total += n;
    EXPECT_EQ(total, 1000);
  }
}

TEST(ParallelForTest, NothingToDoIsFine) {
  int calls = 0;
  ParallelFor(0, 4, [&](size_t, size_t) { ++calls; });
  EXPECT_EQ(calls, 0);
}

TEST(ParallelForTest, AnExceptionReachesTheCaller) {
  EXPECT_THROW(ParallelFor(100, 2,
                           [](size_t i, size_t) {
                             if (i == 37) throw std::runtime_error("bad document");
                           }),
               std::runtime_error);
}

TEST(ParallelForTest, DefaultThreadsIsAtLeastOne) { EXPECT_GE(DefaultThreads(), 1u); }

}  // namespace
}  // namespace chute

namespace chute {
namespace {

// Every window is filled before it is consumed, consumed once, in order,
// and the two buffers alternate.
TEST(PipelineWindowsTest, ConsumesEveryWindowInOrderAfterItsFill) {
  const size_t n = 5 * kParallelWindow + 3;
  std::vector<int> value(n, -1);
  std::vector<size_t> filled_with[2];
  std::vector<size_t> consumed;
  PipelineWindows(
      n,
      [&](size_t start, size_t count, int buffer) {
        filled_with[buffer].push_back(start);
        for (size_t i = start; i < start + count; ++i) value[i] = static_cast<int>(i);
      },
      [&](size_t start, size_t count, int buffer) {
        EXPECT_EQ(buffer, static_cast<int>((start / kParallelWindow) % 2));
        for (size_t i = start; i < start + count; ++i) EXPECT_EQ(value[i], static_cast<int>(i));
        consumed.push_back(start);
        return true;
      });
  ASSERT_EQ(consumed.size(), 6u);
  for (size_t k = 0; k < consumed.size(); ++k) EXPECT_EQ(consumed[k], k * kParallelWindow);
  EXPECT_EQ(filled_with[0].size(), 3u);
  EXPECT_EQ(filled_with[1].size(), 3u);
}

TEST(PipelineWindowsTest, StopsWhenConsumeSaysSoAndRethrowsFillErrors) {
  int consumed = 0;
  PipelineWindows(
      10 * kParallelWindow, [](size_t, size_t, int) {},
      [&](size_t, size_t, int) { return ++consumed < 2; });
  EXPECT_EQ(consumed, 2);
  EXPECT_THROW(PipelineWindows(
                   3 * kParallelWindow,
                   [](size_t start, size_t, int) {
                     if (start > 0) throw std::runtime_error("unreadable");
                   },
                   [](size_t, size_t, int) { return true; }),
               std::runtime_error);
  int none = 0;
  PipelineWindows(0, [&](size_t, size_t, int) { ++none; }, [&](size_t, size_t, int) {
    ++none;
    return true;
  });
  EXPECT_EQ(none, 0);
}

}  // namespace
}  // namespace chute
