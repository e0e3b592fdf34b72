// One evaluated document: its true queue, the queue a model chose, and the
// posterior of every queue. The input of every evaluation figure
// (metrics.h, calibration.h, threshold_sweep.h).
//
// Queues are numbered by their place in the evaluation's list of labels,
// which may hold queues the deciding model did not have (a queue left out
// of a fold's model, a holdout queue the store has never learned): their
// posterior is 0.
#ifndef CHUTE_CLASSIFY_PREDICTION_H_
#define CHUTE_CLASSIFY_PREDICTION_H_

#include <cstdint>
#include <span>
#include <string>
#include <vector>

#include "classify/model.h"

namespace chute {

struct Prediction {
  uint32_t truth = 0;      // label of the true queue
  uint32_t predicted = 0;  // label of the chosen queue
  double confidence = 0;   // posterior of the chosen queue
  bool no_terms = false;   // decided on the prior alone
  std::vector<double> probabilities;  // posterior of every label
};

// The label of each of the model's queues, found by name in `labels`.
// REQUIRES: every queue of the model is in labels.
std::vector<uint32_t> LabelsOfQueues(const Model& model, std::span<const std::string> labels);

// The Prediction of a model's decision. label_of_queue[q] is the label of
// model queue q (LabelsOfQueues). REQUIRES: d.ranked not empty.
Prediction PredictionFromDecision(const Decision& d, std::span<const uint32_t> label_of_queue,
                                  size_t label_count, uint32_t truth);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_PREDICTION_H_
