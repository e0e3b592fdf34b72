#ifndef CHUTE_CLI_FORMAT_PROGRESS_H_
#define CHUTE_CLI_FORMAT_PROGRESS_H_

#include <chrono>
#include <cstddef>
#include <string>

namespace chute {

// "learn: 1200/5000 documents" on one rewritten stderr line, at most five
// times a second, only when stderr is a terminal. Cleared when destroyed.
class Progress {
 public:
  Progress(std::string verb, size_t total);
  ~Progress();
  Progress(const Progress&) = delete;
  Progress& operator=(const Progress&) = delete;

  void Tick();

 private:
  std::string verb_;
  size_t total_;
  size_t done_ = 0;
  bool active_;
  bool shown_ = false;
  std::chrono::steady_clock::time_point last_;
};

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_PROGRESS_H_
