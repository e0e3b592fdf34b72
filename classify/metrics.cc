#include "classify/metrics.h"

namespace chute {

namespace {

std::optional<double> Ratio(int64_t numerator, int64_t denominator) {
  if (denominator == 0) return std::nullopt;
  return static_cast<double>(numerator) / static_cast<double>(denominator);
}

// Mean of the defined values, plain or weighted; counts the undefined ones.
void Average(const std::vector<QueueMetrics>& queues, std::optional<double> QueueMetrics::*field,
             bool weighted, std::optional<double>* mean, int64_t* left_out) {
  double sum = 0, weight = 0;
  *left_out = 0;
  for (const QueueMetrics& q : queues) {
    const std::optional<double>& v = q.*field;
    if (!v) {
      ++*left_out;
      continue;
    }
    const double w = weighted ? static_cast<double>(q.support) : 1.0;
    sum += w * *v;
    weight += w;
  }
  *mean = weight > 0 ? std::optional<double>(sum / weight) : std::nullopt;
}

Averages AverageAll(const std::vector<QueueMetrics>& queues, bool weighted) {
  Averages a;
  Average(queues, &QueueMetrics::precision, weighted, &a.precision, &a.precision_left_out);
  Average(queues, &QueueMetrics::recall, weighted, &a.recall, &a.recall_left_out);
  Average(queues, &QueueMetrics::f1, weighted, &a.f1, &a.f1_left_out);
  return a;
}

}  // namespace

ClassificationMetrics ComputeClassificationMetrics(std::span<const Prediction> predictions,
                                                   size_t label_count) {
  ClassificationMetrics m;
  m.confusion.assign(label_count, std::vector<int64_t>(label_count, 0));
  m.per_queue.resize(label_count);
  for (const Prediction& p : predictions) {
    ++m.confusion[p.truth][p.predicted];
    ++m.per_queue[p.truth].support;
    ++m.per_queue[p.predicted].routed;
    if (p.truth == p.predicted) {
      ++m.per_queue[p.truth].true_positives;
      ++m.correct;
    }
  }
  m.documents = static_cast<int64_t>(predictions.size());
  m.accuracy = Ratio(m.correct, m.documents);

  int64_t tp = 0, fp = 0, fn = 0;
  for (QueueMetrics& q : m.per_queue) {
    const int64_t q_fp = q.routed - q.true_positives;
    const int64_t q_fn = q.support - q.true_positives;
    q.precision = Ratio(q.true_positives, q.routed);
    q.recall = Ratio(q.true_positives, q.support);
    q.f1 = Ratio(2 * q.true_positives, 2 * q.true_positives + q_fp + q_fn);
    tp += q.true_positives;
    fp += q_fp;
    fn += q_fn;
  }
  m.macro = AverageAll(m.per_queue, /*weighted=*/false);
  m.weighted = AverageAll(m.per_queue, /*weighted=*/true);
  m.micro.precision = Ratio(tp, tp + fp);
  m.micro.recall = Ratio(tp, tp + fn);
  m.micro.f1 = Ratio(2 * tp, 2 * tp + fp + fn);
  return m;
}

}  // namespace chute
