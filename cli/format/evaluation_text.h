// The words of an evaluation: the summary printed on the terminal for a
// supervisor, and the sentences the report files share.
#ifndef CHUTE_CLI_FORMAT_EVALUATION_TEXT_H_
#define CHUTE_CLI_FORMAT_EVALUATION_TEXT_H_

#include <optional>
#include <string>

#include "cli/format/evaluation_report.h"

namespace chute {

// A figure with `decimals` decimals, or "n/a" when undefined.
std::string FigureOrNa(const std::optional<double>& v, int decimals);

// A share as a percentage with one decimal: "91.4%".
std::string Percent(double share);

// "5-fold cross-validation (seed 1)", "5-fold cross-validation on the folds
// of f.csv", "holdout labelled/".
std::string MethodWords(const EvaluationReport& r);

// The recommended threshold in a plain sentence (or why there is none);
// empty without a target accuracy.
std::string RecommendationSentence(const EvaluationReport& r);

// Log loss, Brier score, ECE and whether confidence overstates or
// understates accuracy, in plain sentences.
std::string CalibrationSentences(const EvaluationReport& r);

// The whole terminal summary: accuracy, per-queue table with averages,
// confusion matrix, calibration, threshold. Undefined figures read "n/a".
std::string EvaluationSummary(const EvaluationReport& r);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_EVALUATION_TEXT_H_
