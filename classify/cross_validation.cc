#include "classify/cross_validation.h"

#include <utility>

namespace chute {

CountsRowIndex::CountsRowIndex(const ModelCounts& counts) {
  size_t bytes = 0;
  for (const std::string& t : counts.terms) bytes += t.size();
  rows_.Reserve(counts.terms.size(), bytes);
  for (const std::string& t : counts.terms) rows_.Insert(t);
}

namespace {

// Adds sign × a document's counts to *counts. Returns false, leaving the
// counts as they were, when a count would go below zero.
bool Apply(const CountedDocument& doc, int64_t sign, ModelCounts* counts) {
  const size_t nq = counts->queues.size();
  int64_t tokens = 0;
  for (size_t i = 0; i < doc.rows.size(); ++i) {
    int64_t& n = counts->counts[doc.rows[i].first * nq + doc.queue];
    if (sign < 0 && n < doc.rows[i].second) {
      for (size_t j = 0; j < i; ++j) counts->counts[doc.rows[j].first * nq + doc.queue] += doc.rows[j].second;
      return false;
    }
    n += sign * doc.rows[i].second;
    tokens += doc.rows[i].second;
  }
  QueueCounts& q = counts->queues[doc.queue];
  q.documents += sign;
  q.tokens += sign * tokens;
  return true;
}

}  // namespace

bool CrossValidate(ModelCounts* whole, std::span<const CountedDocument> documents,
                   uint32_t folds, const ModelOptions& options, CrossValidation* out,
                   std::string* error) {
  *out = CrossValidation();
  const size_t nq = whole->queues.size();
  const size_t rows = whole->terms.size();

  // Labels: the queues with documents.
  std::vector<int64_t> label_of_column(nq, -1);
  for (size_t q = 0; q < nq; ++q) {
    if (whole->queues[q].documents > 0) {
      label_of_column[q] = static_cast<int64_t>(out->labels.size());
      out->labels.push_back(whole->queues[q].name);
    }
  }

  // The documents must add up to the whole, queue by queue.
  std::vector<int64_t> documents_of(nq, 0), tokens_of(nq, 0);
  std::vector<std::vector<size_t>> in_fold(folds);
  for (size_t i = 0; i < documents.size(); ++i) {
    const CountedDocument& d = documents[i];
    if (d.queue >= nq) {
      *error = "a document names a queue the counts do not have";
      return false;
    }
    if (d.fold >= folds) {
      *error = "a document's fold is not below the number of folds";
      return false;
    }
    for (const auto& [row, n] : d.rows) {
      if (row >= rows || n <= 0) {
        *error = "a document names a term the counts do not have";
        return false;
      }
      tokens_of[d.queue] += n;
    }
    ++documents_of[d.queue];
    in_fold[d.fold].push_back(i);
  }
  for (size_t q = 0; q < nq; ++q) {
    if (documents_of[q] != whole->queues[q].documents || tokens_of[q] != whole->queues[q].tokens) {
      *error = "queue '" + whole->queues[q].name + "': the ledger holds " +
               std::to_string(documents_of[q]) + " documents and " +
               std::to_string(tokens_of[q]) + " tokens, the counts " +
               std::to_string(whole->queues[q].documents) + " and " +
               std::to_string(whole->queues[q].tokens);
      return false;
    }
  }

  out->predictions.resize(documents.size());
  out->folds.resize(folds);
  const size_t label_count = out->labels.size();
  std::vector<int64_t> model_row(rows);
  DocumentRows doc_rows;
  for (uint32_t f = 0; f < folds; ++f) {
    const std::vector<size_t>& held = in_fold[f];
    FoldSummary& summary = out->folds[f];
    if (held.empty()) {  // nothing to route: no model is built
      for (const QueueCounts& q : whole->queues) summary.learned += q.documents;
      continue;
    }
    // Subtract the fold; on failure add back what was taken.
    for (size_t k = 0; k < held.size(); ++k) {
      if (!Apply(documents[held[k]], -1, whole)) {
        for (size_t j = 0; j < k; ++j) Apply(documents[held[j]], +1, whole);
        *error = "a held-out document's counts exceed the store's counts";
        return false;
      }
    }
    const Model model = Model::Build(*whole, options);
    for (size_t q = 0; q < nq; ++q) {
      if (label_of_column[q] >= 0 && whole->queues[q].documents == 0) {
        summary.queues_left_out.push_back(static_cast<uint32_t>(label_of_column[q]));
      }
      summary.learned += whole->queues[q].documents;
    }
    summary.vocabulary = static_cast<int64_t>(model.vocabulary_size());
    summary.held_out = static_cast<int64_t>(held.size());
    if (model.queue_count() == 0) {
      for (size_t k : held) Apply(documents[k], +1, whole);
      *error = "fold " + std::to_string(f + 1) +
               " holds every document: no model is left to route it";
      return false;
    }
    const std::vector<uint32_t> label_of_queue = LabelsOfQueues(model, out->labels);

    // Route the held-out documents by their stored counts. Rows of the
    // counts are looked up in the fold's model on first use.
    std::fill(model_row.begin(), model_row.end(), -2);
    for (size_t k : held) {
      const CountedDocument& d = documents[k];
      doc_rows.clear();
      int64_t unknown = 0;
      for (const auto& [row, n] : d.rows) {
        int64_t& m = model_row[row];
        if (m == -2) m = model.FindTerm(whole->terms[row]);
        if (m < 0) {
          unknown += n;
        } else {
          doc_rows.emplace_back(static_cast<uint32_t>(m), n);
        }
      }
      const Decision decision = model.Decide(doc_rows, unknown);
      Prediction& p = out->predictions[k];
      p = PredictionFromDecision(decision, label_of_queue, label_count,
                                 static_cast<uint32_t>(label_of_column[d.queue]));
      summary.correct += p.predicted == p.truth;
    }
    for (size_t k : held) Apply(documents[k], +1, whole);
  }
  return true;
}

}  // namespace chute
