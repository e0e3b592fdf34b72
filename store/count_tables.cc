#include "store/count_tables.h"

#include <utility>

namespace chute {

CountTables::CountTables(sqlite3* db, std::string path, std::string_view terms,
                         std::string_view counts)
    : db_(db), path_(std::move(path)), terms_(terms) {
  const std::string t(terms), c(counts);
  find_term_ = sql::Statement(db, "SELECT id FROM " + t + " WHERE text = ?");
  add_term_ = sql::Statement(db, "INSERT INTO " + t + "(text) VALUES(?)");
  upsert_ = sql::Statement(
      db,
      "INSERT INTO " + c +
          "(term_id, queue_id, n) VALUES(?, ?, ?) "
          "ON CONFLICT(term_id, queue_id) DO UPDATE SET n = n + excluded.n");
  lower_ = sql::Statement(
      db, "UPDATE " + c +
              " SET n = n - ? WHERE term_id = ? AND queue_id = ? AND n > ?");
  remove_ = sql::Statement(
      db, "DELETE FROM " + c + " WHERE term_id = ? AND queue_id = ? AND n = ?");
  drop_term_ = sql::Statement(
      db, "DELETE FROM " + t + " WHERE id = ? AND NOT EXISTS (SELECT 1 FROM " +
              c + " WHERE term_id = ?)");
}

Status CountTables::status() const {
  for (const sql::Statement* st :
       {&find_term_, &add_term_, &upsert_, &lower_, &remove_, &drop_term_}) {
    if (!st->ok()) return Status::IoError(path_ + ": " + st->error());
  }
  return Status::Ok();
}

Status CountTables::Add(int64_t queue, const std::string& term, int64_t n) {
  int64_t id = 0;
  Status s = TermId(term, /*create=*/true, &id);
  if (!s.ok()) return s;
  return upsert_.Bind(1, id).Bind(2, queue).Bind(3, n).Run();
}

Status CountTables::Subtract(int64_t queue, const std::string& term, int64_t n,
                             bool drop_term, int64_t* dropped,
                             bool* too_small) {
  *too_small = false;
  int64_t id = 0;
  Status s = TermId(term, /*create=*/false, &id);
  if (!s.ok()) return s;
  if (s = lower_.Bind(1, n).Bind(2, id).Bind(3, queue).Bind(4, n).Run();
      !s.ok())
    return s;
  if (sqlite3_changes(db_) > 0) return Status::Ok();
  if (s = remove_.Bind(1, id).Bind(2, queue).Bind(3, n).Run(); !s.ok())
    return s;
  if (sqlite3_changes(db_) == 0) {
    *too_small = true;
    return Status::Ok();
  }
  if (!drop_term) return Status::Ok();
  if (s = drop_term_.Bind(1, id).Bind(2, id).Run(); !s.ok()) return s;
  *dropped += sqlite3_changes(db_);
  return Status::Ok();
}

Status CountTables::TermId(const std::string& term, bool create, int64_t* id) {
  find_term_.Bind(1, term);
  int rc = find_term_.Step();
  if (rc == SQLITE_ROW) *id = find_term_.ColumnInt(0);
  find_term_.Reset();
  if (rc == SQLITE_ROW) return Status::Ok();
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_, path_);
  if (!create)
    return Status::Corruption(path_ + ": a counted term is missing from " +
                              terms_);
  Status s = add_term_.Bind(1, term).Run();
  if (!s.ok()) return s;
  *id = sqlite3_last_insert_rowid(db_);
  return Status::Ok();
}

}  // namespace chute
