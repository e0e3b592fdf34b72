// Production figures: how well chute routes the documents it really
// receives, from the decision log and the reviews learned from the folders
// (`chute evaluate --from-log`).
//
// Precision comes from the audit sample only: a random share of the
// documents chute would have routed automatically went to review instead,
// marked "audit". An audited document that a reviewer moved out of review
// into the folder of the queue chute had chosen is a correct decision; one
// moved into another queue's folder is an error; one still in review is
// unknown and counts neither way. Because the sample is drawn at random
// from the automatic decisions, k correct of n reviewed estimates the
// precision of those decisions without the bias of corrections, which come
// mostly from the documents reviewers happen to look at. The interval is
// the Wilson score interval (wilson_interval.h).
//
// Per queue q (the queue chute chose): precision(q) = audited documents
// routed to q and confirmed in q / audited documents routed to q whose
// review is known. Undefined (nullopt) with no such document.
#ifndef CHUTE_CLASSIFY_PRODUCTION_FIGURES_H_
#define CHUTE_CLASSIFY_PRODUCTION_FIGURES_H_

#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "classify/logged_decision.h"
#include "classify/wilson_interval.h"

namespace chute {

// Counts over a set of decisions (all of them, or one queue's).
struct DecisionCounts {
  int64_t decisions = 0;
  int64_t routed = 0;  // delivered to their queue's folder (not held)
  // Held for review, by reason.
  int64_t held_threshold = 0;
  int64_t held_no_terms = 0;
  int64_t held_min_documents = 0;
  int64_t audit_drawn = 0;     // held as "audit"
  int64_t audit_reviewed = 0;  // of them, moved out of review by a reviewer
  int64_t audit_correct = 0;   // of those, into the queue chute had chosen
  int64_t audit_unknown = 0;   // audit_drawn - audit_reviewed
  // Documents not in the audit sample that a reviewer moved into another
  // queue than chute's choice (the corrections reviewers made).
  int64_t corrections = 0;
  // Documents held for another reason that a reviewer moved into the queue
  // chute had guessed.
  int64_t held_confirmed = 0;
  // Documents learned as confirmed after staying where chute put them.
  int64_t left_confirmed = 0;
  // audit_correct of audit_reviewed, with its Wilson interval; nullopt
  // when no audited document has been reviewed.
  std::optional<ProportionInterval> precision;
};

struct QueueProductionFigures {
  std::string queue;
  DecisionCounts counts;  // of the decisions that chose this queue
};

struct ProductionFigures {
  DecisionCounts total;
  std::vector<QueueProductionFigures> queues;  // by name, each queue chosen at least once
  std::string first_time, last_time;           // of the decisions; empty with none
};

// REQUIRES: z > 0.
ProductionFigures ComputeProductionFigures(std::span<const LoggedDecision> decisions,
                                           double z = kZ95);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_PRODUCTION_FIGURES_H_
