// The decision log's rows as classify/ computes from them
// (classify/logged_decision.h), for evaluate --from-log and drift.
#ifndef CHUTE_CLI_LOGGED_DECISIONS_H_
#define CHUTE_CLI_LOGGED_DECISIONS_H_

#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "classify/logged_decision.h"
#include "store/decision_log.h"
#include "store/status.h"
#include "store/store.h"

namespace chute {

LoggedDecision ToLoggedDecision(const DecisionRecord& record);

// The delivered decisions at or after `since` (RFC 3339 UTC; empty: all),
// oldest first, in one read transaction.
Status ReadLoggedDecisions(Store* store, const std::string& since,
                           std::vector<LoggedDecision>* out);

// What evaluate --from-log and drift start with: --since parsed
// (older_than.h; empty: every decision) into *since, the store opened and
// its delivered decisions since then read. Returns kExitDone, or reports
// why not (one line on stderr) and returns the exit code: usage for a bad
// --since, failed for a store that cannot be read or a log with no
// decision in the period.
int LoadDecisionLog(std::string_view command, const std::string& db, const std::string& since_arg,
                    std::unique_ptr<Store>* store, std::string* since,
                    std::vector<LoggedDecision>* out);

}  // namespace chute

#endif  // CHUTE_CLI_LOGGED_DECISIONS_H_
