#include "classify/prior.h"

namespace chute {

std::vector<double> ComputePriors(const std::vector<QueueCounts>& queues,
                                  PriorMode mode) {
  std::vector<double> prior(queues.size(), 0.0);
  double set_mass = 0.0;
  double free_documents = 0.0;
  size_t free_queues = 0;
  for (const QueueCounts& q : queues) {
    if (q.set_prior) {
      set_mass += *q.set_prior;
    } else {
      free_documents += static_cast<double>(q.documents);
      ++free_queues;
    }
  }
  double rest = set_mass < 1.0 ? 1.0 - set_mass : 0.0;
  for (size_t i = 0; i < queues.size(); ++i) {
    const QueueCounts& q = queues[i];
    if (q.set_prior) {
      prior[i] = *q.set_prior;
    } else if (mode == PriorMode::kUniform || free_documents == 0.0) {
      prior[i] = rest / static_cast<double>(free_queues);
    } else {
      prior[i] = rest * static_cast<double>(q.documents) / free_documents;
    }
  }
  return prior;
}

}  // namespace chute
