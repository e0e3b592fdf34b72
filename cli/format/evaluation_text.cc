#include "cli/format/evaluation_text.h"

#include <cmath>

#include "cli/format/number.h"
#include "cli/format/table_writer.h"

namespace chute {

namespace {

std::string Plural(int64_t n, const std::string& one, const std::string& many) {
  return std::to_string(n) + " " + (n == 1 ? one : many);
}

std::string LeftOut(int64_t n, const std::string& figure) {
  return n == 0 ? "" : Plural(n, "queue", "queues") + " left out of " + figure + " (undefined)";
}

// The mean confidence of all evaluated documents.
std::optional<double> MeanConfidence(const EvaluationReport& r) {
  if (r.predictions.empty()) return std::nullopt;
  double sum = 0;
  for (const Prediction& p : r.predictions) sum += p.confidence;
  return sum / static_cast<double>(r.predictions.size());
}

}  // namespace

std::string FigureOrNa(const std::optional<double>& v, int decimals) {
  return v ? FormatFixed(*v, decimals) : "n/a";
}

std::string Percent(double share) { return FormatFixed(100.0 * share, 1) + "%"; }

std::string MethodWords(const EvaluationReport& r) {
  if (r.method == EvaluationMethod::kHoldout) return "holdout " + r.holdout;
  std::string w = std::to_string(r.folds) + "-fold cross-validation";
  if (r.seed) return w + " (seed " + std::to_string(*r.seed) + ")";
  return w + " on the folds of " + r.folds_file;
}

std::string RecommendationSentence(const EvaluationReport& r) {
  const auto& rec = r.evaluation.recommendation;
  if (!rec) return "";
  const std::string target = FormatShortest(rec->target);
  const int64_t all = r.evaluation.classification.documents;
  if (all == 0) return "No document was evaluated, so no threshold can be recommended.";
  const std::string where =
      r.method == EvaluationMethod::kHoldout ? "on this holdout" : "in this cross-validation";
  if (rec->point) {
    const SweepPoint& p = *rec->point;
    const int64_t review = all - p.documents;
    const std::string at =
        p.hundredths == kSweepSteps ? "when the confidence is 1.00 (as high as it goes)"
        : p.hundredths == 0         ? "at any confidence (threshold 0.00: every document)"
                                    : "at confidence " + FormatFixed(p.threshold, 2) + " or more";
    return "To reach accuracy " + target +
           " among the documents routed automatically, route automatically only " + at + ": " +
           where + " that kept " +
           Percent(p.auto_share) + " of the documents automatic (" + std::to_string(p.documents) +
           " of " + std::to_string(all) + "), right " + Percent(*p.accuracy) +
           " of the time; the other " + std::to_string(review) + " (" +
           Percent(1.0 - p.auto_share) + ") would go to a person for review.";
  }
  // No recommendation: the highest grid point with documents misses.
  const SweepPoint* top = nullptr;
  for (const SweepPoint& s : r.evaluation.sweep) {
    if (s.documents > 0) top = &s;
  }
  return "No confidence threshold reaches accuracy " + target +
         " among the documents routed automatically: even at confidence " +
         FormatFixed(top->threshold, 2) + " or more (" +
         Plural(top->documents, "document", "documents") + ") chute was right only " +
         Percent(*top->accuracy) +
         " of the time " + where +
         ". Send every document to a person, or improve the model and evaluate again.";
}

std::string CalibrationSentences(const EvaluationReport& r) {
  const Calibration& c = r.evaluation.calibration;
  if (!c.log_loss) return "No document was evaluated.";
  std::string s = "Log loss " + FormatFixed(*c.log_loss, 4) +
                  " (lower is better; posteriors clipped to [2^-52, 1 - 2^-52]), Brier score " +
                  FormatFixed(*c.brier, 4) + " (0 is perfect, 2 the worst), expected calibration "
                  "error " + FormatFixed(*c.ece, 4) + ".";
  const double confidence = *MeanConfidence(r);
  const double accuracy = *r.evaluation.classification.accuracy;
  const double gap = confidence - accuracy;
  s += " Mean confidence " + FormatFixed(confidence, 3) + " against accuracy " +
       FormatFixed(accuracy, 3) + ": ";
  if (std::fabs(gap) < 0.005) {
    s += "on average, confidence matches how often chute is right.";
  } else if (gap > 0) {
    s += "chute is over-confident by " + FormatFixed(100 * gap, 1) +
         " percentage points on average; do not read a confidence as a probability of being "
         "right.";
  } else {
    s += "chute is under-confident by " + FormatFixed(-100 * gap, 1) +
         " percentage points on average.";
  }
  return s;
}

std::string EvaluationSummary(const EvaluationReport& r) {
  const Evaluation& e = r.evaluation;
  const ClassificationMetrics& m = e.classification;
  const bool cv = r.method == EvaluationMethod::kCrossValidation;
  std::string out = MethodWords(r) + (cv ? " of the store " : " routed by the store ") +
                    r.store + ": " +
                    Plural(m.documents, "document", "documents") + " evaluated, " +
                    Plural(static_cast<int64_t>(e.labels.size()), "queue", "queues") + "\n";
  if (m.documents == 0) return out + "nothing to evaluate\n";
  out += "accuracy " + FigureOrNa(m.accuracy, 4) + ": " + std::to_string(m.correct) + " of " +
         std::to_string(m.documents) +
         " documents routed to their own queue (in single-label routing this is also the "
         "micro-averaged precision, recall and F1)\n\n";

  TableWriter per_queue({{"queue"},
                         {"precision", TableWriter::Align::kRight},
                         {"recall", TableWriter::Align::kRight},
                         {"F1", TableWriter::Align::kRight},
                         {"support", TableWriter::Align::kRight},
                         {"routed to it", TableWriter::Align::kRight}});
  for (size_t q = 0; q < e.labels.size(); ++q) {
    const QueueMetrics& x = m.per_queue[q];
    per_queue.AddRow({e.labels[q], FigureOrNa(x.precision, 3), FigureOrNa(x.recall, 3),
                      FigureOrNa(x.f1, 3), std::to_string(x.support),
                      std::to_string(x.routed)});
  }
  per_queue.AddRow({"macro average", FigureOrNa(m.macro.precision, 3),
                    FigureOrNa(m.macro.recall, 3), FigureOrNa(m.macro.f1, 3), "", ""});
  per_queue.AddRow({"weighted average", FigureOrNa(m.weighted.precision, 3),
                    FigureOrNa(m.weighted.recall, 3), FigureOrNa(m.weighted.f1, 3), "", ""});
  out += per_queue.Render();
  for (const std::string& note : {LeftOut(m.macro.precision_left_out, "the precision averages"),
                                  LeftOut(m.macro.recall_left_out, "the recall averages"),
                                  LeftOut(m.macro.f1_left_out, "the F1 averages")}) {
    if (!note.empty()) out += note + "\n";
  }
  out += "n/a: undefined (precision of a queue nothing was routed to; recall of a queue with "
         "no document)\n";
  if (r.method == EvaluationMethod::kCrossValidation) {
    out += "F1 from counts pooled over the folds (Forman & Scholz 2010)\n";
  }

  out += "\nconfusion matrix: rows are the true queue, columns the queue routed to\n";
  std::vector<TableWriter::Column> cols = {{"true queue"}};
  for (size_t q = 0; q < e.labels.size(); ++q) {
    cols.push_back({std::to_string(q + 1), TableWriter::Align::kRight});
  }
  TableWriter confusion(cols);
  for (size_t t = 0; t < e.labels.size(); ++t) {
    std::vector<std::string> row = {std::to_string(t + 1) + " " + e.labels[t]};
    for (int64_t n : m.confusion[t]) row.push_back(std::to_string(n));
    confusion.AddRow(std::move(row));
  }
  out += confusion.Render();

  out += "\ncalibration\n" + CalibrationSentences(r) + "\n";
  TableWriter bins({{"confidence"},
                    {"documents", TableWriter::Align::kRight},
                    {"right", TableWriter::Align::kRight},
                    {"mean confidence", TableWriter::Align::kRight}});
  for (const ReliabilityBin& b : e.calibration.reliability) {
    if (b.count == 0) continue;
    bins.AddRow({(b.low == 0 ? "[" : "(") + FormatFixed(b.low, 1) + ", " +
                     FormatFixed(b.high, 1) + "]",
                 std::to_string(b.count), Percent(*b.accuracy), FormatFixed(*b.mean_confidence, 3)});
  }
  out += bins.Render();

  out += "\nthreshold: documents at or above a confidence are routed automatically\n";
  TableWriter sweep({{"confidence at least"},
                     {"routed automatically", TableWriter::Align::kRight},
                     {"documents", TableWriter::Align::kRight},
                     {"accuracy among them", TableWriter::Align::kRight}});
  for (int h : {0, 50, 80, 90, 95, 99, 100}) {
    const SweepPoint& s = e.sweep[h];
    sweep.AddRow({FormatFixed(s.threshold, 2), Percent(s.auto_share), std::to_string(s.documents),
                  FigureOrNa(s.accuracy, 3)});
  }
  out += sweep.Render();
  if (e.recommendation) {
    out += RecommendationSentence(r) + "\n";
  } else {
    out += "Give --target-accuracy P to have the lowest threshold that reaches accuracy P "
           "recommended.\n";
  }
  if (e.no_terms > 0) {
    out += "\n" + Plural(e.no_terms, "document was", "documents were") +
           " routed on the prior alone (no term the model knew).\n";
  }
  return out;
}

}  // namespace chute
