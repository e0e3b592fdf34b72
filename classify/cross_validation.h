// k-fold cross-validation of a learned store without reading a document
// again.
//
// Counts are additive: the model of fold f is the whole store's counts
// minus the counts of the documents held out in f, exactly the model a
// fresh store would build from the other folds' documents. So each fold
// costs one subtraction and one Model::Build, and every held-out document
// is routed from the counts the ledger keeps for it — no file is read or
// tokenized again. Within a fold's model, as in any model:
//  - a term whose count drops to zero in every queue leaves |V|, and held-
//    out terms the fold's model does not know are left out of the sum;
//  - a queue none of whose documents is left to learn (all held out in the
//    fold) leaves the model: the fold cannot route to it, its posterior is
//    0 there, and FoldSummary::queues_left_out names it;
//  - priors set by hand keep their values; learned priors come from the
//    fold's documents.
// The folds' predictions are pooled: every document is predicted once, by
// the model that did not learn it, and every figure of an evaluation is
// computed on the pooled predictions (see metrics.h for F1).
#ifndef CHUTE_CLASSIFY_CROSS_VALIDATION_H_
#define CHUTE_CLASSIFY_CROSS_VALIDATION_H_

#include <cstdint>
#include <functional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "classify/model.h"
#include "classify/model_counts.h"
#include "classify/prediction.h"
#include "classify/term_index.h"

namespace chute {

// A learned document by rows of a ModelCounts (not of a Model).
struct CountedDocument {
  uint32_t queue = 0;  // column in ModelCounts::queues
  uint32_t fold = 0;   // 0 .. folds−1
  DocumentRows rows;   // (row of ModelCounts::terms, count); rows distinct, counts > 0
};

// Finds the row of a term in a ModelCounts (whose terms are distinct).
class CountsRowIndex {
 public:
  explicit CountsRowIndex(const ModelCounts& counts);
  // The row of term, or -1.
  int64_t Find(std::string_view term) const { return rows_.Find(term); }

 private:
  TermIndex rows_;  // ids are rows
};

struct FoldSummary {
  int64_t held_out = 0;    // documents routed in this fold
  int64_t correct = 0;     // of them, routed to their own queue
  int64_t learned = 0;     // documents its model learned
  int64_t vocabulary = 0;  // |V| of its model (0 for a fold with no document: none is built)
  // Labels whose every document is held out in this fold: its model cannot
  // route to them.
  std::vector<uint32_t> queues_left_out;
};

struct CrossValidation {
  // The queues with documents, in the order of ModelCounts::queues.
  std::vector<std::string> labels;
  // One per document, in the order given; labels index `labels`.
  std::vector<Prediction> predictions;
  std::vector<FoldSummary> folds;
};

// Runs the cross-validation described above. `whole` is changed during the
// call (each fold's counts are subtracted and added back) and is as it was
// when the call returns. Returns false, with a one-line reason in *error,
// when the documents do not add up to `whole` (per queue: documents and
// tokens; no count may go below zero) — a store read while it changed — or
// when a fold's model would have no queue at all.
// REQUIRES: folds >= 2; every document's fold < folds; options.alpha > 0.
bool CrossValidate(ModelCounts* whole, std::span<const CountedDocument> documents,
                   uint32_t folds, const ModelOptions& options, CrossValidation* out,
                   std::string* error);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_CROSS_VALIDATION_H_
