#include "cli/parallel.h"

#include <sched.h>

#include <algorithm>
#include <atomic>
#include <exception>
#include <mutex>
#include <thread>
#include <vector>

namespace chute {

size_t DefaultThreads() {
  cpu_set_t set;
  if (sched_getaffinity(0, sizeof set, &set) == 0) {
    return std::max(1, CPU_COUNT(&set));
  }
  return std::max(1u, std::thread::hardware_concurrency());
}

void ParallelFor(size_t n, size_t workers,
                 const std::function<void(size_t i, size_t worker)>& work) {
  workers = std::max<size_t>(1, std::min(workers, n));
  std::atomic<size_t> next{0};
  std::exception_ptr error;
  std::mutex error_mutex;
  auto run = [&](size_t worker) {
    try {
      for (size_t i = next++; i < n; i = next++) work(i, worker);
    } catch (...) {
      std::lock_guard<std::mutex> lock(error_mutex);
      if (!error) error = std::current_exception();
      next = n;  // stop handing out work
    }
  };
  std::vector<std::thread> threads;
  threads.reserve(workers - 1);
  for (size_t w = 1; w < workers; ++w) threads.emplace_back(run, w);
  run(0);
  for (std::thread& t : threads) t.join();
  if (error) std::rethrow_exception(error);
}

void PipelineWindows(size_t n,
                     const std::function<void(size_t start, size_t count, int buffer)>& fill,
                     const std::function<bool(size_t start, size_t count, int buffer)>& consume) {
  auto count_at = [&](size_t start) { return std::min(kParallelWindow, n - start); };
  if (n == 0) return;
  fill(0, count_at(0), 0);
  for (size_t start = 0, k = 0; start < n; start += kParallelWindow, ++k) {
    const size_t next = start + kParallelWindow;
    std::exception_ptr error;
    std::thread ahead;
    if (next < n) {
      ahead = std::thread([&, next, k] {
        try {
          fill(next, count_at(next), static_cast<int>((k + 1) % 2));
        } catch (...) {
          error = std::current_exception();
        }
      });
    }
    // Await the fill in flight however consume ends.
    struct Join {
      std::thread& t;
      ~Join() {
        if (t.joinable()) t.join();
      }
    } join{ahead};
    const bool go_on = consume(start, count_at(start), static_cast<int>(k % 2));
    if (ahead.joinable()) ahead.join();
    if (error) std::rethrow_exception(error);
    if (!go_on) return;
  }
}

}  // namespace chute
