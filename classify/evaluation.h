// Every figure of an evaluation, from evaluated documents: the one entry
// point that `chute evaluate` and later users (a promotion gate, production
// figures) share. Computing only; writers in cli/format/ print the result.
#ifndef CHUTE_CLASSIFY_EVALUATION_H_
#define CHUTE_CLASSIFY_EVALUATION_H_

#include <cstdint>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "classify/calibration.h"
#include "classify/metrics.h"
#include "classify/prediction.h"
#include "classify/threshold_sweep.h"

namespace chute {

struct EvaluationOptions {
  // Recommend the lowest threshold that reaches this accuracy
  // (threshold_sweep.h); none: no recommendation. REQUIRES: in [0, 1].
  std::optional<double> target_accuracy;
};

struct Evaluation {
  std::vector<std::string> labels;  // queue names; predictions index them
  ClassificationMetrics classification;
  Calibration calibration;
  std::vector<SweepPoint> sweep;
  std::optional<ThresholdRecommendation> recommendation;  // with a target only
  int64_t no_terms = 0;  // documents decided on the prior alone
};

// REQUIRES: every prediction's labels < labels.size() and one probability
// per label.
Evaluation Evaluate(std::vector<std::string> labels, std::span<const Prediction> predictions,
                    const EvaluationOptions& options);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_EVALUATION_H_
