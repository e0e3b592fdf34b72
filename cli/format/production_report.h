// What `chute evaluate --from-log` reports (classify/production_figures.h)
// and its writers, the counterparts of evaluate's (evaluation_report.h):
//   ProductionSummary   the terminal
//   ProductionJson      --json FILE
//   ProductionCsvFiles  --csv DIR
//   ProductionHtml      --html FILE
// They print; they compute nothing but words.
#ifndef CHUTE_CLI_FORMAT_PRODUCTION_REPORT_H_
#define CHUTE_CLI_FORMAT_PRODUCTION_REPORT_H_

#include <string>
#include <utility>
#include <vector>

#include "classify/production_figures.h"

namespace chute {

struct ProductionReport {
  std::string store;  // the store's file name, without its folder
  std::string since;  // the first decision time taken (RFC 3339 UTC); empty: all
  std::string generated_at;
  std::string chute_version;
  double z = kZ95;            // of the intervals
  double confidence = 0.95;   // their confidence level, for the words
  ProductionFigures figures;
};

// "Of 50 audited decisions for permits, 47 were right: precision 0.94,
// between 0.84 and 0.98 with 95% confidence." (queue empty: "in all"), or
// why there is no precision.
std::string PrecisionSentence(const std::string& queue, const DecisionCounts& c,
                              double confidence);

std::string ProductionSummary(const ProductionReport& r);

// One JSON object and a newline. Names: method ("log"), since, first_time,
// last_time, generated_at, chute_version, store, z, confidence, total,
// per_queue (each with queue); total and each queue hold the counts
// (decisions, routed, held_threshold, held_no_terms, held_min_documents,
// audit_drawn, audit_reviewed, audit_correct, audit_unknown, corrections,
// held_confirmed, left_confirmed) and precision, precision_low,
// precision_high (null without a reviewed audit document).
std::string ProductionJson(const ProductionReport& r);

// per_queue.csv (queue, then the names above) and totals.csv (the same
// without queue), RFC 4180; an undefined precision is an empty field.
std::vector<std::pair<std::string, std::string>> ProductionCsvFiles(const ProductionReport& r);

// One self-contained page (no script; well-formed XML), every string from
// the store escaped: the sentences, the counts and the per-queue table with
// each interval drawn as a line.
std::string ProductionHtml(const ProductionReport& r);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_PRODUCTION_REPORT_H_
