#ifndef CHUTE_CLI_FORMAT_EVALUATION_JSON_H_
#define CHUTE_CLI_FORMAT_EVALUATION_JSON_H_

#include <string>

#include "cli/format/evaluation_report.h"

namespace chute {

// The --json report: one JSON object (RFC 8259) followed by a newline.
// Undefined figures are null. Top-level names (README, "chute evaluate"):
// accuracy, per_queue, macro, weighted, confusion, log_loss, brier, ece,
// reliability, sweep, recommended, model, predictions, and beside them
// method, folds, seed, folds_file, holdout, documents, micro,
// macro_left_out, log_loss_clip, fold_summary, no_terms, warnings,
// generated_at, chute_version.
std::string EvaluationJson(const EvaluationReport& r);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_EVALUATION_JSON_H_
