#ifndef CHUTE_CLI_EXIT_CODE_H_
#define CHUTE_CLI_EXIT_CODE_H_

namespace chute {

// Exit statuses, the same for every command.
enum ExitCode : int {
  kExitDone = 0,         // the command did its job
  kExitFailed = 1,       // it could not; nothing was changed
  kExitUsage = 2,        // the command line was wrong (every parse error)
  kExitSomeRefused = 3,  // done, but some documents were refused (on stderr)
};

}  // namespace chute

#endif  // CHUTE_CLI_EXIT_CODE_H_
