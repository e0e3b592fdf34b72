#include "classify/drift.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>

namespace chute {

namespace {

// Running sums of one day or of the period.
struct Sums {
  int64_t decisions = 0;
  std::vector<int64_t> per_queue;
  int64_t held = 0;
  double confidence = 0;
  int64_t terms = 0;
  int64_t unknown_terms = 0;
};

void Add(const LoggedDecision& d, size_t queue, Sums* s) {
  ++s->decisions;
  ++s->per_queue[queue];
  s->held += !d.held.empty();
  s->confidence += d.confidence;
  s->terms += d.terms;
  s->unknown_terms += d.unknown_terms;
}

DriftFigures FiguresOf(const Sums& s) {
  DriftFigures f;
  f.decisions = s.decisions;
  f.queue_decisions = s.per_queue;
  const double n = static_cast<double>(s.decisions);
  for (int64_t k : s.per_queue) f.queue_share.push_back(n > 0 ? static_cast<double>(k) / n : 0);
  f.held_share = n > 0 ? static_cast<double>(s.held) / n : 0;
  f.mean_confidence = n > 0 ? s.confidence / n : 0;
  f.terms = s.terms;
  f.unknown_terms = s.unknown_terms;
  if (s.terms > 0) {
    f.unknown_share = static_cast<double>(s.unknown_terms) / static_cast<double>(s.terms);
  }
  return f;
}

}  // namespace

DriftReport ComputeDrift(std::span<const LoggedDecision> decisions,
                         std::span<const std::pair<std::string, int64_t>> ledger,
                         const DriftOptions& options) {
  DriftReport r;
  std::set<std::string> names;
  for (const auto& [name, documents] : ledger) names.insert(name);
  for (const LoggedDecision& d : decisions) names.insert(d.queue);
  r.queues.assign(names.begin(), names.end());
  auto index_of = [&](const std::string& q) {
    return static_cast<size_t>(std::lower_bound(r.queues.begin(), r.queues.end(), q) -
                               r.queues.begin());
  };

  r.ledger_share.assign(r.queues.size(), 0.0);
  std::vector<int64_t> learned(r.queues.size(), 0);
  for (const auto& [name, documents] : ledger) {
    learned[index_of(name)] += documents;
    r.ledger_documents += documents;
  }
  for (size_t q = 0; q < r.queues.size(); ++q) {
    if (r.ledger_documents > 0) {
      r.ledger_share[q] =
          static_cast<double>(learned[q]) / static_cast<double>(r.ledger_documents);
    }
  }

  Sums period;
  period.per_queue.assign(r.queues.size(), 0);
  std::map<std::string, Sums> by_day;
  for (const LoggedDecision& d : decisions) {
    const size_t q = index_of(d.queue);
    Add(d, q, &period);
    Sums& day = by_day[d.time.substr(0, 10)];
    if (day.per_queue.empty()) day.per_queue.assign(r.queues.size(), 0);
    Add(d, q, &day);
  }
  r.period = FiguresOf(period);

  auto moved = [&](double value, double baseline) {
    return std::fabs(value - baseline) > options.change;
  };
  for (const auto& [date, sums] : by_day) {
    DriftDay day{date, FiguresOf(sums)};
    const DriftFigures& f = day.figures;
    if (f.decisions >= options.min_decisions) {
      for (size_t q = 0; q < r.queues.size(); ++q) {
        if (moved(f.queue_share[q], r.ledger_share[q])) {
          r.alerts.push_back(
              {date, DriftFigure::kQueueShare, r.queues[q], f.queue_share[q], r.ledger_share[q]});
        }
      }
      if (moved(f.held_share, r.period.held_share)) {
        r.alerts.push_back({date, DriftFigure::kHeldShare, "", f.held_share, r.period.held_share});
      }
      if (moved(f.mean_confidence, r.period.mean_confidence)) {
        r.alerts.push_back({date, DriftFigure::kMeanConfidence, "", f.mean_confidence,
                            r.period.mean_confidence});
      }
      if (f.unknown_share && r.period.unknown_share &&
          moved(*f.unknown_share, *r.period.unknown_share)) {
        r.alerts.push_back({date, DriftFigure::kUnknownShare, "", *f.unknown_share,
                            *r.period.unknown_share});
      }
    }
    r.days.push_back(std::move(day));
  }
  return r;
}

}  // namespace chute
