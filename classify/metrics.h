// How well each queue is served: precision, recall, F1, support, accuracy,
// their averages and the confusion matrix, from evaluated documents.
//
// Per queue q (Manning, Raghavan & Schütze, Introduction to Information
// Retrieval, 2008, §8.3 and §13.6), with TP the documents of q routed to q,
// FP the documents of other queues routed to q, FN the documents of q
// routed elsewhere:
//   precision = TP / (TP + FP)   undefined when nothing was routed to q
//   recall    = TP / (TP + FN)   undefined when q has no document (support 0)
//   F1        = 2·TP / (2·TP + FP + FN)
//                                undefined when q has no document and
//                                nothing was routed to it
// (F1 is the harmonic mean of precision and recall where both are defined
// and not both 0; written over counts, it is also defined, as 0, where one
// of them is undefined because of TP = 0.)
// Undefined figures are std::nullopt, never a silent 0.
//
// Cross-validated predictions are pooled over the folds before counting,
// so F1 comes from the TP, FP and FN summed over folds — the F1 that
// G. Forman & M. Scholz, "Apples-to-Apples in Cross-Validation Studies:
// Pitfalls in Classifier Performance Measurement", SIGKDD Explorations
// 12(1), 2010, recommend over averaging the folds' F1 values.
//
// Averages (Manning et al. 2008, §13.6):
//   macro:    the plain mean over queues of each queue's figure, taken over
//             the queues where it is defined; *_left_out counts the others;
//   weighted: the mean weighted by support, over the queues where the
//             figure is defined (as macro, *_left_out counts the others);
//   micro:    the figure of the pooled contingency table (TP, FP, FN summed
//             over queues). In single-label routing every document is
//             routed to exactly one queue, so ΣFP = ΣFN = documents − ΣTP
//             and micro precision = micro recall = micro F1 = accuracy.
#ifndef CHUTE_CLASSIFY_METRICS_H_
#define CHUTE_CLASSIFY_METRICS_H_

#include <cstdint>
#include <optional>
#include <span>
#include <vector>

#include "classify/prediction.h"

namespace chute {

struct QueueMetrics {
  int64_t support = 0;         // documents whose true queue it is
  int64_t routed = 0;          // documents routed to it
  int64_t true_positives = 0;  // routed to it and belonging there
  std::optional<double> precision;
  std::optional<double> recall;
  std::optional<double> f1;
};

struct Averages {
  std::optional<double> precision;
  std::optional<double> recall;
  std::optional<double> f1;
  // Queues left out of each average because their figure is undefined.
  int64_t precision_left_out = 0;
  int64_t recall_left_out = 0;
  int64_t f1_left_out = 0;
};

struct ClassificationMetrics {
  int64_t documents = 0;
  int64_t correct = 0;
  std::optional<double> accuracy;  // correct / documents; undefined with none
  std::vector<QueueMetrics> per_queue;  // by label
  Averages macro;
  Averages weighted;
  Averages micro;  // equal to accuracy in single-label routing (see above)
  // confusion[t][r]: documents of label t routed to label r (rows true).
  std::vector<std::vector<int64_t>> confusion;
};

// REQUIRES: every prediction's truth and predicted < label_count.
ClassificationMetrics ComputeClassificationMetrics(std::span<const Prediction> predictions,
                                                   size_t label_count);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_METRICS_H_
