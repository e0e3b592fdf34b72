// The fingerprint of a model: SHA-256 (FIPS 180-4) over a canonical text of
// its settings and its sorted counts, so that two stores whose models route
// every document alike have the same fingerprint whatever the order their
// documents were learned in, and any difference in a count changes it.
#ifndef CHUTE_STORE_FINGERPRINT_H_
#define CHUTE_STORE_FINGERPRINT_H_

#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "classify/model_counts.h"
#include "store/store_settings.h"

namespace chute {

// The canonical text hashed, line by line ('\n' after each):
//   chute-model 1
//   alpha <shortest decimal>, prior learned|uniform, bigrams on|off,
//   numbers keep|fold, min_length <n>, max_length <n>   (one per line)
//   q <name length>:<name> <documents> <tokens> <hand-set prior or ->
//        for each queue with documents, in byte order of names
//   t <term length>:<term> <queue index> <N(q, w)>
//        for each non-zero count, terms in byte order, then queue index
// Queues without documents do not route, so they are left out; keep_text
// does not change the model, so it is left out too.
// REQUIRES: counts.terms sorted by bytes (as Store::LoadModelCounts gives
// them); queues in any order.
// Returns 64 lowercase hex digits.
std::string ModelFingerprint(const StoreSettings& settings, const ModelCounts& counts);

// The same fingerprint fed one term row at a time, so that a store can hash
// its counts as it reads them, without holding them all. ModelFingerprint
// is this over the rows of counts.
class ModelFingerprinter {
 public:
  // queues: the model's queues in any order; each row gives one count per
  // queue, in this order. Only name, documents, tokens and set_prior are read.
  ModelFingerprinter(const StoreSettings& settings, const std::vector<QueueCounts>& queues);
  ~ModelFingerprinter();
  ModelFingerprinter(const ModelFingerprinter&) = delete;
  ModelFingerprinter& operator=(const ModelFingerprinter&) = delete;

  // REQUIRES: terms in byte order, each once; row[i] is N(queues[i], term).
  void AddRow(std::string_view term, const int64_t* row);
  // 64 lowercase hex digits. Call once, after the last row.
  std::string Hex();

 private:
  class Hasher;
  std::unique_ptr<Hasher> hasher_;
  std::vector<size_t> order_;  // queues with documents, by name
};

}  // namespace chute

#endif  // CHUTE_STORE_FINGERPRINT_H_
