#include "store/learn_batch.h"

#include <algorithm>

namespace chute {

void LearnBatch::Add(std::string digest, std::string queue, std::string source,
                     const std::vector<std::string>& terms, std::string packed_text) {
  Document doc{std::move(digest), std::move(queue), std::move(source), {}, 0,
               std::move(packed_text)};
  std::vector<uint32_t> ids;
  ids.reserve(terms.size());
  for (const std::string& t : terms) ids.push_back(terms_.Insert(t));
  std::sort(ids.begin(), ids.end());
  for (size_t i = 0; i < ids.size();) {
    size_t j = i;
    while (j < ids.size() && ids[j] == ids[i]) ++j;
    doc.counts.emplace_back(ids[i], static_cast<int64_t>(j - i));
    i = j;
  }
  doc.tokens = static_cast<int64_t>(ids.size());
  documents_.push_back(std::move(doc));
}

}  // namespace chute
