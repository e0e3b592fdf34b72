#include "classify/prediction.h"

#include <algorithm>

namespace chute {

std::vector<uint32_t> LabelsOfQueues(const Model& model, std::span<const std::string> labels) {
  std::vector<uint32_t> out;
  out.reserve(model.queue_count());
  for (const QueueCounts& q : model.queues()) {
    auto it = std::find(labels.begin(), labels.end(), q.name);
    out.push_back(static_cast<uint32_t>(it - labels.begin()));
  }
  return out;
}

Prediction PredictionFromDecision(const Decision& d, std::span<const uint32_t> label_of_queue,
                                  size_t label_count, uint32_t truth) {
  Prediction p;
  p.truth = truth;
  p.predicted = label_of_queue[d.ranked.front().queue];
  p.confidence = d.ranked.front().posterior;
  p.no_terms = d.no_terms();
  p.probabilities.assign(label_count, 0.0);
  for (const QueuePosterior& q : d.ranked) p.probabilities[label_of_queue[q.queue]] = q.posterior;
  return p;
}

}  // namespace chute
