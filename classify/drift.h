// Drift: is the intake changing? Per day (the UTC date of the decision
// time), four figures of the decision log, each beside a baseline:
//
//   queue mix        share of the day's decisions that chose each queue
//                    (a held document counts under its best guess), beside
//                    the queue mix of the documents the model learned
//                    (documents(q) / all learned documents): the intake
//                    the model was taught;
//   held share       share of the day's decisions held for review (for
//                    any reason, audit included), beside the share over
//                    the whole period;
//   mean confidence  mean posterior of the chosen queue, beside the mean
//                    over the whole period;
//   unknown share    Σ unknown terms / Σ terms of the day's documents
//                    (terms the model never saw in learning), beside the
//                    same ratio over the whole period; undefined without
//                    terms.
//
// The period baseline includes the day itself: a simple, stable reference
// when one day is one of many; over a short period it damps the changes a
// day shows. A day with at least min_decisions decisions is flagged for
// each figure whose absolute difference from its baseline is more than
// `change` (a difference of shares, or of posteriors, all in [0, 1]).
#ifndef CHUTE_CLASSIFY_DRIFT_H_
#define CHUTE_CLASSIFY_DRIFT_H_

#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <utility>
#include <vector>

#include "classify/logged_decision.h"

namespace chute {

struct DriftOptions {
  double change = 0.10;        // flag a difference greater than this
  int64_t min_decisions = 20;  // days with fewer decisions are not flagged
};

struct DriftFigures {
  int64_t decisions = 0;
  std::vector<int64_t> queue_decisions;  // per DriftReport::queues
  std::vector<double> queue_share;       // queue_decisions / decisions
  double held_share = 0;
  double mean_confidence = 0;
  int64_t terms = 0;
  int64_t unknown_terms = 0;
  std::optional<double> unknown_share;  // unknown_terms / terms; nullopt at 0 terms
};

struct DriftDay {
  std::string date;  // YYYY-MM-DD (UTC)
  DriftFigures figures;
};

enum class DriftFigure { kQueueShare, kHeldShare, kMeanConfidence, kUnknownShare };

// One figure of one day that moved more than the set amount.
struct DriftAlert {
  std::string date;
  DriftFigure figure = DriftFigure::kHeldShare;
  std::string queue;  // for kQueueShare
  double value = 0;
  double baseline = 0;
};

struct DriftReport {
  // The queues: those the model learned documents for and those decisions
  // chose, in byte order of their names.
  std::vector<std::string> queues;
  std::vector<double> ledger_share;  // per queue; 0 for one with no learned document
  int64_t ledger_documents = 0;
  DriftFigures period;          // over every decision given
  std::vector<DriftDay> days;   // in date order, days with decisions only
  std::vector<DriftAlert> alerts;  // by date, then queue mix (by queue), held, confidence, unknown
};

// decisions: the log's decisions of the period, in any order. ledger: the
// learned documents per queue (name, documents), documents >= 0.
// REQUIRES: every decision's time begins with its UTC date YYYY-MM-DD;
// options.change >= 0.
DriftReport ComputeDrift(std::span<const LoggedDecision> decisions,
                         std::span<const std::pair<std::string, int64_t>> ledger,
                         const DriftOptions& options);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_DRIFT_H_
