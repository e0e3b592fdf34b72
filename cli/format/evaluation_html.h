#ifndef CHUTE_CLI_FORMAT_EVALUATION_HTML_H_
#define CHUTE_CLI_FORMAT_EVALUATION_HTML_H_

#include <string>

#include "cli/format/evaluation_report.h"

namespace chute {

// The --html report: one self-contained page (no script, no style sheet,
// image or font from elsewhere; it opens offline and prints on A4) with
// the model, settings, date and data at the top, the summary in words, the
// per-queue table and bars, the confusion heatmap, the coverage–accuracy
// curve and the reliability diagram (svg_charts.h), the most confident
// mistakes, and how the figures are made. Every string from the store or
// the command line is HTML-escaped. The markup is also well-formed XML, so
// an XML parser can check it.
std::string EvaluationHtml(const EvaluationReport& r);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_EVALUATION_HTML_H_
