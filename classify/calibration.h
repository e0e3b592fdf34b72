// How far the posteriors can be trusted as probabilities: log loss, the
// Brier score, a reliability table and the expected calibration error.
//
// With N documents, p_i the posterior vector of document i over the Q
// labels and y_i its one-hot true label:
//
//  log loss = −(1/N) Σ_i log p̃_i(true label)
//      where p̃_i is p_i with every entry clipped to [ε, 1 − ε], ε = 2^−52
//      (the machine epsilon of double), then divided by its sum. This is
//      sklearn.metrics.log_loss of scikit-learn 1.2.1 with its default
//      eps="auto" (sklearn/metrics/_classification.py, log_loss: "eps =
//      np.finfo(y_pred.dtype).eps", "y_pred = np.clip(y_pred, eps, 1 -
//      eps)", then "Renormalize": y_pred / y_pred.sum(axis=1)). A document
//      whose true queue got posterior 0 (one its model did not have) costs
//      −log ε ≈ 36.04.
//  Brier    = (1/N) Σ_i Σ_q (p_i(q) − y_i(q))², the multiclass score of
//      G. W. Brier, "Verification of forecasts expressed in terms of
//      probability", Monthly Weather Review 78(1), 1950; between 0 and 2.
//  reliability: the confidence c_i (posterior of the chosen queue) and
//      whether the choice was right, in 10 equal-width bins B_1..B_10 with
//      B_m = ((m−1)/10, m/10] and B_1 also holding 0; per bin the number of
//      documents, their mean confidence conf(B_m) and their accuracy
//      acc(B_m) (C. Guo, G. Pleiss, Y. Sun & K. Q. Weinberger, "On
//      Calibration of Modern Neural Networks", ICML 2017, §2). The edges are
//      computed as m × 0.1 in double, as numpy.linspace(0, 1, 11) does, so
//      the bins are exactly those of sklearn.calibration.calibration_curve
//      (n_bins=10, strategy="uniform") in scikit-learn 1.2.1, which assigns
//      with numpy.searchsorted(edges[1:-1], c) (side "left": a confidence
//      equal to an inner edge belongs to the lower bin; 1.0 to the last).
//  ECE      = Σ_m (|B_m| / N) · |acc(B_m) − conf(B_m)|   (Guo et al. 2017,
//      eq. 3).
// Sums over documents are compensated (neumaier_sum.h).
#ifndef CHUTE_CLASSIFY_CALIBRATION_H_
#define CHUTE_CLASSIFY_CALIBRATION_H_

#include <cstdint>
#include <limits>
#include <optional>
#include <span>
#include <vector>

#include "classify/prediction.h"

namespace chute {

inline constexpr int kReliabilityBins = 10;
// The clipping of log loss: ε = 2^−52.
inline constexpr double kLogLossEpsilon = std::numeric_limits<double>::epsilon();

struct ReliabilityBin {
  double low = 0;   // m−1 / 10, as shown (membership: see above)
  double high = 0;  // m / 10
  int64_t count = 0;
  std::optional<double> mean_confidence;  // undefined for an empty bin
  std::optional<double> accuracy;         // undefined for an empty bin
};

struct Calibration {
  // Undefined with no documents.
  std::optional<double> log_loss;
  std::optional<double> brier;
  std::optional<double> ece;
  std::vector<ReliabilityBin> reliability;  // kReliabilityBins, low to high
};

// The bin (0 .. kReliabilityBins−1) of a confidence in [0, 1].
int ReliabilityBinOf(double confidence);

// REQUIRES: every prediction's probabilities has one entry per label.
Calibration ComputeCalibration(std::span<const Prediction> predictions);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_CALIBRATION_H_
