#include "cli/logged_decisions.h"

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

}  // namespace chute
