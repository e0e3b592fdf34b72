// The charts of the HTML report, drawn by chute as inline SVG (SVG 1.1),
// so the page needs nothing from outside. Each function returns one
// <svg> element with a <title> for screen readers.
//
// Colours come from the palette of M. Okabe & K. Ito, "Color Universal
// Design (CUD): How to make figures and presentations that are friendly to
// colorblind people" (J*FLY, 2002/2008; recalled from memory), which stays
// distinguishable under the common colour-vision deficiencies; and every
// chart also reads in black and white: values are printed as numbers,
// series differ in pattern or line style as well as colour, and the
// heatmap's shade runs from white to dark in one hue.
#ifndef CHUTE_CLI_FORMAT_SVG_CHARTS_H_
#define CHUTE_CLI_FORMAT_SVG_CHARTS_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "classify/calibration.h"
#include "classify/metrics.h"
#include "classify/threshold_sweep.h"

namespace chute {

// Okabe–Ito colours used by the charts.
inline constexpr char kColourOrange[] = "#E69F00";
inline constexpr char kColourSkyBlue[] = "#56B4E9";
inline constexpr char kColourGreen[] = "#009E73";
inline constexpr char kColourBlue[] = "#0072B2";
inline constexpr char kColourVermillion[] = "#D55E00";

// Rows true queue, columns routed to; each cell shaded by its share of the
// row (the true queue's documents) and labelled with its count; the
// diagonal (right decisions) outlined.
std::string ConfusionHeatmapSvg(const std::vector<std::string>& labels,
                                const std::vector<std::vector<int64_t>>& matrix);

// Precision, recall and F1 of each queue as horizontal bars with their
// values; undefined ones marked "n/a".
std::string QueueBarsSvg(const std::vector<std::string>& labels,
                         const std::vector<QueueMetrics>& per_queue);

// Accuracy among the automatic documents against the share routed
// automatically, one point per threshold of the sweep, with the target
// accuracy and the recommended threshold marked when there are any.
std::string CoverageCurveSvg(const std::vector<SweepPoint>& sweep,
                             const std::optional<ThresholdRecommendation>& recommendation);

// Accuracy per confidence bin against the diagonal of perfect calibration,
// with each bin's mean confidence and count (after Guo et al. 2017, Fig. 1).
std::string ReliabilityDiagramSvg(const std::vector<ReliabilityBin>& bins);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_SVG_CHARTS_H_
