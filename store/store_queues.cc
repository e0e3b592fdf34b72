// Queue changes: add, rename, merge, retire. Each is one transaction that
// records a version ("queues"); queue ids never change, so the history keeps
// following a renamed or merged queue.
#include <string>
#include <vector>

#include "store/queue_name.h"
#include "store/store.h"

namespace chute {

namespace {

struct QueueRow {
  int64_t id = 0;
  bool retired = false;
  int64_t documents = 0;
};

// The queue named name; *found false when there is none.
Status FindQueue(sqlite3* db, const std::string& path, const std::string& name, QueueRow* out,
                 bool* found) {
  sql::Statement st(db, "SELECT id, retired IS NOT NULL, documents FROM queues WHERE name = ?");
  if (!st.ok()) return Status::IoError(path + ": " + st.error());
  st.Bind(1, name);
  int rc = st.Step();
  *found = rc == SQLITE_ROW;
  if (*found) *out = QueueRow{st.ColumnInt(0), st.ColumnInt(1) != 0, st.ColumnInt(2)};
  return rc == SQLITE_ROW || rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db, path);
}

// Runs one statement with integer parameters.
Status RunSql(sqlite3* db, const std::string& path, const char* sql,
              const std::vector<int64_t>& ints) {
  sql::Statement st(db, sql);
  if (!st.ok()) return Status::IoError(path + ": " + st.error());
  int i = 1;
  for (int64_t v : ints) st.Bind(i++, v);
  return st.Run();
}

// A queue left with no documents, counts or prior, marked retired now.
Status MarkRetired(sqlite3* db, const std::string& path, int64_t id, const ChangeInfo& change) {
  sql::Statement st(db,
                    "UPDATE queues SET documents = 0, tokens = 0, set_prior = NULL, retired = ? "
                    "WHERE id = ?");
  if (!st.ok()) return Status::IoError(path + ": " + st.error());
  return st.Bind(1, change.now.empty() ? StoreClockNow() : change.now).Bind(2, id).Run();
}

}  // namespace

Status Store::AddQueue(const std::string& name, const ChangeInfo& change) {
  sqlite3* db = db_.get();
  sql::Transaction tx(db);
  if (!tx.status().ok()) return Status::Busy(path_ + ": " + tx.status().message());
  QueueRow q;
  bool found = false;
  Status s = FindQueue(db, path_, name, &q, &found);
  if (!s.ok()) return s;
  if (found && !q.retired) {
    return Status::InvalidArgument(path_ + ": queue '" + name + "' already exists");
  }
  if (found) {
    s = RunSql(db, path_, "UPDATE queues SET retired = NULL WHERE id = ?", {q.id});
  } else {
    if (s = ValidateQueueName(name); !s.ok()) return s;
    sql::Statement add(db, "INSERT INTO queues(name, created) VALUES(?, ?)");
    if (!add.ok()) return Status::IoError(path_ + ": " + add.error());
    s = add.Bind(1, name).Bind(2, change.now.empty() ? StoreClockNow() : change.now).Run();
  }
  if (s.ok()) s = RecordVersionInTransaction("queues", change, VersionDelta());
  if (!s.ok()) return s;
  return tx.Commit();
}

Status Store::RenameQueue(const std::string& from, const std::string& to,
                          const ChangeInfo& change) {
  sqlite3* db = db_.get();
  sql::Transaction tx(db);
  if (!tx.status().ok()) return Status::Busy(path_ + ": " + tx.status().message());
  QueueRow q, other;
  bool found = false, taken = false;
  Status s = FindQueue(db, path_, from, &q, &found);
  if (s.ok()) s = FindQueue(db, path_, to, &other, &taken);
  if (!s.ok()) return s;
  if (!found) return Status::NotFound(path_ + ": queue '" + from + "' does not exist");
  if (taken) {
    return Status::InvalidArgument(path_ + ": queue '" + to + "' already exists" +
                                   (other.retired ? " (retired)" : "") +
                                   "; to put one queue's documents into another, merge them");
  }
  if (s = ValidateQueueName(to); !s.ok()) return s;
  {
    sql::Statement st(db, "UPDATE queues SET name = ? WHERE id = ?");
    s = st.Bind(1, to).Bind(2, q.id).Run();
  }
  if (s.ok()) s = RecordVersionInTransaction("queues", change, VersionDelta());
  if (!s.ok()) return s;
  return tx.Commit();
}

