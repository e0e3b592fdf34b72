// The decision log's rows as classify/ computes from them
// (classify/logged_decision.h), for evaluate --from-log and drift.
#ifndef CHUTE_CLI_LOGGED_DECISIONS_H_
#define CHUTE_CLI_LOGGED_DECISIONS_H_

#include <string>
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

}  // namespace chute

#endif  // CHUTE_CLI_LOGGED_DECISIONS_H_
