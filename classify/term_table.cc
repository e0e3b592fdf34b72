#include "classify/term_table.h"

#include <algorithm>
#include <numeric>

namespace chute {

int64_t TermTable::FindQueue(std::string_view name) const {
  for (size_t q = 0; q < queues.size(); ++q) {
    if (queues[q] == name) return static_cast<int64_t>(q);
  }
  return -1;
}

TermTable TermTableFromCounts(const ModelCounts& counts) {
  TermTable t;
  for (const QueueCounts& q : counts.queues) {
    t.queues.push_back(q.name);
    t.documents.push_back(q.documents);
  }
  t.terms = counts.terms;
  t.counts = counts.counts;
  return t;
}

size_t TermTableBuilder::QueueIndex(std::string_view name) {
  std::string key(name);
  auto [it, inserted] = queue_index_.try_emplace(key, queues_.size());
  if (inserted) {
    queues_.push_back(std::move(key));
    documents_.push_back(0);
    counts_.emplace_back();
    document_counts_.emplace_back();
  }
  return it->second;
}

void TermTableBuilder::AddQueue(std::string_view name) { QueueIndex(name); }

void TermTableBuilder::AddDocument(std::string_view queue,
                                   const std::vector<std::pair<std::string, int64_t>>& terms) {
  const size_t q = QueueIndex(queue);
  ++documents_[q];
  std::vector<int64_t>& counts = counts_[q];
  std::vector<int64_t>& docs = document_counts_[q];
  for (const auto& [term, n] : terms) {
    auto [it, inserted] = row_.try_emplace(term, static_cast<uint32_t>(terms_.size()));
    if (inserted) terms_.push_back(term);
    const size_t row = it->second;
    if (counts.size() <= row) {
      counts.resize(terms_.size(), 0);
      docs.resize(terms_.size(), 0);
    }
    counts[row] += n;
    docs[row] += 1;
  }
}

TermTable TermTableBuilder::Build() {
  const size_t nq = queues_.size();
  std::vector<size_t> queue_order(nq);
  std::iota(queue_order.begin(), queue_order.end(), size_t{0});
  std::sort(queue_order.begin(), queue_order.end(),
            [&](size_t a, size_t b) { return queues_[a] < queues_[b]; });
  std::vector<uint32_t> term_order(terms_.size());
  std::iota(term_order.begin(), term_order.end(), uint32_t{0});
  std::sort(term_order.begin(), term_order.end(),
            [&](uint32_t a, uint32_t b) { return terms_[a] < terms_[b]; });

  TermTable t;
  for (size_t old_q : queue_order) {
    t.queues.push_back(queues_[old_q]);
    t.documents.push_back(documents_[old_q]);
  }
  t.terms.reserve(terms_.size());
  t.counts.assign(terms_.size() * nq, 0);
  t.document_counts.assign(terms_.size() * nq, 0);
  t.has_document_counts = true;
  for (uint32_t old_row : term_order) t.terms.push_back(std::move(terms_[old_row]));
  // One queue at a time, freeing its columns as it goes, so that the
  // builder's copy and the table's are not both whole at once.
  for (size_t q = 0; q < nq; ++q) {
    const size_t old_q = queue_order[q];
    std::vector<int64_t> counts = std::move(counts_[old_q]);
    std::vector<int64_t> docs = std::move(document_counts_[old_q]);
    for (size_t row = 0; row < term_order.size(); ++row) {
      const uint32_t old_row = term_order[row];
      if (old_row < counts.size()) {
        t.counts[row * nq + q] = counts[old_row];
        t.document_counts[row * nq + q] = docs[old_row];
      }
    }
  }
  *this = TermTableBuilder();
  return t;
}

}  // namespace chute
