// A thin, owning wrapper over the SQLite C API. Only store/ includes it.
// Every statement is prepared and takes its values through bound parameters.
#ifndef CHUTE_STORE_SQLITE_H_
#define CHUTE_STORE_SQLITE_H_

#include <sqlite3.h>

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>

#include "store/status.h"

namespace chute::sql {

struct DbCloser {
  void operator()(sqlite3* db) const { sqlite3_close_v2(db); }
};
using DbHandle = std::unique_ptr<sqlite3, DbCloser>;

// A prepared statement. Bind indexes start at 1, column indexes at 0.
class Statement {
 public:
  Statement() = default;
  // Prepares sql on db; on failure ok() is false and error() says why.
  Statement(sqlite3* db, std::string_view sql);
  Statement(Statement&&) = default;
  Statement& operator=(Statement&&) = default;

  bool ok() const { return stmt_ != nullptr; }
  const std::string& error() const { return error_; }

  Statement& Bind(int i, int64_t v);
  Statement& Bind(int i, double v);
  Statement& Bind(int i, std::string_view text);  // copied by SQLite
  Statement& BindBlob(int i, std::string_view bytes);
  Statement& BindNull(int i);

  // Runs one step: SQLITE_ROW, SQLITE_DONE or an error code.
  int Step();
  // Steps to completion; Ok, or the error with sqlite's message.
  Status Run();
  void Reset();

  int64_t ColumnInt(int i) const { return sqlite3_column_int64(stmt_.get(), i); }
  double ColumnDouble(int i) const { return sqlite3_column_double(stmt_.get(), i); }
  bool ColumnIsNull(int i) const {
    return sqlite3_column_type(stmt_.get(), i) == SQLITE_NULL;
  }
  std::string_view ColumnText(int i) const;
  std::string_view ColumnBlob(int i) const;
  // The statement itself, for SQLite calls this class does not wrap.
  sqlite3_stmt* handle() const { return stmt_.get(); }

 private:
  struct Finalizer {
    void operator()(sqlite3_stmt* s) const { sqlite3_finalize(s); }
  };
  std::unique_ptr<sqlite3_stmt, Finalizer> stmt_;
  std::string error_;
};

// Runs SQL without parameters (schema, PRAGMA, BEGIN/COMMIT).
Status Exec(sqlite3* db, const char* sql);

// Copies every page of the write-ahead log back into the database file and
// truncates the log to zero bytes, so that the log no longer holds pages as
// they were before a change (SQLite, "Write-Ahead Logging" and "PRAGMA
// wal_checkpoint", sqlite.org/wal.html). TRUNCATE waits for readers through
// the busy handler. Returns false when it could not finish (other
// connections kept reading) or failed; the old pages then stay in the log
// until the next checkpoint. Call outside any transaction.
bool CheckpointTruncate(sqlite3* db);

// A Status from SQLite's last error on db, prefixed with what was done.
Status ErrorStatus(sqlite3* db, std::string_view what);

// A transaction that rolls back unless committed.
class Transaction {
 public:
  // BEGIN IMMEDIATE: takes the write lock now, waiting up to the busy
  // timeout, so that a writer never fails half-way for a lock.
  explicit Transaction(sqlite3* db);
  ~Transaction();
  Transaction(const Transaction&) = delete;
  Transaction& operator=(const Transaction&) = delete;

  const Status& status() const { return status_; }
  Status Commit();

 private:
  sqlite3* db_;
  Status status_;
  bool open_ = false;
};

// A read transaction (BEGIN ... COMMIT): every statement inside sees one
// consistent snapshot of the store, even while a writer commits. Inside a
// transaction already open on the connection it does nothing, so readers
// compose: the outer one decides the snapshot.
class ReadTransaction {
 public:
  explicit ReadTransaction(sqlite3* db)
      : db_(db),
        owner_(sqlite3_get_autocommit(db) != 0),
        status_(owner_ ? Exec(db, "BEGIN") : Status::Ok()) {}
  ~ReadTransaction() {
    if (owner_ && status_.ok()) sqlite3_exec(db_, "COMMIT", nullptr, nullptr, nullptr);
  }
  ReadTransaction(const ReadTransaction&) = delete;
  ReadTransaction& operator=(const ReadTransaction&) = delete;

  const Status& status() const { return status_; }

 private:
  sqlite3* db_;
  bool owner_;  // began the transaction, so ends it
  Status status_;
};

}  // namespace chute::sql

#endif  // CHUTE_STORE_SQLITE_H_
