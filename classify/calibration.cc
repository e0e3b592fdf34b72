#include "classify/calibration.h"

#include <algorithm>
#include <cmath>

#include "classify/neumaier_sum.h"

namespace chute {

int ReliabilityBinOf(double confidence) {
  // numpy.searchsorted(edges[1:-1], c, side="left") counts the inner edges
  // strictly below c; edges[m] = m * 0.1 (numpy.linspace).
  int bin = 0;
  for (int m = 1; m < kReliabilityBins; ++m) {
    if (static_cast<double>(m) * (1.0 / kReliabilityBins) < confidence) bin = m;
  }
  return bin;
}

Calibration ComputeCalibration(std::span<const Prediction> predictions) {
  Calibration c;
  c.reliability.resize(kReliabilityBins);
  std::vector<NeumaierSum> confidence_sum(kReliabilityBins);
  std::vector<int64_t> correct(kReliabilityBins, 0);
  NeumaierSum log_loss, brier;
  for (const Prediction& p : predictions) {
    double clipped_sum = 0;
    for (double v : p.probabilities) {
      clipped_sum += std::clamp(v, kLogLossEpsilon, 1.0 - kLogLossEpsilon);
    }
    const double true_p =
        std::clamp(p.probabilities[p.truth], kLogLossEpsilon, 1.0 - kLogLossEpsilon);
    log_loss.Add(-std::log(true_p / clipped_sum));

    double squares = 0;
    for (size_t q = 0; q < p.probabilities.size(); ++q) {
      const double d = p.probabilities[q] - (q == p.truth ? 1.0 : 0.0);
      squares += d * d;
    }
    brier.Add(squares);

    const int bin = ReliabilityBinOf(p.confidence);
    ++c.reliability[bin].count;
    confidence_sum[bin].Add(p.confidence);
    correct[bin] += p.predicted == p.truth;
  }
  const double n = static_cast<double>(predictions.size());
  NeumaierSum ece;
  for (int m = 0; m < kReliabilityBins; ++m) {
    ReliabilityBin& b = c.reliability[m];
    b.low = static_cast<double>(m) / kReliabilityBins;
    b.high = static_cast<double>(m + 1) / kReliabilityBins;
    if (b.count == 0) continue;
    const double count = static_cast<double>(b.count);
    b.mean_confidence = confidence_sum[m].value() / count;
    b.accuracy = static_cast<double>(correct[m]) / count;
    ece.Add(count / n * std::fabs(*b.accuracy - *b.mean_confidence));
  }
  if (!predictions.empty()) {
    c.log_loss = log_loss.value() / n;
    c.brier = brier.value() / n;
    c.ece = ece.value();
  }
  return c;
}

}  // namespace chute
