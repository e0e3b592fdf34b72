// Evaluating a model on documents held out of it, by exact subtraction:
// the model is built from the counts minus the held-out documents' own
// counts (as cross_validation.h does for a fold), so it is the model a
// store would have had without them, and each held-out document is routed
// by it. The promotion gate evaluates the current model and a candidate
// this way on the same documents.
#ifndef CHUTE_CLASSIFY_HELD_OUT_H_
#define CHUTE_CLASSIFY_HELD_OUT_H_

#include <cstdint>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "classify/model.h"
#include "classify/model_counts.h"
#include "classify/prediction.h"

namespace chute {

struct HeldOutDocument {
  // The column of the counts the document is counted in, or none (the
  // model never learned it): subtracted from there before building.
  std::optional<uint32_t> counted;
  uint32_t truth = 0;  // its label: the queue it belongs in
  std::vector<std::pair<std::string, int64_t>>
      terms;  // its own counts, distinct terms
};

// Subtracts every held-out document from `counts` (a copy), builds the
// model with options and predicts each document, in order, with labels
// indexing `labels` (which must hold every queue of counts with
// documents). Returns false, with a one-line reason, when a document's
// counts exceed the counts it is said to be counted in, or when no queue
// is left to route to.
bool EvaluateHeldOut(ModelCounts counts,
                     const std::vector<HeldOutDocument>& held,
                     const std::vector<std::string>& labels,
                     const ModelOptions& options, std::vector<Prediction>* out,
                     std::string* error);

}  // namespace chute

#endif  // CHUTE_CLASSIFY_HELD_OUT_H_
