// The kept text of learned documents: reading it back for a rebuild, and
// erasing it (with the source paths) once it is old enough (purge).
#include <cctype>
#include <string>
#include <utility>

#include "store/store.h"
#include "store/text_codec.h"

namespace chute {

namespace {

// True when t has the form YYYY-MM-DDTHH:MM:SSZ (digits where digits go).
bool IsCanonicalUtc(const std::string& t) {
  static constexpr char kForm[] = "dddd-dd-ddTdd:dd:ddZ";
  if (t.size() != sizeof kForm - 1) return false;
  for (size_t i = 0; i < t.size(); ++i) {
    bool ok = kForm[i] == 'd'
                  ? std::isdigit(static_cast<unsigned char>(t[i])) != 0
                  : t[i] == kForm[i];
    if (!ok) return false;
  }
  return true;
}

// Entries that purge erases: learned before ?1 and still holding a text
// or a source path.
constexpr char kPurgeable[] =
    "l.learned_at < ?1 AND (l.text IS NOT NULL OR l.source IS NOT NULL)";

}  // namespace

Status Store::ReadLedgerTexts(
    const std::function<Status(const LedgerText&)>& fn) {
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  sql::Statement st(
      db_.get(),
      "SELECT l.id, l.digest, q.name, l.in_model, l.learned_at, l.text "
      "FROM ledger l JOIN queues q ON q.id = l.queue_id ORDER BY l.id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  TextCodec codec;
  LedgerText entry;
  std::string text;
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    entry.ledger_id = st.ColumnInt(0);
    entry.digest = st.ColumnText(1);
    entry.queue = st.ColumnText(2);
    entry.in_model = st.ColumnInt(3) != 0;
    entry.learned_at = st.ColumnText(4);
    entry.text.reset();
    if (!st.ColumnIsNull(5)) {
      if (Status s = codec.Unpack(st.ColumnBlob(5), &text); !s.ok()) {
        return Status::Corruption(path_ + ": the kept text of ledger entry " +
                                  entry.digest +
                                  " does not unpack: " + s.message());
      }
      entry.text = std::move(text);
    }
    if (Status s = fn(entry); !s.ok()) return s;
    if (entry.text) text = std::move(*entry.text);  // reuse its memory
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  return Status::Ok();
}

Status Store::Purge(const std::string& before, bool dry_run,
                    PurgeResult* result) {
  *result = PurgeResult();
  if (!IsCanonicalUtc(before)) {
    return Status::InvalidArgument(
        "purge: '" + before +
        "' is not a time of the form YYYY-MM-DDTHH:MM:SSZ");
  }
  sqlite3* db = db_.get();
  auto count = [&]() -> Status {
    sql::Statement st(
        db,
        std::string("SELECT q.name, COUNT(*), COUNT(l.text), COUNT(l.source) "
                    "FROM ledger l JOIN queues q ON q.id = l.queue_id "
                    "WHERE ") +
            kPurgeable + " GROUP BY q.name ORDER BY q.name");
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    st.Bind(1, before);
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      PurgeResult::Queue q{std::string(st.ColumnText(0)), st.ColumnInt(1),
                           st.ColumnInt(2), st.ColumnInt(3)};
      result->entries += q.entries;
      result->texts += q.texts;
      result->sources += q.sources;
      result->queues.push_back(std::move(q));
    }
    if (rc != SQLITE_DONE) return sql::ErrorStatus(db, path_);
    for (auto [query, n] : {std::pair{"SELECT COUNT(*) FROM decisions WHERE time < ?", &result->decisions},
                          std::pair{"SELECT COUNT(*) FROM unreadable WHERE first_seen < ?",
                                    &result->unreadable}}) {
      sql::Statement c(db, query);
      if (!c.ok()) return Status::IoError(path_ + ": " + c.error());
      c.Bind(1, before);
      if (c.Step() != SQLITE_ROW) return sql::ErrorStatus(db, path_);
      *n = c.ColumnInt(0);
    }
    return Status::Ok();
  };
  if (dry_run) {
    sql::ReadTransaction read(db);
    if (!read.status().ok()) return read.status();
    result->checkpointed = true;
    return count();
  }
  // Erased content is overwritten with zeros, in the rows, in the index on
  // source and in freed pages (SQLite, "PRAGMA secure_delete",
  // sqlite.org/pragma.html).
  Status s = sql::Exec(db, "PRAGMA secure_delete = ON");
  if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
  {
    sql::Transaction tx(db);
    if (!tx.status().ok())
      return Status::Busy(path_ + ": " + tx.status().message());
    if (s = count(); !s.ok()) return s;
    sql::Statement erase(
        db, std::string("UPDATE ledger AS l SET text = NULL, source = NULL "
                        "WHERE ") +
                kPurgeable);
    if (!erase.ok()) return Status::IoError(path_ + ": " + erase.error());
    if (s = erase.Bind(1, before).Run(); !s.ok()) return s;
    if (sqlite3_changes(db) != result->entries) {
      return Status::IoError(path_ + ": purge changed " +
                             std::to_string(sqlite3_changes(db)) +
                             " ledger entries, not the " +
                             std::to_string(result->entries) + " it counted");
    }
    // The decision log and the unreadable files keep paths: their rows
    // older than the cutoff go whole.
    for (const char* query : {"DELETE FROM decisions WHERE time < ?",
                              "DELETE FROM unreadable WHERE first_seen < ?"}) {
      sql::Statement del(db, query);
      if (!del.ok()) return Status::IoError(path_ + ": " + del.error());
      if (s = del.Bind(1, before).Run(); !s.ok()) return s;
    }
    s = tx.Commit();
    if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  }
  result->checkpointed = sql::CheckpointTruncate(db);
  return Status::Ok();
}

}  // namespace chute
