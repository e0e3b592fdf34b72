// What `chute evaluate` reports, as plain data for the writers: the
// Evaluation (classify/evaluation.h) and what it was made from. The writers
// print it; they compute nothing but ratios and words.
//   EvaluationJson      --json FILE   (evaluation_json.cc)
//   EvaluationCsvFiles  --csv DIR     (evaluation_csv.cc)
//   EvaluationSummary   the terminal  (evaluation_text.cc)
//   EvaluationHtml      --html FILE   (evaluation_html.cc)
#ifndef CHUTE_CLI_FORMAT_EVALUATION_REPORT_H_
#define CHUTE_CLI_FORMAT_EVALUATION_REPORT_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "classify/cross_validation.h"
#include "classify/evaluation.h"
#include "classify/prediction.h"
#include "store/store_settings.h"

namespace chute {

enum class EvaluationMethod { kCrossValidation, kHoldout };

struct ReportQueue {
  std::string name;
  int64_t documents = 0;          // learned in the store
  std::optional<double> set_prior;  // set by hand
  std::optional<double> prior;      // as the store's full model routes
};

struct EvaluationReport {
  EvaluationMethod method = EvaluationMethod::kCrossValidation;
  // Cross-validation: the number of folds; the seed unless the folds were
  // given in a file (folds_file).
  int64_t folds = 0;
  std::optional<uint64_t> seed;
  std::string folds_file;
  std::string holdout;  // holdout: the folder or CSV file as given
  std::string store;    // the store's file name, without its folder
  std::string generated_at;  // RFC 3339, UTC
  std::string chute_version;
  StoreSettings settings;
  int64_t store_documents = 0;   // learned documents
  int64_t vocabulary = 0;        // |V| of the full model
  std::vector<ReportQueue> queues;  // the store's queues with documents
  Evaluation evaluation;
  std::vector<Prediction> predictions;
  std::vector<std::string> documents;  // per prediction: digest prefix or path
  std::vector<int64_t> fold_of;        // per prediction, 1-based; empty in holdout
  std::vector<FoldSummary> fold_summaries;  // cross-validation only
  std::vector<std::string> warnings;
  bool with_probabilities = false;  // add each prediction's posteriors to JSON
};

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_EVALUATION_REPORT_H_
