#include "cli/format/evaluation_html.h"

#include <algorithm>
#include <numeric>

#include "classify/calibration.h"
#include "cli/format/evaluation_text.h"
#include "cli/format/html_escape.h"
#include "cli/format/number.h"
#include "cli/format/svg_charts.h"

namespace chute {

namespace {

// How many of the most confident mistakes the page lists.
constexpr size_t kMistakesShown = 15;

constexpr char kStyle[] = R"(
body { font-family: sans-serif; font-size: 14px; color: #000; background: #fff;
       max-width: 1000px; margin: 24px auto; padding: 0 16px; line-height: 1.4; }
h1 { font-size: 24px; margin-bottom: 4px; }
h2 { font-size: 18px; border-bottom: 2px solid #000; padding-bottom: 2px; margin-top: 28px; }
table { border-collapse: collapse; margin: 8px 0; }
th, td { padding: 3px 10px; border-bottom: 1px solid #bbb; text-align: right; }
th { border-bottom: 2px solid #000; }
th:first-child, td:first-child, th.text, td.text { text-align: left; }
table.meta th { text-align: left; border-bottom: 1px solid #bbb; font-weight: normal; color: #333; }
table.meta td { text-align: left; }
tr.average td { font-style: italic; }
.na { font-style: italic; color: #555; }
.warning { border-left: 4px solid #D55E00; padding: 2px 8px; margin: 4px 0; }
.lead { font-size: 16px; }
figure { margin: 12px 0; }
figcaption { font-size: 12px; color: #333; max-width: 760px; }
svg { max-width: 100%; height: auto; }
section { margin-bottom: 12px; }
@page { size: A4; margin: 14mm; }
@media print {
  body { max-width: none; margin: 0; padding: 0; font-size: 11pt; }
  section, figure, table { break-inside: avoid; }
  h2 { break-after: avoid; }
}
)";

std::string Esc(const std::string& s) { return HtmlEscape(s); }

std::string Cell(const std::optional<double>& v, int decimals) {
  return v ? "<td>" + FormatFixed(*v, decimals) + "</td>" : "<td class=\"na\">n/a</td>";
}

std::string Row(const std::string& head, const std::string& value) {
  return "<tr><th scope=\"row\">" + Esc(head) + "</th><td>" + Esc(value) + "</td></tr>\n";
}

std::string Settings(const StoreSettings& s) {
  return "alpha " + FormatShortest(s.model.alpha) + ", prior " +
         (s.model.prior == PriorMode::kUniform ? "uniform" : "learned") + ", bigrams " +
         (s.tokenizer.bigrams ? "on" : "off") + ", numbers " +
         (s.tokenizer.numbers == NumberMode::kFold ? "fold" : "keep") + ", term length " +
         std::to_string(s.tokenizer.min_length) + "-" + std::to_string(s.tokenizer.max_length);
}

std::string Header(const EvaluationReport& r) {
  const ClassificationMetrics& m = r.evaluation.classification;
  std::string s = "<header>\n<h1>How well each queue is served</h1>\n<p class=\"lead\">" +
                  Esc(MethodWords(r)) + " of the store " + Esc(r.store) + "</p>\n";
  s += "<table class=\"meta\">\n";
  s += Row("generated", r.generated_at + " by chute " + r.chute_version);
  s += Row("store", r.store + ": " + std::to_string(r.store_documents) + " learned documents in " +
                        std::to_string(r.queues.size()) + " queues, vocabulary " +
                        std::to_string(r.vocabulary) + " terms");
  s += Row("model version", "not recorded (the store keeps no versions yet)");
  s += Row("settings", Settings(r.settings));
  if (r.method == EvaluationMethod::kCrossValidation) {
    s += Row("method",
             std::to_string(r.folds) + "-fold stratified cross-validation over the learned "
                                       "documents; each fold's model is the store's counts minus "
                                       "the fold's documents" +
                 (r.seed ? "; seed " + std::to_string(*r.seed)
                         : "; folds from " + r.folds_file));
  } else {
    s += Row("method", "holdout " + r.holdout + ", routed by the store's full model");
  }
  s += Row("data", std::to_string(m.documents) + " documents evaluated in " +
                       std::to_string(r.evaluation.labels.size()) + " queues");
  std::string queues;
  for (const ReportQueue& q : r.queues) {
    if (!queues.empty()) queues += ", ";
    queues += q.name + " " + std::to_string(q.documents);
    if (q.set_prior) queues += " (prior set to " + FormatShortest(*q.set_prior) + ")";
  }
  s += Row("learned per queue", queues);
  return s + "</table>\n</header>\n";
}

std::string Summary(const EvaluationReport& r) {
  const ClassificationMetrics& m = r.evaluation.classification;
  std::string s = "<section id=\"summary\">\n<h2>Summary</h2>\n";
  s += "<p><strong>Accuracy " + FigureOrNa(m.accuracy, 4) + "</strong>: " +
       std::to_string(m.correct) + " of " + std::to_string(m.documents) +
       " documents were routed to their own queue. In single-label routing this is also the "
       "micro-averaged precision, recall and F1.</p>\n";
  const std::string rec = RecommendationSentence(r);
  s += "<p>" +
       (rec.empty() ? std::string("No target accuracy was given (<code>--target-accuracy "
                                  "P</code> recommends a threshold).")
                    : Esc(rec)) +
       "</p>\n";
  s += "<p>" + Esc(CalibrationSentences(r)) + "</p>\n";
  if (r.evaluation.no_terms > 0) {
    s += "<p>" + std::to_string(r.evaluation.no_terms) +
         " documents were routed on the prior alone (no term the model knew).</p>\n";
  }
  for (const std::string& w : r.warnings) s += "<p class=\"warning\">Warning: " + Esc(w) + "</p>\n";
  return s + "</section>\n";
}

std::string PerQueue(const EvaluationReport& r) {
  const Evaluation& e = r.evaluation;
  const ClassificationMetrics& m = e.classification;
  std::string s = "<section id=\"queues\">\n<h2>Per queue</h2>\n<table>\n<thead><tr><th>queue</th>"
                  "<th>precision</th><th>recall</th><th>F1</th><th>support</th>"
                  "<th>routed to it</th></tr></thead>\n<tbody>\n";
  for (size_t q = 0; q < e.labels.size(); ++q) {
    const QueueMetrics& x = m.per_queue[q];
    s += "<tr><td>" + Esc(e.labels[q]) + "</td>" + Cell(x.precision, 3) + Cell(x.recall, 3) +
         Cell(x.f1, 3) + "<td>" + std::to_string(x.support) + "</td><td>" +
         std::to_string(x.routed) + "</td></tr>\n";
  }
  for (const auto& [name, a] : {std::pair<const char*, const Averages*>{"macro average", &m.macro},
                                {"weighted average", &m.weighted}}) {
    s += "<tr class=\"average\"><td>" + std::string(name) + "</td>" + Cell(a->precision, 3) +
         Cell(a->recall, 3) + Cell(a->f1, 3) + "<td></td><td></td></tr>\n";
  }
  s += "</tbody>\n</table>\n<p>n/a: undefined (precision of a queue nothing was routed to; recall "
       "of a queue with no document). Averages are taken over the queues where a figure is "
       "defined: left out of precision " +
       std::to_string(m.macro.precision_left_out) + ", of recall " +
       std::to_string(m.macro.recall_left_out) + ", of F1 " +
       std::to_string(m.macro.f1_left_out) + " queues.";
  if (r.method == EvaluationMethod::kCrossValidation) {
    s += " F1 comes from counts pooled over the folds (Forman &amp; Scholz 2010).";
  }
  s += "</p>\n<figure>" + QueueBarsSvg(e.labels, m.per_queue) +
       "<figcaption>Precision (plain), recall (hatched) and F1 of each queue.</figcaption>"
       "</figure>\n</section>\n";
  return s;
}

std::string Confusion(const EvaluationReport& r) {
  const Evaluation& e = r.evaluation;
  return "<section id=\"confusion\">\n<h2>Confusion matrix</h2>\n<figure>" +
         ConfusionHeatmapSvg(e.labels, e.classification.confusion) +
         "<figcaption>Rows: the true queue; columns: the queue the documents were routed to "
         "(numbered as the rows). Each cell holds a count, shaded by its share of the row; the "
         "diagonal, outlined, holds the documents routed right.</figcaption></figure>\n"
         "</section>\n";
}

std::string Threshold(const EvaluationReport& r) {
  const Evaluation& e = r.evaluation;
  std::string s = "<section id=\"threshold\">\n<h2>Threshold: what to route automatically</h2>\n"
                  "<p>Documents whose confidence is at least t are routed automatically; the "
                  "others go to a person.</p>\n<figure>" +
                  CoverageCurveSvg(e.sweep, e.recommendation) +
                  "<figcaption>Each point is a threshold t from 0.00 to 1.00: the share of "
                  "documents it routes automatically and the accuracy among them." +
                  (e.recommendation ? std::string(" The dashed line is the target accuracy; the "
                                                  "circle the recommended threshold.")
                                    : std::string()) +
                  "</figcaption></figure>\n<table>\n<thead><tr><th>confidence at least</th>"
                  "<th>routed automatically</th><th>documents</th><th>accuracy among them</th>"
                  "</tr></thead>\n<tbody>\n";
  std::vector<int> rows = {0, 50, 80, 90, 95, 99, 100};
  if (e.recommendation && e.recommendation->point) {
    rows.push_back(e.recommendation->point->hundredths);
    std::sort(rows.begin(), rows.end());
    rows.erase(std::unique(rows.begin(), rows.end()), rows.end());
  }
  for (int h : rows) {
    const SweepPoint& p = e.sweep[static_cast<size_t>(h)];
    const bool recommended =
        e.recommendation && e.recommendation->point && e.recommendation->point->hundredths == h;
    s += std::string("<tr") + (recommended ? " style=\"font-weight:bold\"" : "") + "><td>" +
         FormatFixed(p.threshold, 2) + (recommended ? " (recommended)" : "") + "</td><td>" +
         Percent(p.auto_share) + "</td><td>" + std::to_string(p.documents) + "</td>" +
         Cell(p.accuracy, 3) + "</tr>\n";
  }
  return s + "</tbody>\n</table>\n</section>\n";
}

std::string CalibrationSection(const EvaluationReport& r) {
  const Calibration& c = r.evaluation.calibration;
  std::string s = "<section id=\"calibration\">\n<h2>Calibration: can the confidence be "
                  "trusted?</h2>\n<figure>" +
                  ReliabilityDiagramSvg(c.reliability) +
                  "<figcaption>For the documents in each confidence bin, the share routed right "
                  "(bars) and the gap to their mean confidence (hatched). Bars on the dashed "
                  "diagonal would mean that confidence can be read as the chance of being "
                  "right; bars below it mean over-confidence.</figcaption></figure>\n"
                  "<table>\n<thead><tr><th>confidence</th><th>documents</th><th>mean "
                  "confidence</th><th>accuracy</th></tr></thead>\n<tbody>\n";
  for (const ReliabilityBin& b : c.reliability) {
    s += "<tr><td>" + std::string(b.low == 0 ? "[" : "(") + FormatFixed(b.low, 1) + ", " +
         FormatFixed(b.high, 1) + "]</td><td>" + std::to_string(b.count) + "</td>" +
         Cell(b.mean_confidence, 3) + Cell(b.accuracy, 3) + "</tr>\n";
  }
  s += "</tbody>\n</table>\n<p>Log loss " + FigureOrNa(c.log_loss, 4) +
       " (posteriors clipped to [2<sup>-52</sup>, 1 - 2<sup>-52</sup>] and renormalised, as "
       "scikit-learn 1.2.1 does), Brier score " +
       FigureOrNa(c.brier, 4) + ", expected calibration error " + FigureOrNa(c.ece, 4) +
       ".</p>\n</section>\n";
  return s;
}

std::string Mistakes(const EvaluationReport& r) {
  const Evaluation& e = r.evaluation;
  std::vector<size_t> wrong;
  for (size_t i = 0; i < r.predictions.size(); ++i) {
    if (r.predictions[i].predicted != r.predictions[i].truth) wrong.push_back(i);
  }
  std::stable_sort(wrong.begin(), wrong.end(), [&](size_t a, size_t b) {
    return r.predictions[a].confidence > r.predictions[b].confidence;
  });
  std::string s = "<section id=\"mistakes\">\n<h2>The most confident mistakes</h2>\n";
  if (wrong.empty()) return s + "<p>No document was routed to a wrong queue.</p>\n</section>\n";
  s += "<p>" + std::to_string(std::min(wrong.size(), kMistakesShown)) + " of " +
       std::to_string(wrong.size()) +
       " misrouted documents, highest confidence first: a person should look at these "
       "first.</p>\n<table>\n<thead><tr><th>document</th><th class=\"text\">true queue</th>"
       "<th class=\"text\">routed to</th><th>confidence</th></tr></thead>\n<tbody>\n";
  for (size_t k = 0; k < wrong.size() && k < kMistakesShown; ++k) {
    const Prediction& p = r.predictions[wrong[k]];
    s += "<tr><td>" + Esc(r.documents[wrong[k]]) + "</td><td class=\"text\">" +
         Esc(e.labels[p.truth]) + "</td><td class=\"text\">" + Esc(e.labels[p.predicted]) +
         "</td><td>" + FormatFixed(p.confidence, 4) +
         "</td></tr>\n";
  }
  return s + "</tbody>\n</table>\n</section>\n";
}

constexpr char kMethod[] = R"(<section id="method">
<h2>How these figures are made</h2>
<p>Per queue, with TP its documents routed to it, FP other documents routed to it and FN its
documents routed elsewhere: precision = TP / (TP + FP), recall = TP / (TP + FN),
F1 = 2&#183;TP / (2&#183;TP + FP + FN), support = its documents (Manning, Raghavan &amp;
Sch&#252;tze, <i>Introduction to Information Retrieval</i>, 2008, &#167;8.3, &#167;13.6).
Macro averages are plain means over queues, weighted averages are weighted by support.
Log loss is the mean of &#8722;log of the true queue's posterior; the Brier score the mean
over documents of the sum over queues of (p &#8722; y)&#178; (Brier, <i>Monthly Weather
Review</i> 78(1), 1950); the expected calibration error the support-weighted mean gap between
accuracy and mean confidence over ten equal-width bins (Guo, Pleiss, Sun &amp; Weinberger,
ICML 2017). The recommended threshold is the lowest t such that every threshold from t up
reaches the target accuracy among the documents it routes automatically. Colours: the
palette of Okabe &amp; Ito, safe for colour-blind readers; every value is also printed.</p>
</section>
)";

}  // namespace

std::string EvaluationHtml(const EvaluationReport& r) {
  std::string s =
      "<!DOCTYPE html>\n<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\">\n<head>\n"
      "<meta charset=\"utf-8\"/>\n<meta name=\"viewport\" content=\"width=device-width, "
      "initial-scale=1\"/>\n<title>chute evaluation: " +
      Esc(r.store) + ", " + Esc(r.generated_at) + "</title>\n<style>" + kStyle +
      "</style>\n</head>\n<body>\n";
  s += Header(r);
  s += Summary(r);
  s += PerQueue(r);
  s += Confusion(r);
  s += Threshold(r);
  s += CalibrationSection(r);
  s += Mistakes(r);
  s += kMethod;
  s += "<footer><p>Made by chute " + Esc(r.chute_version) + " on " + Esc(r.generated_at) +
       ". Documents are named by the first 12 hex digits of their SHA-256 unless the report was "
       "made with --with-paths.</p></footer>\n</body>\n</html>\n";
  return s;
}

}  // namespace chute
