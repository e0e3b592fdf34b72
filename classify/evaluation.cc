#include "classify/evaluation.h"

#include <utility>

namespace chute {

Evaluation Evaluate(std::vector<std::string> labels, std::span<const Prediction> predictions,
                    const EvaluationOptions& options) {
  Evaluation e;
  e.classification = ComputeClassificationMetrics(predictions, labels.size());
  e.labels = std::move(labels);
  e.calibration = ComputeCalibration(predictions);
  e.sweep = SweepThresholds(predictions);
  if (options.target_accuracy) {
    e.recommendation = RecommendThreshold(e.sweep, *options.target_accuracy);
  }
  for (const Prediction& p : predictions) e.no_terms += p.no_terms;
  return e;
}

}  // namespace chute
