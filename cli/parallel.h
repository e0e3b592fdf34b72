// Spreading independent per-document work (reading, tokenizing, scoring)
// over the machine's cores. The results are consumed in input order by the
// caller, so output and learning order never depend on the threads.
#ifndef CHUTE_CLI_PARALLEL_H_
#define CHUTE_CLI_PARALLEL_H_

#include <cstddef>
#include <functional>

namespace chute {

// Documents handed to the workers at a time: enough to keep every core
// busy, few enough that the window's texts stay small in memory.
inline constexpr size_t kParallelWindow = 64;

// The default number of worker threads: the cores this process may use.
size_t DefaultThreads();

// Calls work(i, worker) for every i in [0, n), spread over `workers`
// threads (the calling thread is worker 0; worker < workers). Returns when
// all calls have returned; an exception thrown by a call is rethrown here.
// REQUIRES: workers >= 1; calls for different i touch different data.
void ParallelFor(size_t n, size_t workers,
                 const std::function<void(size_t i, size_t worker)>& work);

// Two-stage processing of n items in windows of kParallelWindow, the stages
// overlapping: while consume(start, count, buffer) takes window k on the
// calling thread, in order, fill(start, count, buffer) prepares window k+1
// on a background thread (typically with ParallelFor). The two windows in
// flight use buffers 0 and 1 alternately; fill never runs twice at once.
// consume returns false to stop early (the fill in flight is awaited).
// An exception thrown by fill is rethrown here.
void PipelineWindows(size_t n,
                     const std::function<void(size_t start, size_t count, int buffer)>& fill,
                     const std::function<bool(size_t start, size_t count, int buffer)>& consume);

}  // namespace chute

#endif  // CHUTE_CLI_PARALLEL_H_
