#include "classify/threshold_sweep.h"

namespace chute {

std::vector<SweepPoint> SweepThresholds(std::span<const Prediction> predictions) {
  std::vector<SweepPoint> sweep(kSweepSteps + 1);
  for (int h = 0; h <= kSweepSteps; ++h) {
    sweep[h].hundredths = h;
    sweep[h].threshold = static_cast<double>(h) / kSweepSteps;
  }
  for (const Prediction& p : predictions) {
    const bool right = p.predicted == p.truth;
    for (SweepPoint& s : sweep) {
      if (p.confidence < s.threshold) break;  // thresholds ascend
      ++s.documents;
      s.correct += right;
    }
  }
  const double n = static_cast<double>(predictions.size());
  for (SweepPoint& s : sweep) {
    const double d = static_cast<double>(s.documents);
    s.auto_share = n > 0 ? d / n : 0.0;
    if (s.documents > 0) s.accuracy = static_cast<double>(s.correct) / d;
  }
  return sweep;
}

ThresholdRecommendation RecommendThreshold(std::span<const SweepPoint> sweep, double target) {
  ThresholdRecommendation r;
  r.target = target;
  for (size_t i = sweep.size(); i-- > 0;) {
    const SweepPoint& s = sweep[i];
    if (s.documents == 0) continue;
    if (*s.accuracy < target) break;
    r.point = s;
  }
  return r;
}

}  // namespace chute
