// Plain structs that carry counts from the store into classify/. Nothing
// here knows where the numbers came from.
#ifndef CHUTE_CLASSIFY_MODEL_COUNTS_H_
#define CHUTE_CLASSIFY_MODEL_COUNTS_H_

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace chute {

enum class PriorMode {
  kLearned,  // prior(q) = documents of q / all documents
  kUniform,  // prior(q) = 1 / number of queues
};

// The model settings that do not concern tokenizing.
struct ModelOptions {
  // Lidstone smoothing added to every count; 1 is Laplace smoothing.
  // REQUIRES: alpha > 0.
  double alpha = 1.0;
  // Prior of the queues that have no prior set by hand.
  PriorMode prior = PriorMode::kLearned;
};

struct QueueCounts {
  std::string name;
  int64_t documents = 0;  // documents learned for the queue
  int64_t tokens = 0;     // N(q): sum over terms of N(q, w)
  // Prior set by hand (0 < p < 1), or none.
  std::optional<double> set_prior;
};

// Everything a model is built from. Rows are terms; columns are queues.
struct ModelCounts {
  std::vector<QueueCounts> queues;
  std::vector<std::string> terms;  // row -> term text, each distinct
  // N(q, w), row-major: counts[row * queues.size() + q].
  std::vector<int64_t> counts;
};

}  // namespace chute

#endif  // CHUTE_CLASSIFY_MODEL_COUNTS_H_
