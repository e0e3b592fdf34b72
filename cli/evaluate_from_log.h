// `chute evaluate --from-log`: production figures from the decision log
// (classify/production_figures.h), printed like evaluate's summary and
// written to the same kinds of report files.
#ifndef CHUTE_CLI_EVALUATE_FROM_LOG_H_
#define CHUTE_CLI_EVALUATE_FROM_LOG_H_

#include <string>

namespace chute {

struct EvaluateFromLogOptions {
  std::string db;
  std::string since;  // an age or time (older_than.h); empty: every decision
  std::string json;   // report files; empty: not written
  std::string csv;
  std::string html;
};

// Returns an ExitCode.
int RunEvaluateFromLog(const EvaluateFromLogOptions& options);

}  // namespace chute

#endif  // CHUTE_CLI_EVALUATE_FROM_LOG_H_
