#include "cli/format/evaluation_csv.h"

#include "cli/format/csv_writer.h"
#include "cli/format/number.h"

namespace chute {

namespace {

std::string Cell(const std::optional<double>& v) { return v ? FormatShortest(*v) : ""; }

}  // namespace

std::vector<std::pair<std::string, std::string>> EvaluationCsvFiles(const EvaluationReport& r) {
  const Evaluation& e = r.evaluation;
  const ClassificationMetrics& m = e.classification;
  std::vector<std::pair<std::string, std::string>> files;

  std::string t = CsvRecordLine({"queue", "precision", "recall", "f1", "support"});
  for (size_t q = 0; q < e.labels.size(); ++q) {
    const QueueMetrics& x = m.per_queue[q];
    t += CsvRecordLine({e.labels[q], Cell(x.precision), Cell(x.recall), Cell(x.f1),
                        std::to_string(x.support)});
  }
  files.emplace_back("per_queue.csv", std::move(t));

  std::vector<std::string> header = {"truth"};
  header.insert(header.end(), e.labels.begin(), e.labels.end());
  t = CsvRecordLine(header);
  for (size_t q = 0; q < e.labels.size(); ++q) {
    std::vector<std::string> row = {e.labels[q]};
    for (int64_t n : m.confusion[q]) row.push_back(std::to_string(n));
    t += CsvRecordLine(row);
  }
  files.emplace_back("confusion.csv", std::move(t));

  t = CsvRecordLine({"threshold", "auto_share", "accuracy", "documents"});
  for (const SweepPoint& s : e.sweep) {
    t += CsvRecordLine({FormatShortest(s.threshold), FormatShortest(s.auto_share),
                        Cell(s.accuracy), std::to_string(s.documents)});
  }
  files.emplace_back("sweep.csv", std::move(t));

  t = CsvRecordLine({"bin_low", "bin_high", "count", "mean_confidence", "accuracy"});
  for (const ReliabilityBin& b : e.calibration.reliability) {
    t += CsvRecordLine({FormatShortest(b.low), FormatShortest(b.high), std::to_string(b.count),
                        Cell(b.mean_confidence), Cell(b.accuracy)});
  }
  files.emplace_back("reliability.csv", std::move(t));

  const bool folds = !r.fold_of.empty();
  header = {"document", "truth", "queue", "confidence"};
  if (folds) header.push_back("fold");
  t = CsvRecordLine(header);
  for (size_t i = 0; i < r.predictions.size(); ++i) {
    const Prediction& p = r.predictions[i];
    std::vector<std::string> row = {r.documents[i], e.labels[p.truth], e.labels[p.predicted],
                                    FormatShortest(p.confidence)};
    if (folds) row.push_back(std::to_string(r.fold_of[i]));
    t += CsvRecordLine(row);
  }
  files.emplace_back("predictions.csv", std::move(t));
  return files;
}

}  // namespace chute
