#include "classify/model.h"

#include <algorithm>
#include <cmath>
#include <limits>

#include "classify/log_sum_exp.h"
#include "classify/prior.h"

namespace chute {

Model Model::Build(const ModelCounts& counts, const ModelOptions& options) {
  Model m;
  m.options_ = options;
  const size_t all_queues = counts.queues.size();
  std::vector<size_t> kept;  // columns of queues with documents
  for (size_t q = 0; q < all_queues; ++q) {
    if (counts.queues[q].documents > 0) {
      kept.push_back(q);
      m.queues_.push_back(counts.queues[q]);
    }
  }
  const size_t nq = kept.size();
  m.priors_ = ComputePriors(m.queues_, options.prior);
  m.log_priors_.resize(nq);
  for (size_t q = 0; q < nq; ++q) m.log_priors_[q] = std::log(m.priors_[q]);

  // Vocabulary: terms with a non-zero count in a kept queue.
  std::vector<size_t> rows;
  rows.reserve(counts.terms.size());
  for (size_t r = 0; r < counts.terms.size(); ++r) {
    const int64_t* row = counts.counts.data() + r * all_queues;
    bool any = false;
    for (size_t q : kept) any = any || row[q] != 0;
    if (any) rows.push_back(r);
  }
  const double v = static_cast<double>(rows.size());
  std::vector<double> log_denominator(nq);
  for (size_t q = 0; q < nq; ++q) {
    log_denominator[q] =
        std::log(static_cast<double>(m.queues_[q].tokens) + options.alpha * v);
  }
  m.terms_.reserve(rows.size());
  size_t bytes = 0;
  for (size_t r : rows) bytes += counts.terms[r].size();
  m.rows_.Reserve(rows.size(), bytes);
  m.log_theta_.resize(rows.size() * nq);
  for (size_t i = 0; i < rows.size(); ++i) {
    const int64_t* row = counts.counts.data() + rows[i] * all_queues;
    for (size_t q = 0; q < nq; ++q) {
      m.log_theta_[i * nq + q] =
          std::log(static_cast<double>(row[kept[q]]) + options.alpha) -
          log_denominator[q];
    }
    m.terms_.push_back(counts.terms[rows[i]]);
    m.rows_.Insert(m.terms_.back());
  }
  return m;
}

int64_t Model::FindTerm(std::string_view term) const { return rows_.Find(term); }

void Model::ToRows(const std::vector<std::string>& terms, DocumentRows* rows,
                   int64_t* unknown) const {
  rows->clear();
  *unknown = 0;
  // Look every term up, then sort the rows and count runs: no allocation
  // per term, and the rows come out in increasing order (cache friendly).
  std::vector<uint32_t> found;
  found.reserve(terms.size());
  for (const std::string& t : terms) {
    const int64_t row = rows_.Find(t);
    if (row < 0) {
      ++*unknown;
    } else {
      found.push_back(static_cast<uint32_t>(row));
    }
  }
  std::sort(found.begin(), found.end());
  for (size_t i = 0; i < found.size();) {
    size_t j = i + 1;
    while (j < found.size() && found[j] == found[i]) ++j;
    rows->emplace_back(found[i], static_cast<int64_t>(j - i));
    i = j;
  }
}

void Model::Score(const DocumentRows& rows, std::vector<double>* scores) const {
  const size_t nq = queues_.size();
  scores->assign(log_priors_.begin(), log_priors_.end());
  double* s = scores->data();
  for (const auto& [row, count] : rows) {
    const double* theta = log_theta_row(row);
    const double n = static_cast<double>(count);
    for (size_t q = 0; q < nq; ++q) s[q] += n * theta[q];
  }
}

Decision Model::Decide(const DocumentRows& rows, int64_t unknown_terms) const {
  std::vector<double> scores;
  Score(rows, &scores);
  const double norm = LogSumExp(scores);
  Decision d;
  d.unknown_terms = unknown_terms;
  for (const auto& [row, count] : rows) d.known_terms += count;
  d.ranked.reserve(scores.size());
  for (size_t q = 0; q < scores.size(); ++q) {
    const double lp = scores[q] - norm;
    d.ranked.push_back({static_cast<uint32_t>(q), scores[q], lp, std::exp(lp)});
  }
  std::stable_sort(d.ranked.begin(), d.ranked.end(),
                   [](const QueuePosterior& a, const QueuePosterior& b) {
                     return a.score > b.score;
                   });
  return d;
}

}  // namespace chute
