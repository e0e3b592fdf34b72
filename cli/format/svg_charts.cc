#include "cli/format/svg_charts.h"

#include <algorithm>
#include <cmath>
#include <cstdio>

#include "cli/format/html_escape.h"
#include "cli/format/number.h"

namespace chute {

namespace {

constexpr double kCharWidth = 6.6;  // average width of a 12px sans-serif character

std::string N(double v) { return FormatFixed(v, 1); }

// At most max_chars code points, with "…" when cut.
std::string Shorten(const std::string& s, size_t max_chars) {
  size_t chars = 0;
  for (size_t i = 0; i < s.size(); ++i) {
    if ((static_cast<unsigned char>(s[i]) & 0xC0) != 0x80) {
      if (chars == max_chars) return s.substr(0, i) + "\xE2\x80\xA6";
      ++chars;
    }
  }
  return s;
}

size_t CodePoints(const std::string& s) {
  size_t n = 0;
  for (char c : s) n += (static_cast<unsigned char>(c) & 0xC0) != 0x80;
  return n;
}

std::string Text(double x, double y, const std::string& text, const std::string& extra = "") {
  return "<text x=\"" + N(x) + "\" y=\"" + N(y) + "\"" + (extra.empty() ? "" : " " + extra) +
         ">" + HtmlEscape(text) + "</text>";
}

std::string Line(double x1, double y1, double x2, double y2, const std::string& extra) {
  return "<line x1=\"" + N(x1) + "\" y1=\"" + N(y1) + "\" x2=\"" + N(x2) + "\" y2=\"" + N(y2) +
         "\" " + extra + "/>";
}

std::string Rect(double x, double y, double w, double h, const std::string& extra) {
  return "<rect x=\"" + N(x) + "\" y=\"" + N(y) + "\" width=\"" + N(w) + "\" height=\"" + N(h) +
         "\" " + extra + "/>";
}

std::string Open(double width, double height, const std::string& title) {
  return "<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 " + N(width) + " " +
         N(height) + "\" width=\"" + N(width) + "\" height=\"" + N(height) +
         "\" role=\"img\" font-family=\"sans-serif\" font-size=\"12\"><title>" +
         HtmlEscape(title) + "</title>";
}

// A blend of white and Okabe–Ito blue (0, 114, 178) for share in [0, 1].
std::string Shade(double share) {
  auto mix = [&](int to) {
    return static_cast<int>(std::lround(255.0 + (to - 255.0) * share));
  };
  char buf[8];
  std::snprintf(buf, sizeof buf, "#%02X%02X%02X", mix(0), mix(114), mix(178));
  return buf;
}

// Axis ticks of a [0, 1]-style axis: "0.0", "0.2", ...
std::string Percentish(double v) { return FormatFixed(v, 2); }

}  // namespace

std::string ConfusionHeatmapSvg(const std::vector<std::string>& labels,
                                const std::vector<std::vector<int64_t>>& matrix) {
  const size_t n = labels.size();
  size_t longest = 0;
  for (const std::string& l : labels) longest = std::max(longest, CodePoints(Shorten(l, 28)) + 4);
  const double left = 12 + kCharWidth * static_cast<double>(longest);
  const double cell = std::clamp(560.0 / static_cast<double>(std::max<size_t>(n, 1)), 22.0, 56.0);
  const double top = 46, grid = cell * static_cast<double>(n);
  const double width = left + grid + 90, height = top + grid + 30;
  std::string s = Open(width, height, "Confusion matrix: rows are the true queue, columns the "
                                      "queue routed to; shade is the share of the true queue");
  s += Text(left + grid / 2, 14, "routed to", "text-anchor=\"middle\" font-weight=\"bold\"");
  s += Text(left - 8, top - 10, "true queue", "text-anchor=\"end\" font-weight=\"bold\"");
  s += Text(left + grid + 8, top - 10, "documents", "font-weight=\"bold\"");
  for (size_t c = 0; c < n; ++c) {
    s += Text(left + cell * (static_cast<double>(c) + 0.5), top - 10, std::to_string(c + 1),
              "text-anchor=\"middle\"");
  }
  for (size_t r = 0; r < n; ++r) {
    int64_t total = 0;
    for (int64_t v : matrix[r]) total += v;
    const double y = top + cell * static_cast<double>(r);
    s += "<g><title>" + HtmlEscape(labels[r]) + "</title>" +
         Text(left - 8, y + cell / 2 + 4, std::to_string(r + 1) + " " + Shorten(labels[r], 28),
              "text-anchor=\"end\"") +
         "</g>";
    for (size_t c = 0; c < n; ++c) {
      const double share =
          total > 0 ? static_cast<double>(matrix[r][c]) / static_cast<double>(total) : 0.0;
      const double x = left + cell * static_cast<double>(c);
      s += Rect(x, y, cell, cell,
                "fill=\"" + Shade(share) + "\" stroke=\"" + (r == c ? "#000000" : "#BBBBBB") +
                    "\" stroke-width=\"" + (r == c ? "2" : "0.5") + "\"");
      s += Text(x + cell / 2, y + cell / 2 + 4, std::to_string(matrix[r][c]),
                std::string("text-anchor=\"middle\" fill=\"") +
                    (share > 0.5 ? "#FFFFFF" : "#000000") + "\"" +
                    (matrix[r][c] == 0 ? " opacity=\"0.45\"" : ""));
    }
    s += Text(left + grid + 8, y + cell / 2 + 4, std::to_string(total));
  }
  s += Text(left, top + grid + 20,
            "shade: share of the true queue's documents (white 0, dark 1); outlined: right",
            "font-size=\"11\"");
  return s + "</svg>";
}

std::string QueueBarsSvg(const std::vector<std::string>& labels,
                         const std::vector<QueueMetrics>& per_queue) {
  const size_t n = labels.size();
  size_t longest = 10;
  for (const std::string& l : labels) longest = std::max(longest, CodePoints(Shorten(l, 28)));
  const double left = 12 + kCharWidth * static_cast<double>(longest), scale = 380;
  const double bar = 9, group = 3 * bar + 12, top = 34;
  const double width = left + scale + 90, height = top + group * static_cast<double>(n) + 34;
  std::string s = Open(width, height, "Precision, recall and F1 of each queue");
  // Patterns so that the series differ in black and white too.
  s += "<defs><pattern id=\"hatch\" width=\"5\" height=\"5\" patternUnits=\"userSpaceOnUse\" "
       "patternTransform=\"rotate(45)\"><rect width=\"5\" height=\"5\" fill=\"" +
       std::string(kColourSkyBlue) +
       "\"/><line x1=\"0\" y1=\"0\" x2=\"0\" y2=\"5\" stroke=\"#000000\" "
       "stroke-width=\"1.2\"/></pattern></defs>";
  struct Series {
    const char* name;
    std::string fill;
    std::optional<double> QueueMetrics::*field;
  };
  const Series series[] = {{"precision", kColourOrange, &QueueMetrics::precision},
                           {"recall", "url(#hatch)", &QueueMetrics::recall},
                           {"F1", kColourGreen, &QueueMetrics::f1}};
  double lx = left;
  for (const Series& se : series) {
    s += Rect(lx, 8, 14, 10, "fill=\"" + se.fill + "\" stroke=\"#000000\" stroke-width=\"0.5\"");
    s += Text(lx + 18, 17, se.name);
    lx += 100;
  }
  for (double t = 0; t <= 1.0001; t += 0.25) {
    const double x = left + scale * t;
    s += Line(x, top - 4, x, top + group * static_cast<double>(n), "stroke=\"#DDDDDD\"");
    s += Text(x, top + group * static_cast<double>(n) + 14, Percentish(t),
              "text-anchor=\"middle\" font-size=\"11\"");
  }
  for (size_t q = 0; q < n; ++q) {
    const double y0 = top + group * static_cast<double>(q);
    s += "<g><title>" + HtmlEscape(labels[q]) + "</title>" +
         Text(left - 8, y0 + 1.5 * bar + 4, Shorten(labels[q], 28), "text-anchor=\"end\"") +
         "</g>";
    for (size_t k = 0; k < 3; ++k) {
      const double y = y0 + bar * static_cast<double>(k);
      const std::optional<double>& v = per_queue[q].*(series[k].field);
      if (!v) {
        s += Text(left + 4, y + bar - 1, std::string(series[k].name) + " n/a",
                  "font-size=\"9\" font-style=\"italic\"");
        continue;
      }
      s += Rect(left, y, scale * *v, bar - 1,
                "fill=\"" + series[k].fill + "\" stroke=\"#000000\" stroke-width=\"0.5\"");
      s += Text(left + scale * *v + 4, y + bar - 1, FormatFixed(*v, 3), "font-size=\"9\"");
    }
  }
  return s + "</svg>";
}

std::string CoverageCurveSvg(const std::vector<SweepPoint>& sweep,
                             const std::optional<ThresholdRecommendation>& recommendation) {
  const double left = 56, top = 20, w = 460, h = 260;
  double lowest = 1.0;
  for (const SweepPoint& p : sweep) {
    if (p.accuracy) lowest = std::min(lowest, *p.accuracy);
  }
  if (recommendation) lowest = std::min(lowest, recommendation->target);
  const double y_min = std::max(0.0, std::floor((lowest - 0.02) * 20) / 20);
  auto X = [&](double share) { return left + w * share; };
  auto Y = [&](double acc) { return top + h * (1 - (acc - y_min) / (1 - y_min)); };
  std::string s = Open(left + w + 150, top + h + 48,
                       "Accuracy among the documents routed automatically against the share "
                       "routed automatically, one point per threshold");
  for (int i = 0; i <= 4; ++i) {
    const double share = i / 4.0, acc = y_min + (1 - y_min) * i / 4.0;
    s += Line(X(share), top, X(share), top + h, "stroke=\"#DDDDDD\"");
    s += Line(left, Y(acc), left + w, Y(acc), "stroke=\"#DDDDDD\"");
    s += Text(X(share), top + h + 16, FormatFixed(100 * share, 0) + "%",
              "text-anchor=\"middle\" font-size=\"11\"");
    s += Text(left - 6, Y(acc) + 4, FormatFixed(acc, 3), "text-anchor=\"end\" font-size=\"11\"");
  }
  s += Rect(left, top, w, h, "fill=\"none\" stroke=\"#000000\"");
  s += Text(left + w / 2, top + h + 36, "share of documents routed automatically (confidence ≥ t)",
            "text-anchor=\"middle\"");
  s += Text(14, top + h / 2, "accuracy among them",
            "text-anchor=\"middle\" transform=\"rotate(-90 14 " + N(top + h / 2) + ")\"");
  std::string points;
  for (const SweepPoint& p : sweep) {
    if (!p.accuracy) continue;
    points += N(X(p.auto_share)) + "," + N(Y(*p.accuracy)) + " ";
  }
  s += "<polyline points=\"" + points + "\" fill=\"none\" stroke=\"" + kColourBlue +
       "\" stroke-width=\"2\"/>";
  // Label a few thresholds along the curve, skipping one that would sit on
  // the label before it.
  double last_x = -100, last_y = -100;
  for (int hundredths : {0, 50, 90, 99}) {
    const SweepPoint& p = sweep[static_cast<size_t>(hundredths)];
    if (!p.accuracy) continue;
    if (std::hypot(X(p.auto_share) - last_x, Y(*p.accuracy) - last_y) < 16) continue;
    last_x = X(p.auto_share);
    last_y = Y(*p.accuracy);
    s += "<circle cx=\"" + N(X(p.auto_share)) + "\" cy=\"" + N(Y(*p.accuracy)) +
         "\" r=\"3\" fill=\"" + kColourBlue + "\"/>";
    s += Text(X(p.auto_share) - 6, Y(*p.accuracy) + 14, "t=" + FormatFixed(p.threshold, 2),
              "text-anchor=\"end\" font-size=\"10\"");
  }
  if (recommendation) {
    const double ty = Y(recommendation->target);
    s += Line(left, ty, left + w, ty,
              std::string("stroke=\"") + kColourVermillion + "\" stroke-dasharray=\"6 4\"");
    s += Text(left + w + 6, ty + 4, "target " + FormatShortest(recommendation->target),
              std::string("fill=\"") + kColourVermillion + "\"");
    if (const auto& p = recommendation->point) {
      const double cx = X(p->auto_share), cy = Y(*p->accuracy);
      s += "<circle cx=\"" + N(cx) + "\" cy=\"" + N(cy) + "\" r=\"7\" fill=\"none\" stroke=\"" +
           kColourVermillion + "\" stroke-width=\"2.5\"/>";
      s += Line(cx, cy + 7, cx, top + h, std::string("stroke=\"") + kColourVermillion +
                                             "\" stroke-dasharray=\"2 3\"");
      s += Text(left + w + 6, ty + 20, "recommended t=" + FormatFixed(p->threshold, 2),
                "font-weight=\"bold\"");
      s += Text(left + w + 6, ty + 34,
                FormatFixed(100 * p->auto_share, 1) + "% automatic", "font-size=\"11\"");
    } else {
      s += Text(left + w + 6, ty + 20, "not reached", "font-weight=\"bold\"");
    }
  }
  return s + "</svg>";
}

std::string ReliabilityDiagramSvg(const std::vector<ReliabilityBin>& bins) {
  const double left = 56, top = 20, w = 420, h = 260;
  auto X = [&](double c) { return left + w * c; };
  auto Y = [&](double a) { return top + h * (1 - a); };
  std::string s = Open(left + w + 170, top + h + 62,
                       "Reliability diagram: accuracy per confidence bin against perfect "
                       "calibration");
  s += "<defs><pattern id=\"gap\" width=\"5\" height=\"5\" patternUnits=\"userSpaceOnUse\" "
       "patternTransform=\"rotate(-45)\"><line x1=\"0\" y1=\"0\" x2=\"0\" y2=\"5\" stroke=\"" +
       std::string(kColourVermillion) + "\" stroke-width=\"1.5\"/></pattern></defs>";
  for (int i = 0; i <= 5; ++i) {
    const double v = i / 5.0;
    s += Line(X(v), top, X(v), top + h, "stroke=\"#DDDDDD\"");
    s += Line(left, Y(v), left + w, Y(v), "stroke=\"#DDDDDD\"");
    s += Text(X(v), top + h + 16, FormatFixed(v, 1), "text-anchor=\"middle\" font-size=\"11\"");
    s += Text(left - 6, Y(v) + 4, FormatFixed(v, 1), "text-anchor=\"end\" font-size=\"11\"");
  }
  for (const ReliabilityBin& b : bins) {
    const double x = X(b.low) + 2, bw = X(b.high) - X(b.low) - 4;
    s += Text(x + bw / 2, top + h + 30, std::to_string(b.count),
              "text-anchor=\"middle\" font-size=\"10\"");
    if (b.count == 0) continue;
    const double acc = *b.accuracy, conf = *b.mean_confidence;
    s += Rect(x, Y(acc), bw, Y(0) - Y(acc),
              std::string("fill=\"") + kColourBlue + "\" stroke=\"#000000\" stroke-width=\"0.5\"");
    s += Rect(x, Y(std::max(acc, conf)), bw, std::fabs(Y(acc) - Y(conf)),
              "fill=\"url(#gap)\" stroke=\"" + std::string(kColourVermillion) +
                  "\" stroke-width=\"1\"");
  }
  s += Line(X(0), Y(0), X(1), Y(1), "stroke=\"#000000\" stroke-dasharray=\"5 4\"");
  s += Rect(left, top, w, h, "fill=\"none\" stroke=\"#000000\"");
  s += Text(left - 6, top + h + 30, "documents", "text-anchor=\"end\" font-size=\"10\"");
  s += Text(left + w / 2, top + h + 48, "confidence (posterior of the chosen queue)",
            "text-anchor=\"middle\"");
  s += Text(14, top + h / 2, "accuracy",
            "text-anchor=\"middle\" transform=\"rotate(-90 14 " + N(top + h / 2) + ")\"");
  const double lx = left + w + 14;
  s += Rect(lx, top + 4, 14, 10, std::string("fill=\"") + kColourBlue + "\"");
  s += Text(lx + 20, top + 13, "accuracy in the bin");
  s += Rect(lx, top + 22, 14, 10,
            "fill=\"url(#gap)\" stroke=\"" + std::string(kColourVermillion) + "\"");
  s += Text(lx + 20, top + 31, "gap to mean confidence");
  s += Line(lx, top + 45, lx + 14, top + 45, "stroke=\"#000000\" stroke-dasharray=\"5 4\"");
  s += Text(lx + 20, top + 49, "perfect calibration");
  return s + "</svg>";
}

}  // namespace chute
