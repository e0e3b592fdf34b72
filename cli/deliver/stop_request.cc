#include "cli/deliver/stop_request.h"

#include <pthread.h>
#include <sys/eventfd.h>
#include <sys/signalfd.h>
#include <unistd.h>

#include <cerrno>
#include <cstdint>
#include <cstring>
#include <string>

namespace chute {

Status StopRequest::Create(bool catch_signals, std::unique_ptr<StopRequest>* out) {
  std::unique_ptr<StopRequest> s(new StopRequest());
  s->event_fd_ = ::eventfd(0, EFD_NONBLOCK | EFD_CLOEXEC);
  if (s->event_fd_ < 0) {
    return Status::IoError(std::string("eventfd: ") + std::strerror(errno));
  }
  if (catch_signals) {
    sigset_t set;
    sigemptyset(&set);
    sigaddset(&set, SIGTERM);
    sigaddset(&set, SIGINT);
    int rc = ::pthread_sigmask(SIG_BLOCK, &set, &s->old_mask_);
    if (rc != 0) return Status::IoError(std::string("pthread_sigmask: ") + std::strerror(rc));
    s->masked_ = true;
    s->signal_fd_ = ::signalfd(-1, &set, SFD_NONBLOCK | SFD_CLOEXEC);
    if (s->signal_fd_ < 0) {
      return Status::IoError(std::string("signalfd: ") + std::strerror(errno));
    }
  }
  *out = std::move(s);
  return Status::Ok();
}

void StopRequest::Request() {
  uint64_t one = 1;
  // The counter cannot overflow from a few requests; EAGAIN would mean it
  // is already non-zero, which is a request too.
  [[maybe_unused]] ssize_t n = ::write(event_fd_, &one, sizeof one);
}

bool StopRequest::Requested() {
  if (requested_) return true;
  if (signal_fd_ >= 0) {
    signalfd_siginfo info;
    if (::read(signal_fd_, &info, sizeof info) == static_cast<ssize_t>(sizeof info)) {
      requested_ = true;
      signal_ = static_cast<int>(info.ssi_signo);
      return true;
    }
  }
  uint64_t count = 0;
  if (::read(event_fd_, &count, sizeof count) == static_cast<ssize_t>(sizeof count) &&
      count > 0) {
    requested_ = true;
  }
  return requested_;
}

void StopRequest::AddPollFds(std::vector<pollfd>* fds) const {
  fds->push_back({event_fd_, POLLIN, 0});
  if (signal_fd_ >= 0) fds->push_back({signal_fd_, POLLIN, 0});
}

StopRequest::~StopRequest() {
  if (signal_fd_ >= 0) {
    // Take every signal still pending, so that none is delivered with its
    // default action (ending the process) once the mask is restored.
    signalfd_siginfo info;
    while (::read(signal_fd_, &info, sizeof info) == static_cast<ssize_t>(sizeof info)) {
    }
    ::close(signal_fd_);
  }
  if (masked_) ::pthread_sigmask(SIG_SETMASK, &old_mask_, nullptr);
  if (event_fd_ >= 0) ::close(event_fd_);
}

}  // namespace chute
