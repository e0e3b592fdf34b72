#include "classify/explanation.h"

#include <algorithm>
#include <cmath>
#include <map>
#include <utility>

#include "classify/neumaier_sum.h"

namespace chute {

void SplitTerms(const Model& model, const std::vector<std::string>& terms,
                DocumentRows* rows, std::vector<IgnoredTerm>* ignored) {
  int64_t unknown = 0;
  model.ToRows(terms, rows, &unknown);
  ignored->clear();
  if (unknown == 0) return;
  std::map<std::string_view, int64_t> counts;
  for (const std::string& t : terms) {
    if (model.FindTerm(t) < 0) ++counts[t];
  }
  ignored->reserve(counts.size());
  for (const auto& [term, count] : counts) ignored->push_back({std::string(term), count});
  // The map gave them in term order; a stable sort by count keeps it for ties.
  std::stable_sort(ignored->begin(), ignored->end(),
                   [](const IgnoredTerm& a, const IgnoredTerm& b) { return a.count > b.count; });
}

std::vector<TermContribution> ComputeContributions(const Model& model,
                                                   const DocumentRows& rows,
                                                   uint32_t queue,
                                                   uint32_t runner_up) {
  std::vector<TermContribution> out;
  out.reserve(rows.size());
  for (const auto& [row, count] : rows) {
    const double diff = model.log_theta(row, queue) - model.log_theta(row, runner_up);
    out.push_back({model.terms()[row], count, static_cast<double>(count) * diff});
  }
  return out;
}

Explanation Explain(const Model& model, const DocumentRows& rows,
                    std::vector<IgnoredTerm> ignored, const ExplainOptions& options) {
  int64_t unknown = 0;
  for (const IgnoredTerm& t : ignored) unknown += t.count;
  Explanation e;
  e.decision = model.Decide(rows, unknown);
  e.ignored = std::move(ignored);
  e.queue = e.decision.ranked.front().queue;
  if (e.decision.ranked.size() < 2 || std::isinf(e.decision.ranked[1].score)) return e;
  const QueuePosterior& best = e.decision.ranked[0];
  const QueuePosterior& second = e.decision.ranked[1];
  e.runner_up = second.queue;
  e.score_gap = best.score - second.score;
  e.prior_share = model.log_prior(best.queue) - model.log_prior(second.queue);

  std::vector<TermContribution> all =
      ComputeContributions(model, rows, best.queue, second.queue);
  NeumaierSum sum;
  sum.Add(e.prior_share);
  for (const TermContribution& t : all) sum.Add(t.contribution);
  e.contribution_sum = sum.value();

  // Positive contributions to the front, largest first; negative ones to the
  // back, most negative last; exact zeros in between.
  std::sort(all.begin(), all.end(), [](const TermContribution& a, const TermContribution& b) {
    if (a.contribution != b.contribution) return a.contribution > b.contribution;
    return a.term < b.term;
  });
  for (const TermContribution& t : all) {
    if (t.contribution > 0) ++e.terms_toward_queue;
    if (t.contribution < 0) ++e.terms_toward_runner_up;
  }
  const size_t up = std::min(options.top, e.terms_toward_queue);
  e.toward_queue.assign(all.begin(), all.begin() + static_cast<std::ptrdiff_t>(up));
  const size_t down = std::min(options.top, e.terms_toward_runner_up);
  // Most negative first; among equal contributions, by term.
  auto negative_begin = all.end() - static_cast<std::ptrdiff_t>(e.terms_toward_runner_up);
  std::stable_sort(negative_begin, all.end(),
                   [](const TermContribution& a, const TermContribution& b) {
                     return a.contribution < b.contribution;
                   });
  e.toward_runner_up.assign(negative_begin, negative_begin + static_cast<std::ptrdiff_t>(down));
  return e;
}

Explanation ExplainTerms(const Model& model, const std::vector<std::string>& terms,
                         const ExplainOptions& options) {
  DocumentRows rows;
  std::vector<IgnoredTerm> ignored;
  SplitTerms(model, terms, &rows, &ignored);
  return Explain(model, rows, std::move(ignored), options);
}

}  // namespace chute
