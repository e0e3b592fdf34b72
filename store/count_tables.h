// N(q, w) in a vocabulary table and a counts table, edited one term at a
// time with statements prepared once: the model's own tables (terms,
// counts) or a rebuild's recount beside them (rebuild_terms,
// rebuild_counts; schema.h). Counts never hold a zero row. Only store/
// uses it, inside the caller's write transaction.
#ifndef CHUTE_STORE_COUNT_TABLES_H_
#define CHUTE_STORE_COUNT_TABLES_H_

#include <sqlite3.h>

#include <cstdint>
#include <string>
#include <string_view>

#include "store/sqlite.h"
#include "store/status.h"

namespace chute {

class CountTables {
 public:
  // terms, counts: table names chute itself gives (never user input); the
  // tables have the columns of schema version 1's terms and counts.
  CountTables(sqlite3* db, std::string path, std::string_view terms,
              std::string_view counts);

  // Whether every statement was prepared.
  Status status() const;

  // N(q, w) += n; the term joins the vocabulary when it is not there.
  Status Add(int64_t queue, const std::string& term, int64_t n);

  // N(q, w) -= n; a row that reaches zero is deleted, and with drop_term a
  // term left with no count leaves the vocabulary (*dropped counts it).
  // *too_small is set, and nothing changes, when N(q, w) < n; a term
  // missing from the vocabulary is Corruption.
  Status Subtract(int64_t queue, const std::string& term, int64_t n,
                  bool drop_term, int64_t* dropped, bool* too_small);

 private:
  Status TermId(const std::string& term, bool create, int64_t* id);

  sqlite3* db_;
  std::string path_;
  std::string terms_;
  sql::Statement find_term_, add_term_, upsert_, lower_, remove_, drop_term_;
};

}  // namespace chute

#endif  // CHUTE_STORE_COUNT_TABLES_H_
