// A routing decision as the decision log keeps it (store/decision_log.h),
// reduced to what the production figures (production_figures.h) and the
// drift report (drift.h) compute from. Plain data, so that classify/ stays
// free of the store: the command copies the log's rows into it.
#ifndef CHUTE_CLASSIFY_LOGGED_DECISION_H_
#define CHUTE_CLASSIFY_LOGGED_DECISION_H_

#include <cstdint>
#include <string>

namespace chute {

struct LoggedDecision {
  std::string time;        // RFC 3339 UTC, "YYYY-MM-DDTHH:MM:SSZ"
  std::string queue;       // the queue chute chose; for a held one, its best guess
  double confidence = 0;   // posterior of `queue`
  // Why it went to review: "" (it did not), "threshold", "no_terms",
  // "min_documents" or "audit" (drawn for the audit sample).
  std::string held;
  int64_t terms = 0;          // terms counted in the document
  int64_t unknown_terms = 0;  // of them, terms the model did not know
  // The last review learned from the folders: "" (none), "moved" (a
  // reviewer put it into a queue folder: out of review, or from chute's
  // queue into another) or "left" (confirmed by staying where chute put it).
  std::string review;
  std::string reviewed_queue;  // the queue it was learned under then
};

}  // namespace chute

#endif  // CHUTE_CLASSIFY_LOGGED_DECISION_H_
