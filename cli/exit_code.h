#ifndef CHUTE_CLI_EXIT_CODE_H_
#define CHUTE_CLI_EXIT_CODE_H_

#include <cstdint>

namespace chute {

// Exit statuses, the same for every command.
enum ExitCode : int {
  kExitDone = 0,         // the command did its job
  kExitFailed = 1,       // it could not; nothing was changed
  kExitUsage = 2,        // the command line was wrong (every parse error)
  kExitSomeRefused = 3,  // done, but some documents were refused (on stderr)
  kExitGateRefused = 4,  // promote: the gate found the candidate worse; nothing changed
};

// The exit status of a command that handles a batch of documents: done when
// none was refused; done-but-refused when some were handled; failed when
// every one was refused.
inline ExitCode BatchExit(int64_t handled, int64_t refused) {
  if (refused == 0) return kExitDone;
  return handled > 0 ? kExitSomeRefused : kExitFailed;
}

}  // namespace chute

#endif  // CHUTE_CLI_EXIT_CODE_H_
