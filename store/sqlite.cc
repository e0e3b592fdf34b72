#include "store/sqlite.h"

namespace chute::sql {

Statement::Statement(sqlite3* db, std::string_view sql) {
  sqlite3_stmt* s = nullptr;
  if (sqlite3_prepare_v2(db, sql.data(), static_cast<int>(sql.size()), &s,
                         nullptr) != SQLITE_OK) {
    error_ = sqlite3_errmsg(db);
    sqlite3_finalize(s);
    return;
  }
  stmt_.reset(s);
}

Statement& Statement::Bind(int i, int64_t v) {
  sqlite3_bind_int64(stmt_.get(), i, v);
  return *this;
}
Statement& Statement::Bind(int i, double v) {
  sqlite3_bind_double(stmt_.get(), i, v);
  return *this;
}
Statement& Statement::Bind(int i, std::string_view text) {
  sqlite3_bind_text64(stmt_.get(), i, text.data(), text.size(),
                      SQLITE_TRANSIENT, SQLITE_UTF8);
  return *this;
}
Statement& Statement::BindBlob(int i, std::string_view bytes) {
  sqlite3_bind_blob64(stmt_.get(), i, bytes.data(), bytes.size(),
                      SQLITE_TRANSIENT);
  return *this;
}
Statement& Statement::BindNull(int i) {
  sqlite3_bind_null(stmt_.get(), i);
  return *this;
}

int Statement::Step() { return sqlite3_step(stmt_.get()); }

Status Statement::Run() {
  int rc;
  while ((rc = Step()) == SQLITE_ROW) {
  }
  Reset();
  if (rc != SQLITE_DONE) {
    return ErrorStatus(sqlite3_db_handle(stmt_.get()), "statement");
  }
  return Status::Ok();
}

void Statement::Reset() {
  sqlite3_reset(stmt_.get());
  sqlite3_clear_bindings(stmt_.get());
}

std::string_view Statement::ColumnText(int i) const {
  const unsigned char* p = sqlite3_column_text(stmt_.get(), i);
  int n = sqlite3_column_bytes(stmt_.get(), i);
  return p == nullptr ? std::string_view()
                      : std::string_view(reinterpret_cast<const char*>(p),
                                         static_cast<size_t>(n));
}

std::string_view Statement::ColumnBlob(int i) const {
  const void* p = sqlite3_column_blob(stmt_.get(), i);
  int n = sqlite3_column_bytes(stmt_.get(), i);
  return p == nullptr ? std::string_view()
                      : std::string_view(static_cast<const char*>(p),
                                         static_cast<size_t>(n));
}

Status ErrorStatus(sqlite3* db, std::string_view what) {
  int rc = sqlite3_errcode(db);
  std::string msg = std::string(what) + ": " + sqlite3_errmsg(db);
  if (rc == SQLITE_BUSY || rc == SQLITE_LOCKED) return Status::Busy(msg);
  if (rc == SQLITE_CORRUPT || rc == SQLITE_NOTADB) return Status::Corruption(msg);
  return Status::IoError(msg);
}

Status Exec(sqlite3* db, const char* sql) {
  if (sqlite3_exec(db, sql, nullptr, nullptr, nullptr) != SQLITE_OK) {
    return ErrorStatus(db, "sql");
  }
  return Status::Ok();
}

bool CheckpointTruncate(sqlite3* db) {
  // The row is (busy, log frames, frames checkpointed); busy = 1 means the
  // checkpoint could not finish.
  Statement checkpoint(db, "PRAGMA wal_checkpoint(TRUNCATE)");
  return checkpoint.ok() && checkpoint.Step() == SQLITE_ROW && checkpoint.ColumnInt(0) == 0;
}

Transaction::Transaction(sqlite3* db) : db_(db) {
  status_ = Exec(db, "BEGIN IMMEDIATE");
  open_ = status_.ok();
}

Transaction::~Transaction() {
  if (open_) sqlite3_exec(db_, "ROLLBACK", nullptr, nullptr, nullptr);
}

Status Transaction::Commit() {
  if (!open_) return status_;
  Status s = Exec(db_, "COMMIT");
  open_ = !s.ok() && sqlite3_get_autocommit(db_) == 0;
  return s;
}

}  // namespace chute::sql