Status Store::MergeQueue(const std::string& from, const std::string& into,
                         const ChangeInfo& change, int64_t* moved) {
  *moved = 0;
  sqlite3* db = db_.get();
  sql::Transaction tx(db);
  if (!tx.status().ok()) return Status::Busy(path_ + ": " + tx.status().message());
  QueueRow f, t;
  bool has_f = false, has_t = false;
  Status s = FindQueue(db, path_, from, &f, &has_f);
  if (s.ok()) s = FindQueue(db, path_, into, &t, &has_t);
  if (!s.ok()) return s;
  if (!has_f || f.retired) return Status::NotFound(path_ + ": queue '" + from + "' does not exist");
  if (!has_t || t.retired) return Status::NotFound(path_ + ": queue '" + into + "' does not exist");
  if (f.id == t.id) return Status::InvalidArgument("a queue cannot be merged into itself");

  VersionDelta delta;
  {
    sql::Statement docs(db, "SELECT id FROM ledger WHERE queue_id = ? AND in_model = 1 ORDER BY id");
    if (!docs.ok()) return Status::IoError(path_ + ": " + docs.error());
    docs.Bind(1, f.id);
    while (docs.Step() == SQLITE_ROW) delta.changes.push_back({docs.ColumnInt(0), f.id, t.id});
  }
  delta.moved = static_cast<int64_t>(delta.changes.size());
  // N(into, w) += N(from, w) for every term, in one statement ("WHERE true"
  // lets SQLite read ON CONFLICT as the upsert, sqlite.org/lang_upsert.html).
  s = RunSql(db, path_,
             "INSERT INTO counts(term_id, queue_id, n) SELECT term_id, ?, n FROM counts "
             "WHERE queue_id = ? AND true "
             "ON CONFLICT(term_id, queue_id) DO UPDATE SET n = n + excluded.n",
             {t.id, f.id});
  if (s.ok()) s = RunSql(db, path_, "DELETE FROM counts WHERE queue_id = ?", {f.id});
  if (s.ok()) {
    s = RunSql(db, path_,
               "UPDATE queues SET documents = documents + (SELECT documents FROM queues WHERE id = ?), "
               "tokens = tokens + (SELECT tokens FROM queues WHERE id = ?) WHERE id = ?",
               {f.id, f.id, t.id});
  }
  if (s.ok()) s = RunSql(db, path_, "UPDATE ledger SET queue_id = ? WHERE queue_id = ?", {t.id, f.id});
  if (s.ok()) s = MarkRetired(db, path_, f.id, change);
  if (s.ok()) s = RecordVersionInTransaction("queues", change, delta);
  if (!s.ok()) return s;
  *moved = delta.moved;
  return tx.Commit();
}

Status Store::RetireQueue(const std::string& name, const ChangeInfo& change, int64_t* removed) {
  *removed = 0;
  sqlite3* db = db_.get();
  sql::Transaction tx(db);
  if (!tx.status().ok()) return Status::Busy(path_ + ": " + tx.status().message());
  QueueRow q;
  bool found = false;
  Status s = FindQueue(db, path_, name, &q, &found);
  if (!s.ok()) return s;
  if (!found) return Status::NotFound(path_ + ": queue '" + name + "' does not exist");
  if (q.retired) return Status::InvalidArgument(path_ + ": queue '" + name + "' is already retired");
  VersionDelta delta;
  {
    sql::Statement docs(db, "SELECT id FROM ledger WHERE queue_id = ? AND in_model = 1 ORDER BY id");
    if (!docs.ok()) return Status::IoError(path_ + ": " + docs.error());
    docs.Bind(1, q.id);
    while (docs.Step() == SQLITE_ROW) delta.changes.push_back({docs.ColumnInt(0), q.id, 0});
  }
  delta.removed = static_cast<int64_t>(delta.changes.size());
  // The documents stay in the ledger, out of the model; their counts go,
  // and so do terms no other queue has.
  s = RunSql(db, path_, "UPDATE ledger SET in_model = 0 WHERE queue_id = ?", {q.id});
  if (s.ok()) s = RunSql(db, path_, "DELETE FROM counts WHERE queue_id = ?", {q.id});
  if (s.ok()) {
    s = RunSql(db, path_,
               "DELETE FROM terms WHERE NOT EXISTS (SELECT 1 FROM counts WHERE term_id = terms.id)",
               {});
  }
  if (s.ok()) s = MarkRetired(db, path_, q.id, change);
  if (s.ok()) s = RecordVersionInTransaction("queues", change, delta);
  if (!s.ok()) return s;
  *removed = delta.removed;
  return tx.Commit();
}

}  // namespace chute
