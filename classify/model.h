// Multinomial naive Bayes: a model snapshot and its scorer.
//
// For a document d with term counts n_w (McCallum & Nigam, "A Comparison of
// Event Models for Naive Bayes Text Classification", AAAI-98 Workshop on
// Learning for Text Categorization, 1998; Manning, Raghavan & Schütze,
// Introduction to Information Retrieval, 2008, §13.2):
//
//   score(q) = log prior(q) + Σ_w n_w · log θ(q,w)
//   θ(q,w)   = (N(q,w) + α) / (N(q) + α·|V|)          (Lidstone; α = 1 Laplace)
//   P(q | d) = exp(score(q) − logsumexp_q' score(q'))
//
// |V| is the number of terms with a non-zero count in any queue. Terms never
// seen in learning are left out of the sum. Everything is in log space, so
// long documents cannot underflow.
//
// A Model is immutable once built and safe to share between threads.
#ifndef CHUTE_CLASSIFY_MODEL_H_
#define CHUTE_CLASSIFY_MODEL_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "classify/model_counts.h"
#include "classify/term_index.h"

namespace chute {

// A document as the scorer sees it: (term row, count) pairs, rows distinct.
using DocumentRows = std::vector<std::pair<uint32_t, int64_t>>;

// One queue's result for a document.
struct QueuePosterior {
  uint32_t queue;        // index into Model::queues()
  double score;          // unnormalised log score(q)
  double log_posterior;  // log P(q | d)
  double posterior;      // P(q | d)
};

struct Decision {
  // Every queue, best first (ties broken by queue index).
  std::vector<QueuePosterior> ranked;
  int64_t known_terms = 0;    // occurrences of terms the model knows
  int64_t unknown_terms = 0;  // occurrences left out of the sum
  // True when the document has no term the model knows: the decision rests
  // on the prior alone.
  bool no_terms() const { return known_terms == 0; }
};

class Model {
 public:
  // Builds the snapshot: log priors and a dense row-major table of log θ.
  // Queues without documents are kept out of the model (they cannot be
  // routed to). REQUIRES: options.alpha > 0; counts consistent (N(q) equals
  // the row sum of column q).
  static Model Build(const ModelCounts& counts, const ModelOptions& options);

  Model(Model&&) = default;
  Model& operator=(Model&&) = default;
  Model(const Model&) = delete;  // large; share by reference
  Model& operator=(const Model&) = delete;

  size_t queue_count() const { return queues_.size(); }
  const std::vector<QueueCounts>& queues() const { return queues_; }
  size_t vocabulary_size() const { return terms_.size(); }
  const std::vector<std::string>& terms() const { return terms_; }
  const ModelOptions& options() const { return options_; }

  double prior(size_t q) const { return priors_[q]; }
  double log_prior(size_t q) const { return log_priors_[q]; }
  // log θ(q, w) for a term row.
  double log_theta(uint32_t row, size_t q) const {
    return log_theta_[static_cast<size_t>(row) * queues_.size() + q];
  }
  // log θ(q, w) of every queue for one row, contiguous.
  const double* log_theta_row(uint32_t row) const {
    return log_theta_.data() + static_cast<size_t>(row) * queues_.size();
  }

  // The row of a term, or -1 when the model does not know it.
  int64_t FindTerm(std::string_view term) const;

  // Counts terms into rows, in increasing row order. Unknown terms are
  // counted in *unknown.
  void ToRows(const std::vector<std::string>& terms, DocumentRows* rows,
              int64_t* unknown) const;

  // score(q) for every queue, into *scores (resized to queue_count()).
  void Score(const DocumentRows& rows, std::vector<double>* scores) const;

  // Scores, normalises and ranks. REQUIRES: queue_count() > 0.
  Decision Decide(const DocumentRows& rows, int64_t unknown_terms) const;

 private:
  Model() = default;

  ModelOptions options_;
  std::vector<QueueCounts> queues_;
  std::vector<double> priors_;
  std::vector<double> log_priors_;
  std::vector<std::string> terms_;
  TermIndex rows_;  // term -> row (ids are rows)
  std::vector<double> log_theta_;  // [row * queue_count + q]
};

}  // namespace chute

#endif  // CHUTE_CLASSIFY_MODEL_H_
