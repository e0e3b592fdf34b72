// A request to stop, from SIGTERM or SIGINT or from the program itself,
// that a waiting loop can poll on (chute watch).
//
// The signals are blocked in the calling thread and read through a
// signalfd(2), so no handler ever runs and no system call is interrupted
// in the middle of a delivery: the signal stays pending until the loop
// looks at it between documents. Threads started after Create inherit the
// blocked mask (pthread_sigmask(3)); create it before starting any thread,
// or a thread that does not block the signals would take the default
// action (the process ends).
#ifndef CHUTE_CLI_DELIVER_STOP_REQUEST_H_
#define CHUTE_CLI_DELIVER_STOP_REQUEST_H_

#include <poll.h>
#include <signal.h>

#include <memory>
#include <vector>

#include "store/status.h"

namespace chute {

class StopRequest {
 public:
  // With catch_signals, blocks SIGTERM and SIGINT in the calling thread and
  // receives them through a signalfd; without, only Request() stops.
  static Status Create(bool catch_signals, std::unique_ptr<StopRequest>* out);

  // Asks to stop; safe from any thread (writes an eventfd).
  void Request();

  // Whether a stop was asked for (a signal arrived or Request was called).
  // Does not wait. Once true, stays true. Not thread-safe: call from the
  // thread that waits.
  bool Requested();

  // The signal that asked to stop (SIGTERM, SIGINT), or 0 (Request, or
  // none yet).
  int signal() const { return signal_; }

  // Appends the descriptors to poll (POLLIN) so that a wait wakes when a
  // stop is asked for; after such a wake, call Requested().
  void AddPollFds(std::vector<pollfd>* fds) const;

  // Drains the signals taken and puts the earlier signal mask back.
  ~StopRequest();
  StopRequest(const StopRequest&) = delete;  // owns descriptors
  StopRequest& operator=(const StopRequest&) = delete;

 private:
  StopRequest() = default;
  int event_fd_ = -1;
  int signal_fd_ = -1;
  bool masked_ = false;
  sigset_t old_mask_{};
  bool requested_ = false;
  int signal_ = 0;
};

}  // namespace chute

#endif  // CHUTE_CLI_DELIVER_STOP_REQUEST_H_
