#ifndef CHUTE_CLI_FORMAT_EVALUATION_CSV_H_
#define CHUTE_CLI_FORMAT_EVALUATION_CSV_H_

#include <string>
#include <utility>
#include <vector>

#include "cli/format/evaluation_report.h"

namespace chute {

// The --csv files, as (file name, content) pairs, each an RFC 4180 table
// whose header uses the names of the JSON report; undefined figures are
// empty fields:
//   per_queue.csv    queue,precision,recall,f1,support
//   confusion.csv    truth,<queue 1>,<queue 2>,...   (rows: true queue)
//   sweep.csv        threshold,auto_share,accuracy,documents
//   reliability.csv  bin_low,bin_high,count,mean_confidence,accuracy
//   predictions.csv  document,truth,queue,confidence (and fold in
//                    cross-validation)
std::vector<std::pair<std::string, std::string>> EvaluationCsvFiles(const EvaluationReport& r);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_EVALUATION_CSV_H_
