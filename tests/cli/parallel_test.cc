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
