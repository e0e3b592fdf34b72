// The counts that term rankings work from: per queue, how often each term
// occurred (occurrences) and, when known, in how many of the queue's
// documents it occurred (document counts). Plain data; nothing here knows
// where the numbers came from.
#ifndef CHUTE_CLASSIFY_TERM_TABLE_H_
#define CHUTE_CLASSIFY_TERM_TABLE_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <unordered_map>
#include <utility>
#include <vector>

#include "classify/model_counts.h"

namespace chute {

struct TermTable {
  // Queue names, ordered by their bytes. Queues without documents may be
  // present; they have no counts.
  std::vector<std::string> queues;
  std::vector<int64_t> documents;  // per queue: documents learned for it
  std::vector<std::string> terms;  // row -> term text, each distinct
  // Occurrences of the term in the queue's documents, N(q, w), row-major:
  // counts[row * queues.size() + q].
  std::vector<int64_t> counts;
  // Documents of the queue that contain the term, same layout as counts,
  // when has_document_counts; else empty (TermTableFromCounts).
  std::vector<int64_t> document_counts;
  bool has_document_counts = false;

  size_t queue_count() const { return queues.size(); }
  size_t term_count() const { return terms.size(); }
  int64_t count(size_t row, size_t q) const { return counts[row * queues.size() + q]; }
  int64_t document_count(size_t row, size_t q) const {
    return document_counts[row * queues.size() + q];
  }
  // The index of a queue by name, or -1.
  int64_t FindQueue(std::string_view name) const;
};

// The table of a model's counts: occurrences only, no document counts.
// Queues keep the order of `counts` (the store gives them ordered by name).
TermTable TermTableFromCounts(const ModelCounts& counts);

// Builds a table, with document counts, from documents one at a time (the
// ledger of learned documents, each with its own term counts).
class TermTableBuilder {
 public:
  // Makes a queue known even if no document of it is added.
  void AddQueue(std::string_view name);
  // One document of `queue` with its term counts.
  // REQUIRES: terms distinct; counts > 0.
  void AddDocument(std::string_view queue,
                   const std::vector<std::pair<std::string, int64_t>>& terms);
  // The table: queues ordered by name, terms ordered by their bytes. Leaves
  // the builder empty.
  TermTable Build();

 private:
  size_t QueueIndex(std::string_view name);

  std::vector<std::string> queues_;  // in order of first appearance
  std::vector<int64_t> documents_;
  std::unordered_map<std::string, size_t> queue_index_;
  std::vector<std::string> terms_;  // in order of first appearance
  std::unordered_map<std::string, uint32_t> row_;
  // Per queue, per row (grown on demand): occurrences and documents.
  std::vector<std::vector<int64_t>> counts_;
  std::vector<std::vector<int64_t>> document_counts_;
};

}  // namespace chute

#endif  // CHUTE_CLASSIFY_TERM_TABLE_H_
