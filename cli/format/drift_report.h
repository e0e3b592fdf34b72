// The words and rows of `chute drift` (classify/drift.h): a table for the
// terminal, JSON Lines or CSV for pipes, and one plain sentence per figure
// that moved more than the set amount.
#ifndef CHUTE_CLI_FORMAT_DRIFT_REPORT_H_
#define CHUTE_CLI_FORMAT_DRIFT_REPORT_H_

#include <string>

#include "classify/drift.h"

namespace chute {

// "On 2026-11-30, 41.0% of documents went to review, against 12.0% over
// the period." and the like for the other figures.
std::string DriftSentence(const DriftAlert& alert);

// The terminal: the daily figures beside the period's, the queue mix beside
// the learned documents', then the sentences (or that nothing moved).
// `since`: the start of the period (RFC 3339 UTC).
std::string DriftTable(const DriftReport& r, const std::string& since,
                       const DriftOptions& options);

// One JSON object per day: date, decisions, held_share,
// held_share_baseline, mean_confidence, mean_confidence_baseline,
// unknown_share, unknown_share_baseline (null without terms), queues (an
// array of {queue, decisions, share, learned_share}), changes (the
// day's sentences).
std::string DriftJsonl(const DriftReport& r);

// RFC 4180, one row per day and figure, header
// date,decisions,figure,queue,value,baseline,moved: figure is queue_share
// (with queue), held_share, mean_confidence or unknown_share; moved is
// true when the day was flagged for it; an undefined value is empty.
std::string DriftCsv(const DriftReport& r);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_DRIFT_REPORT_H_
