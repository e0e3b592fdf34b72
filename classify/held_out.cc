#include "classify/held_out.h"

#include <algorithm>

#include "classify/cross_validation.h"

namespace chute {

bool EvaluateHeldOut(ModelCounts counts,
                     const std::vector<HeldOutDocument>& held,
                     const std::vector<std::string>& labels,
                     const ModelOptions& options, std::vector<Prediction>* out,
                     std::string* error) {
  out->clear();
  const size_t nq = counts.queues.size();
  {
    const CountsRowIndex index(counts);
    for (const HeldOutDocument& d : held) {
      if (!d.counted) continue;
      const uint32_t q = *d.counted;
      int64_t tokens = 0;
      for (const auto& [term, n] : d.terms) {
        const int64_t row = index.Find(term);
        if (q >= nq || row < 0 ||
            counts.counts[static_cast<size_t>(row) * nq + q] < n) {
          *error =
              "a held-out document's counts exceed the counts it is said to be "
              "in";
          return false;
        }
        counts.counts[static_cast<size_t>(row) * nq + q] -= n;
        tokens += n;
      }
      counts.queues[q].documents -= 1;
      counts.queues[q].tokens -= tokens;
    }
  }
  // Terms whose counts all went to zero leave |V| (Model::Build).
  const Model model = Model::Build(counts, options);
  if (model.queue_count() == 0) {
    *error =
        "no queue is left to route to once the held-out documents are taken "
        "out";
    return false;
  }
  const std::vector<uint32_t> label_of_queue = LabelsOfQueues(model, labels);
  DocumentRows rows;
  for (const HeldOutDocument& d : held) {
    rows.clear();
    int64_t unknown = 0;
    for (const auto& [term, n] : d.terms) {
      const int64_t row = model.FindTerm(term);
      if (row < 0) {
        unknown += n;
      } else {
        rows.emplace_back(static_cast<uint32_t>(row), n);
      }
    }
    std::sort(rows.begin(), rows.end());
    out->push_back(PredictionFromDecision(
        model.Decide(rows, unknown), label_of_queue, labels.size(), d.truth));
  }
  return true;
}

}  // namespace chute
