// Writes a change to the model's counts N(q, w) (the terms and counts
// tables), each (term, queue) once, inside the caller's write transaction:
// learn, correct, forget and rollback all end here. Only store/ uses it.
//
// The way depends on the size of the change (measured on the 100 MB
// benchmark corpus, where a 10 % correction changes 45 % of all counts and
// a learn into an empty store writes 616,000): term ids come from one merge
// over the terms' text index or from a read per term; new terms go in by
// one statement (term_rows); when the change touches a large part of the
// model, one UPDATE passes over counts in key order (count_after) and new
// rows go in by one statement (count_rows), otherwise each term's rows are
// read first and the new counts written by one statement; rows that reach
// zero are deleted. The fingerprint's row digests (two SHA-256 per row) are
// computed on a second thread meanwhile.
#ifndef CHUTE_STORE_COUNT_WRITER_H_
#define CHUTE_STORE_COUNT_WRITER_H_

#include <sqlite3.h>

#include <cstdint>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "store/fingerprint.h"
#include "store/status.h"
#include "store/term_numbering.h"

namespace chute {

// N(q, w) += n for the term terms[term] and the queue queue_id. n != 0.
struct CountChange {
  uint32_t term;
  int64_t queue_id;
  int64_t n;
};

struct CountWriteOptions {
  // A term left with no count leaves the vocabulary (forget, rollback).
  bool drop_terms = false;
  // terms is in byte order already (learn ranks its terms so): not sorted
  // again.
  bool terms_sorted = false;
  // The vocabulary and counts tables: the model's, or a rebuild's recount
  // beside them (rebuild_terms, rebuild_counts; schema.h).
  const char* terms_table = "terms";
  const char* counts_table = "counts";
};

struct CountWriteResult {
  int64_t new_terms = 0;      // terms that joined the vocabulary
  int64_t dropped_terms = 0;  // with drop_terms, terms that left it
};

// Applies changes (any order; at most one per (term, queue); taken, so that
// their memory goes once they are in key order) to the counts of db. Terms a change adds to are created when missing; a term missing
// from the vocabulary that a change takes from, or a count smaller than
// what is taken from it, is Corruption (a damaged store). With running
// (not null), keeps the sum of row digests (fingerprint.h) up to date.
// Queue totals are the caller's.
Status WriteCountChanges(sqlite3* db, const std::string& path,
                         const std::vector<std::string_view>& terms,
                         std::vector<CountChange> changes,
                         const CountWriteOptions& options, CountsSum* running,
                         CountWriteResult* result);

// Changes to N(q, w) summed in memory before they are written: terms
// numbered on first sight, one column of sums per queue (a handful), each
// column as long as the terms it has seen. Write hands every non-zero sum
// to WriteCountChanges.
class CountSums {
 public:
  // The numbering, for callers that look many terms up at once (Hash,
  // Prefetch, then Number).
  TermNumbering& terms() { return terms_; }

  // The index of the queue's column, made on first use.
  size_t ColumnOf(int64_t queue_id);
  // Column c, long enough for every term numbered so far. The reference
  // lasts until the next ColumnOf that makes a column.
  std::vector<int64_t>& column(size_t c) {
    if (columns_[c].size() < terms_.size()) columns_[c].resize(terms_.size(), 0);
    return columns_[c];
  }

  // N(q, w) += n.
  void Add(int64_t queue_id, std::string_view term, int64_t n) {
    const size_t c = ColumnOf(queue_id);
    const uint32_t t = terms_.Number(term);
    column(c)[t] += n;
  }
  // Adds another's sums to these.
  void Add(const CountSums& other);

  // WriteCountChanges of every non-zero sum.
  Status Write(sqlite3* db, const std::string& path, const CountWriteOptions& options,
               CountsSum* running, CountWriteResult* result) const;

 private:
  TermNumbering terms_;
  std::vector<int64_t> queue_ids_;              // by column
  std::vector<std::vector<int64_t>> columns_;  // sums by term number
};

// Every queue's name by id (retired ones too): for the row digests of the
// fingerprint's sum, and for messages.
Status ReadQueueNames(sqlite3* db, const std::string& path,
                      std::unordered_map<int64_t, std::string>* out);

}  // namespace chute

#endif  // CHUTE_STORE_COUNT_WRITER_H_
