#include "cli/logged_decisions.h"

#include <ctime>

#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/older_than.h"

namespace chute {

LoggedDecision ToLoggedDecision(const DecisionRecord& r) {
  LoggedDecision d;
  d.time = r.time;
  d.queue = r.queue;
  d.confidence = r.confidence;
  d.held = std::string(HeldName(r.held));
  d.terms = r.terms;
  d.unknown_terms = r.unknown_terms;
  d.review = std::string(ReviewKindName(r.review));
  d.reviewed_queue = r.reviewed_queue;
  return d;
}

Status ReadLoggedDecisions(Store* store, const std::string& since,
                           std::vector<LoggedDecision>* out) {
  out->clear();
  DecisionQuery query;
  query.since = since;
  query.delivered_only = true;
  return store->ReadDecisions(query, [out](const DecisionRecord& r) {
    out->push_back(ToLoggedDecision(r));
    return Status::Ok();
  });
}

int LoadDecisionLog(std::string_view command, const std::string& db, const std::string& since_arg,
                    std::unique_ptr<Store>* store, std::string* since,
                    std::vector<LoggedDecision>* out) {
  since->clear();
  if (!since_arg.empty()) {
    std::string why;
    if (!ParseOlderThan(since_arg, std::time(nullptr), since, &why)) {
      Report(command, "--since: " + why);
      return kExitUsage;
    }
  }
  if (!OpenStoreOrReport(command, db, store)) return kExitFailed;
  if (Status s = ReadLoggedDecisions(store->get(), *since, out); !s.ok()) {
    Report(command, s.message());
    return kExitFailed;
  }
  if (out->empty()) {
    Report(command, db + ": no decision in the log" +
                        (since->empty() ? std::string() : " since " + *since) +
                        "; 'chute route --into' and 'chute watch' write it");
    return kExitFailed;
  }
  return kExitDone;
}

}  // namespace chute
