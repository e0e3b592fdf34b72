// Documents counted for learning, aggregated in memory so that a whole
// command's counts reach the store in one transaction, written once, in key
// order.
#ifndef CHUTE_STORE_LEARN_BATCH_H_
#define CHUTE_STORE_LEARN_BATCH_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "classify/term_index.h"

namespace chute {

class LearnBatch {
 public:
  struct Document {
    std::string digest;  // SHA-256 of the raw bytes, lowercase hex
    std::string queue;   // REQUIRES: a valid queue name
    std::string source;  // where it came from (a path, or "-")
    // (batch term id, count), sorted by term id; counts > 0.
    std::vector<std::pair<uint32_t, int64_t>> counts;
    int64_t tokens = 0;  // sum of counts
    // The text that was tokenized, packed by TextCodec (text_codec.h) on
    // the thread that tokenized it; empty when the text is not kept.
    std::string packed_text;
  };

  // Adds a document with its terms in any order, and its packed text (empty
  // when not kept). REQUIRES: terms not empty.
  void Add(std::string digest, std::string queue, std::string source,
           const std::vector<std::string>& terms, std::string packed_text = {});

  const std::vector<Document>& documents() const { return documents_; }
  std::string_view term(uint32_t id) const { return terms_.term(id); }
  size_t term_count() const { return terms_.size(); }
  bool empty() const { return documents_.empty(); }

 private:
  std::vector<Document> documents_;
  TermIndex terms_;  // batch term id -> text
};

}  // namespace chute

#endif  // CHUTE_STORE_LEARN_BATCH_H_
