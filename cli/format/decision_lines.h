// The decision log's fields as `route --into`, `watch` and `log` print
// them, in this order: digest, source, destination, queue, confidence,
// runner_up, runner_up_posterior, held, model_version, time, by.
// JSON Lines: one object per decision with exactly these keys (held and
// runner_up null when none, runner_up_posterior null when none); CSV
// (RFC 4180): this header, then one record per decision, absent values as
// empty fields. Numbers in the shortest form that reads back to the same
// double. Paths that are not UTF-8 show U+FFFD in place of the bad bytes
// (the log itself keeps the bytes).
#ifndef CHUTE_CLI_FORMAT_DECISION_LINES_H_
#define CHUTE_CLI_FORMAT_DECISION_LINES_H_

#include <string>
#include <vector>

#include "store/decision_log.h"

namespace chute {

// The field names, in order (the CSV header and the JSON keys).
const std::vector<std::string>& DecisionFieldNames();

// The CSV header line (CRLF-terminated).
std::string DecisionCsvHeader();
// One CSV record (CRLF-terminated).
std::string DecisionCsvLine(const DecisionRecord& r);
// One JSON Lines record ('\n'-terminated).
std::string DecisionJsonLine(const DecisionRecord& r);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_DECISION_LINES_H_
