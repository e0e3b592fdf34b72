#include "classify/production_figures.h"

#include <map>

namespace chute {

namespace {

void Count(const LoggedDecision& d, DecisionCounts* c) {
  ++c->decisions;
  const bool moved = d.review == "moved";
  if (d.held.empty()) {
    ++c->routed;
  } else if (d.held == "threshold") {
    ++c->held_threshold;
  } else if (d.held == "no_terms") {
    ++c->held_no_terms;
  } else if (d.held == "min_documents") {
    ++c->held_min_documents;
  }
  if (d.held == "audit") {
    ++c->audit_drawn;
    if (moved) {
      ++c->audit_reviewed;
      c->audit_correct += d.reviewed_queue == d.queue;
    }
    return;
  }
  if (moved && d.reviewed_queue != d.queue) ++c->corrections;
  if (moved && !d.held.empty() && d.reviewed_queue == d.queue) ++c->held_confirmed;
  if (d.review == "left") ++c->left_confirmed;
}

void Finish(double z, DecisionCounts* c) {
  c->audit_unknown = c->audit_drawn - c->audit_reviewed;
  c->precision = WilsonInterval(c->audit_correct, c->audit_reviewed, z);
}

}  // namespace

ProductionFigures ComputeProductionFigures(std::span<const LoggedDecision> decisions, double z) {
  ProductionFigures out;
  std::map<std::string, DecisionCounts> per_queue;
  for (const LoggedDecision& d : decisions) {
    Count(d, &out.total);
    Count(d, &per_queue[d.queue]);
    if (out.first_time.empty() || d.time < out.first_time) out.first_time = d.time;
    if (d.time > out.last_time) out.last_time = d.time;
  }
  Finish(z, &out.total);
  for (auto& [queue, counts] : per_queue) {
    Finish(z, &counts);
    out.queues.push_back({queue, counts});
  }
  return out;
}

}  // namespace chute
