// Count rows held in memory, read by SQL as a table: the table-valued
// function count_rows(?), whose argument is a pointer to a vector of
// CountRow bound with BindCountRows (and term_rows(?) for new terms). One statement then writes every row
// (INSERT ... SELECT ... FROM count_rows(?)), instead of one statement per
// row: SQLite's cost of running a statement (binding, stepping, resetting)
// was most of the cost of writing a count (measured: about 0.85 µs a row
// one statement at a time, 0.3 µs a row in one statement, on the 100 MB
// benchmark corpus's 616,000 counts).
//
// The function is an eponymous virtual table (SQLite, "The Virtual Table
// Mechanism Of SQLite", sections 1.1.4 and 2.1.2, sqlite.org/vtab.html),
// and the vector reaches it through SQLite's pointer-passing interface
// (sqlite.org/bindptr.html), as SQLite's own carray extension does.
#ifndef CHUTE_STORE_COUNT_ROWS_H_
#define CHUTE_STORE_COUNT_ROWS_H_

#include <sqlite3.h>

#include <cstdint>
#include <string_view>
#include <vector>

#include "store/status.h"

namespace chute {

struct CountRow {
  int64_t term_id = 0;
  int64_t queue_id = 0;
  int64_t n = 0;
};

// A row of term_rows(?): the columns id and text (viewed, not copied: the
// bytes must outlive the statement's run).
struct TermRow {
  int64_t id = 0;
  std::string_view text;
};

// Registers count_rows, term_rows and count_after on the connection
// (ConfigureStoreConnection does).
Status RegisterCountRows(sqlite3* db);

// Binds rows as parameter i of a statement that reads count_rows(?i). The
// vector must outlive the statement's run (until it is reset).
int BindCountRows(sqlite3_stmt* stmt, int i, const std::vector<CountRow>* rows);
// The same for term_rows(?i).
int BindTermRows(sqlite3_stmt* stmt, int i, const std::vector<TermRow>* rows);

// Changes to counts that a statement applies while it passes over the
// counts table, through the SQL function count_after(?i, term_id,
// queue_id, n): for a (term_id, queue_id) in `deltas` it records n in
// before[k] (k: the row's index in deltas) and returns n + deltas[k].n; for
// any other row it returns n. A pass in key order finds each row in
// constant time. A row whose n + delta would be negative is recorded in
// `negative` (the first one met) and returned unchanged.
struct CountChanges {
  const std::vector<CountRow>* deltas = nullptr;  // sorted by (term_id, queue_id)
  std::vector<int64_t>* before = nullptr;         // deltas->size() entries
  std::vector<uint8_t>* seen = nullptr;           // 1 where before was recorded
  int64_t negative = -1;                          // index into deltas, or -1
  size_t at = 0;                                  // where the last row was found
};
int BindCountChanges(sqlite3_stmt* stmt, int i, CountChanges* changes);

}  // namespace chute

#endif  // CHUTE_STORE_COUNT_ROWS_H_
