#include "cli/format/progress.h"

#include <unistd.h>

#include <cstdio>

namespace chute {

Progress::Progress(std::string verb, size_t total)
    : verb_(std::move(verb)), total_(total), active_(isatty(STDERR_FILENO) == 1),
      last_(std::chrono::steady_clock::now()) {}

Progress::~Progress() {
  if (shown_) std::fputs("\r\033[K", stderr);
}

void Progress::Tick() {
  ++done_;
  if (!active_) return;
  auto now = std::chrono::steady_clock::now();
  if (now - last_ < std::chrono::milliseconds(200) && done_ != total_) return;
  last_ = now;
  shown_ = true;
  std::fprintf(stderr, "\r\033[K%s: %zu/%zu documents", verb_.c_str(), done_, total_);
  std::fflush(stderr);
}

}  // namespace chute
