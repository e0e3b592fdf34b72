// Which confidence threshold to route automatically above, and what it
// costs in review work.
//
// A document is routed automatically when its confidence (the posterior of
// the chosen queue) is at least the threshold t; the others go to a person.
// The sweep takes t on the grid 0.00, 0.01, ..., 1.00, each t computed as
// hundredths / 100 from an integer (no accumulated rounding), and reports
// per t the share of documents routed automatically and the accuracy among
// them (undefined where no document reaches t).
//
// Accuracy among the automatic documents need not rise with t, so a target
// accuracy P is met by the lowest t on the grid such that every grid point
// from t up to 1.00 that routes any document reaches P. Grid points that
// route no document make no mistake and neither meet nor break the
// condition, and the recommended t itself must route at least one document.
// When even the highest such point misses P, no threshold is recommended
// (every document would need a person).
#ifndef CHUTE_CLASSIFY_THRESHOLD_SWEEP_H_
#define CHUTE_CLASSIFY_THRESHOLD_SWEEP_H_

#include <cstdint>
#include <optional>
#include <span>
#include <vector>

#include "classify/prediction.h"

namespace chute {

inline constexpr int kSweepSteps = 100;  // grid 0/100 .. 100/100

struct SweepPoint {
  int hundredths = 0;     // t = hundredths / 100
  double threshold = 0;   // t
  int64_t documents = 0;  // confidence >= t: routed automatically
  int64_t correct = 0;    // of them, routed to their own queue
  double auto_share = 0;  // documents / all documents (0 with none at all)
  std::optional<double> accuracy;  // correct / documents; undefined with none
};

struct ThresholdRecommendation {
  double target = 0;  // the accuracy asked for
  // The recommended grid point, or none when no threshold reaches target.
  std::optional<SweepPoint> point;
};

// kSweepSteps + 1 points, t ascending.
std::vector<SweepPoint> SweepThresholds(std::span<const Prediction> predictions);

// The rule above. REQUIRES: sweep as SweepThresholds returns it.
ThresholdRecommendation RecommendThreshold(std::span<const SweepPoint> sweep, double target);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_THRESHOLD_SWEEP_H_
