// A rebuild's recount beside the current counts (schema.h, version 3):
// recounted documents are written in short transactions to side tables,
// kept equal to the sum of their documents as the store changes, and
// swapped into place in one short transaction.
#include <algorithm>
#include <map>
#include <string>
#include <utility>
#include <vector>

#include "store/count_tables.h"
#include "store/count_writer.h"
#include "store/fault_point.h"
#include "store/store.h"
#include "store/term_counts_codec.h"
#include "store/text_codec.h"
#include "store/version_codec.h"

namespace chute {

namespace {

// The recount's vocabulary and counts: the definitions of terms and counts
// (schema.cc, migration 1), so that they can take their place by renaming.
constexpr char kSideTables[] = R"sql(
CREATE TABLE rebuild_terms (
  id   INTEGER PRIMARY KEY,
  text TEXT NOT NULL UNIQUE
);
CREATE TABLE rebuild_counts (
  term_id  INTEGER NOT NULL REFERENCES rebuild_terms(id),
  queue_id INTEGER NOT NULL REFERENCES queues(id),
  n        INTEGER NOT NULL CHECK (n > 0),
  PRIMARY KEY (term_id, queue_id)
) WITHOUT ROWID;
)sql";

// Left by a swap whose clean-up did not run, and what a new recount clears.
constexpr char kDropLeftovers[] = R"sql(
DROP TABLE IF EXISTS counts_old;
DROP TABLE IF EXISTS terms_old;
DELETE FROM rebuild_docs;
DELETE FROM rebuild_queues;
)sql";

// Adds and subtracts recounted documents in the side tables (CountTables
// over rebuild_terms and rebuild_counts), with the queues' totals in
// rebuild_queues.
class SideCounts {
 public:
  SideCounts(sqlite3* db, std::string path)
      : tables_(db, path, "rebuild_terms", "rebuild_counts"),
        path_(std::move(path)),
        totals_(db,
                "INSERT INTO rebuild_queues(queue_id, documents, tokens) "
                "VALUES(?, ?, ?) "
                "ON CONFLICT(queue_id) DO UPDATE SET documents = documents + "
                "excluded.documents, tokens = tokens + excluded.tokens"),
        lower_totals_(db,
                      "UPDATE rebuild_queues SET documents = documents + ?, "
                      "tokens = tokens + ? "
                      "WHERE queue_id = ?") {}

  Status status() const {
    for (const sql::Statement* st : {&totals_, &lower_totals_}) {
      if (!st->ok()) return Status::IoError(path_ + ": " + st->error());
    }
    return tables_.status();
  }

  // N(q, w) += n.
  Status AddCount(const std::string& term, int64_t queue, int64_t n) {
    return tables_.Add(queue, term, n);
  }

  // documents(q) += documents, N(q) += tokens. A subtraction updates the
  // row in place: the upsert's new row would fail its CHECK first.
  Status AddTotals(int64_t queue, int64_t documents, int64_t tokens) {
    if (documents < 0) {
      return lower_totals_.Bind(1, documents)
          .Bind(2, tokens)
          .Bind(3, queue)
          .Run();
    }
    return totals_.Bind(1, queue).Bind(2, documents).Bind(3, tokens).Run();
  }

  // The reverse of adding one document's counts and totals.
  Status Subtract(int64_t queue, int64_t tokens,
                  const std::vector<TermCount>& terms) {
    int64_t dropped = 0;
    for (const auto& [term, n] : terms) {
      bool too_small = false;
      Status s = tables_.Subtract(queue, term, n, /*drop_term=*/true, &dropped,
                                  &too_small);
      if (!s.ok()) return s;
      if (too_small) {
        return Status::Corruption(
            path_ + ": the recounted counts are smaller than a document's");
      }
    }
    return AddTotals(queue, -1, -tokens);
  }

  Status Add(int64_t queue, int64_t tokens,
             const std::vector<TermCount>& terms) {
    for (const auto& [term, n] : terms) {
      if (Status s = AddCount(term, queue, n); !s.ok()) return s;
    }
    return AddTotals(queue, 1, tokens);
  }

 private:
  CountTables tables_;
  std::string path_;
  sql::Statement totals_, lower_totals_;
};

// The queue a ledger row is counted in now, or 0 (out of the model, or
// gone). *exists says whether the row is there.
Status MembershipOf(sql::Statement& st, int64_t id, int64_t* queue,
                    bool* exists) {
  st.Bind(1, id);
  int rc = st.Step();
  *exists = rc == SQLITE_ROW;
  *queue = *exists && st.ColumnInt(0) != 0 ? st.ColumnInt(1) : 0;
  st.Reset();
  return rc == SQLITE_ROW || rc == SQLITE_DONE
             ? Status::Ok()
             : Status::IoError("reading the ledger failed");
}

constexpr char kMembership[] =
    "SELECT in_model, queue_id FROM ledger WHERE id = ?";

// A recount rewrites and frees pages that hold documents' counts and text:
// they are overwritten with zeros, as forget's are (SQLite, "PRAGMA
// secure_delete", sqlite.org/pragma.html), so that a document forgotten
// later leaves no old copy behind.
Status SecureDelete(sqlite3* db, const std::string& path) {
  Status s = sql::Exec(db, "PRAGMA secure_delete = ON");
  return s.ok() ? s : Status::IoError(path + ": " + s.message());
}

}  // namespace

Status Store::BeginRecount(const StoreSettings& target,
                           const ChangeInfo& change, int64_t* base_version,
                           bool* replaced) {
  sqlite3* db = db_.get();
  Status s = SecureDelete(db, path_);
  if (s.ok()) s = DropRecountLeftovers();
  if (!s.ok()) return s;
  sql::Transaction tx(db);
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  if (s = ClearCandidateInTransaction(replaced); !s.ok()) return s;
  if (s = sql::Exec(db, kSideTables); !s.ok())
    return Status::IoError(path_ + ": " + s.message());
  VersionInfo current;
  if (s = CurrentVersion(&current); !s.ok()) return s;
  sql::Statement put(
      db,
      "INSERT INTO rebuild(id, base_version, settings, started, by) "
      "VALUES(1, ?, ?, ?, ?)");
  if (!put.ok()) return Status::IoError(path_ + ": " + put.error());
  s = put.Bind(1, current.version)
          .Bind(2, EncodeHeader(target, {}))
          .Bind(3, change.now)
          .Bind(4, change.by)
          .Run();
  if (!s.ok()) return s;
  *base_version = current.version;
  return tx.Commit();
}

Status Store::ClearCandidateInTransaction(bool* had_candidate) {
  if (Status d = SecureDelete(db_.get(), path_); !d.ok()) return d;
  sqlite3* db = db_.get();
  {
    sql::Statement any(db, "SELECT EXISTS (SELECT 1 FROM candidate)");
    if (!any.ok() || any.Step() != SQLITE_ROW)
      return sql::ErrorStatus(db, path_);
    *had_candidate = any.ColumnInt(0) != 0;
  }
  Status s = sql::Exec(
      db,
      "DELETE FROM candidate; DELETE FROM rebuild; DELETE FROM rebuild_docs; "
      "DELETE FROM rebuild_queues; DROP TABLE IF EXISTS rebuild_counts; "
      "DROP TABLE IF EXISTS rebuild_terms;");
  return s.ok() ? s : Status::IoError(path_ + ": " + s.message());
}

Status Store::DiscardRecount() {
  sql::Transaction tx(db_.get());
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  bool had = false;
  Status s = ClearCandidateInTransaction(&had);
  if (!s.ok()) return s;
  return tx.Commit();
}

Status Store::DropRecountLeftovers() {
  if (Status d = SecureDelete(db_.get(), path_); !d.ok()) return d;
  sql::Transaction tx(db_.get());
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  // Only once no recount is kept: the side tables may belong to one.
  sql::Statement any(db_.get(), "SELECT EXISTS (SELECT 1 FROM rebuild)");
  if (!any.ok() || any.Step() != SQLITE_ROW)
    return sql::ErrorStatus(db_.get(), path_);
  const bool kept = any.ColumnInt(0) != 0;
  any.Reset();
  Status s = sql::Exec(db_.get(), kept ? "DROP TABLE IF EXISTS counts_old; "
                                         "DROP TABLE IF EXISTS terms_old;"
                                       : kDropLeftovers);
  if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
  return tx.Commit();
}

Status Store::LoadRecount(std::optional<RecountInfo>* out) {
  out->reset();
  sql::Statement st(db_.get(),
                    "SELECT base_version, settings, started, by FROM rebuild");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc = st.Step();
  if (rc == SQLITE_DONE) return Status::Ok();
  if (rc != SQLITE_ROW) return sql::ErrorStatus(db_.get(), path_);
  RecountInfo info;
  info.base_version = st.ColumnInt(0);
  std::vector<VersionQueue> none;
  if (!DecodeHeader(st.ColumnText(1), &info.settings, &none)) {
    return Status::Corruption(path_ + ": the rebuild's settings are damaged");
  }
  info.started = st.ColumnText(2);
  info.by = st.ColumnText(3);
  *out = std::move(info);
  return Status::Ok();
}

Status Store::WriteRecounted(const std::vector<RecountedDocument>& docs) {
  Status s = SecureDelete(db_.get(), path_);
  if (!s.ok()) return s;
  sql::Transaction tx(db_.get());
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  s = WriteRecountedInTransaction(docs);
  if (!s.ok()) return s;
  FaultPoint("rebuild.batch_before_commit");
  return tx.Commit();
}

Status Store::WriteRecountedInTransaction(
    const std::vector<RecountedDocument>& docs) {
  sqlite3* db = db_.get();
  {
    sql::Statement active(db, "SELECT EXISTS (SELECT 1 FROM rebuild)");
    if (!active.ok() || active.Step() != SQLITE_ROW)
      return sql::ErrorStatus(db, path_);
    if (active.ColumnInt(0) == 0) {
      return Status::InvalidArgument(
          path_ + ": no rebuild is in progress (another one replaced it)");
    }
  }
  SideCounts side(db, path_);
  if (Status s = side.status(); !s.ok()) return s;
  sql::Statement member(db, kMembership);
  sql::Statement known(
      db, "SELECT EXISTS (SELECT 1 FROM rebuild_docs WHERE ledger_id = ?)");
  sql::Statement put(
      db,
      "INSERT INTO rebuild_docs(ledger_id, counted_queue, tokens, term_counts) "
      "VALUES(?, ?, ?, ?)");
  if (!member.ok() || !known.ok() || !put.ok()) {
    return Status::IoError(path_ + ": " + member.error() + known.error() +
                           put.error());
  }
  // Summed over the batch first (terms numbered, one column of sums per
  // queue), then written by the writer of the model's counts, each (term,
  // queue) once (count_writer.h), into the side tables.
  CountSums sums;
  std::map<int64_t, std::pair<int64_t, int64_t>>
      totals;  // queue -> documents, tokens
  for (const RecountedDocument& d : docs) {
    known.Bind(1, d.ledger_id);
    const bool done = known.Step() == SQLITE_ROW && known.ColumnInt(0) != 0;
    known.Reset();
    if (done) continue;
    int64_t queue = 0;
    bool exists = false;
    if (Status s = MembershipOf(member, d.ledger_id, &queue, &exists);
        !s.ok()) {
      return Status::IoError(path_ + ": " + s.message());
    }
    if (!exists) continue;  // forgotten since it was read
    put.Bind(1, d.ledger_id);
    if (queue) {
      put.Bind(2, queue);
      for (const auto& [term, n] : d.terms) sums.Add(queue, term, n);
      auto& [documents, tokens] = totals[queue];
      ++documents;
      tokens += d.tokens;
    } else {
      put.BindNull(2);
    }
    if (Status s =
            put.Bind(3, d.tokens).BindBlob(4, EncodeTermCounts(d.terms)).Run();
        !s.ok()) {
      return s;
    }
  }
  {
    CountWriteOptions options;
    options.terms_table = "rebuild_terms";
    options.counts_table = "rebuild_counts";
    CountWriteResult written;
    if (Status s = sums.Write(db, path_, options, /*running=*/nullptr, &written); !s.ok())
      return s;
  }
  for (const auto& [queue, t] : totals) {
    if (Status s = side.AddTotals(queue, t.first, t.second); !s.ok()) return s;
  }
  return Status::Ok();
}

Status Store::ForgetRecountInTransaction(int64_t ledger_id) {
  sqlite3* db = db_.get();
  sql::Statement st(
      db,
      "SELECT counted_queue, tokens, term_counts FROM rebuild_docs "
      "WHERE ledger_id = ?");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  st.Bind(1, ledger_id);
  int rc = st.Step();
  if (rc == SQLITE_DONE) return Status::Ok();
  if (rc != SQLITE_ROW) return sql::ErrorStatus(db, path_);
  // Once swapped in (the rebuild row gone), the side counts are the model's
  // and only the row is left to delete.
  sql::Statement active(db, "SELECT EXISTS (SELECT 1 FROM rebuild)");
  if (!active.ok() || active.Step() != SQLITE_ROW)
    return sql::ErrorStatus(db, path_);
  const int64_t queue =
      st.ColumnIsNull(0) || active.ColumnInt(0) == 0 ? 0 : st.ColumnInt(0);
  const int64_t tokens = st.ColumnInt(1);
  std::vector<TermCount> terms;
  if (!DecodeTermCounts(st.ColumnBlob(2), &terms)) {
    return Status::Corruption(path_ + ": a recounted document does not decode");
  }
  st.Reset();
  if (queue) {
    SideCounts side(db, path_);
    Status s = side.status();
    if (s.ok()) s = side.Subtract(queue, tokens, terms);
    if (!s.ok()) return s;
  }
  sql::Statement drop(db, "DELETE FROM rebuild_docs WHERE ledger_id = ?");
  if (!drop.ok()) return Status::IoError(path_ + ": " + drop.error());
  return drop.Bind(1, ledger_id).Run();
}

Status Store::UnrecountedDocuments(std::vector<int64_t>* ids) {
  ids->clear();
  sql::Statement st(
      db_.get(),
      "SELECT l.id FROM ledger l WHERE NOT EXISTS "
      "(SELECT 1 FROM rebuild_docs r WHERE r.ledger_id = l.id) ORDER BY l.id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) ids->push_back(st.ColumnInt(0));
  return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db_.get(), path_);
}

Status Store::CountKeptTexts(int64_t* documents, int64_t* without_text) {
  sql::Statement st(db_.get(),
                    "SELECT COUNT(*), COUNT(*) - COUNT(text) FROM ledger");
  if (!st.ok() || st.Step() != SQLITE_ROW)
    return sql::ErrorStatus(db_.get(), path_);
  *documents = st.ColumnInt(0);
  *without_text = st.ColumnInt(1);
  return Status::Ok();
}

Status Store::ReadTextsOf(
    const std::vector<int64_t>& ids,
    const std::function<Status(int64_t id, const std::optional<std::string>&)>&
        fn) {
  sql::Statement st(db_.get(), "SELECT text FROM ledger WHERE id = ?");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  TextCodec codec;
  std::optional<std::string> text;
  for (int64_t id : ids) {
    st.Bind(1, id);
    int rc = st.Step();
    if (rc == SQLITE_DONE) {
      st.Reset();
      continue;
    }
    if (rc != SQLITE_ROW) return sql::ErrorStatus(db_.get(), path_);
    text.reset();
    if (!st.ColumnIsNull(0)) {
      std::string unpacked;
      if (Status s = codec.Unpack(st.ColumnBlob(0), &unpacked); !s.ok()) {
        return Status::Corruption(path_ + ": the kept text of ledger entry " +
                                  std::to_string(id) +
                                  " does not unpack: " + s.message());
      }
      text = std::move(unpacked);
    }
    st.Reset();
    if (Status s = fn(id, text); !s.ok()) return s;
  }
  return Status::Ok();
}

Status Store::SwapRecount(const std::string& command, const ChangeInfo& change,
                          const std::string& details,
                          const RecountFunction& recount, SwapResult* result) {
  *result = SwapResult();
  {
    sql::Transaction tx(db_.get());
    if (!tx.status().ok())
      return Status::Busy(path_ + ": " + tx.status().message());
    Status s =
        SwapRecountInTransaction(command, change, details, recount, result);
    if (!s.ok()) return s;
    FaultPoint("rebuild.swap_before_commit");
    s = tx.Commit();
    if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  }
  // The swap is done; leftovers that fail to go now go with the next one.
  FaultPoint("rebuild.before_cleanup");
  DropRecountLeftovers();
  return Status::Ok();
}

Status Store::SwapRecountInTransaction(const std::string& command,
                                       const ChangeInfo& change,
                                       const std::string& details,
                                       const RecountFunction& recount,
                                       SwapResult* result) {
  if (Status d = SecureDelete(db_.get(), path_); !d.ok()) return d;
  sqlite3* db = db_.get();
  std::optional<RecountInfo> info;
  Status s = LoadRecount(&info);
  if (!s.ok()) return s;
  if (!info)
    return Status::NotFound(path_ + ": there is no recount to swap in");

  // Documents learned since the last look: recounted now, from their text.
  std::vector<int64_t> missing;
  if (s = UnrecountedDocuments(&missing); !s.ok()) return s;
  std::vector<RecountedDocument> caught;
  int64_t without_text = 0;
  s = ReadTextsOf(missing,
                  [&](int64_t id, const std::optional<std::string>& text) {
                    if (!text) {
                      ++without_text;
                      return Status::Ok();
                    }
                    RecountedDocument d;
                    d.ledger_id = id;
                    Status r = recount(*text, &d);
                    if (r.ok()) caught.push_back(std::move(d));
                    return r;
                  });
  if (!s.ok()) return s;
  if (without_text > 0) {
    return Status::InvalidArgument(
        path_ + ": " + std::to_string(without_text) +
        " documents learned during the rebuild have no kept text");
  }
  if (s = WriteRecountedInTransaction(caught); !s.ok()) return s;
  result->caught_up = static_cast<int64_t>(caught.size());

  // Documents whose membership may have changed since they were recounted:
  // those in the change log after the base version (all of them when that
  // part of the log was pruned).
  std::vector<int64_t> touched;
  {
    sql::Statement base(db,
                        "SELECT EXISTS (SELECT 1 FROM versions WHERE id = ?)");
    base.Bind(1, info->base_version);
    if (!base.ok() || base.Step() != SQLITE_ROW)
      return sql::ErrorStatus(db, path_);
    const bool logged = base.ColumnInt(0) != 0;
    base.Reset();
    sql::Statement st(
        db, logged ? "SELECT DISTINCT document FROM changes WHERE version > ?"
                   : "SELECT id FROM ledger WHERE ? IS NOT NULL");
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    st.Bind(1, info->base_version);
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) touched.push_back(st.ColumnInt(0));
    if (rc != SQLITE_DONE) return sql::ErrorStatus(db, path_);
  }
  {
    SideCounts side(db, path_);
    if (s = side.status(); !s.ok()) return s;
    sql::Statement member(db, kMembership);
    sql::Statement doc(db,
                       "SELECT IFNULL(counted_queue, 0), tokens, term_counts "
                       "FROM rebuild_docs "
                       "WHERE ledger_id = ?");
    sql::Statement mark(
        db, "UPDATE rebuild_docs SET counted_queue = ? WHERE ledger_id = ?");
    if (!member.ok() || !doc.ok() || !mark.ok()) {
      return Status::IoError(path_ + ": " + member.error() + doc.error() +
                             mark.error());
    }
    std::vector<TermCount> terms;
    for (int64_t id : touched) {
      int64_t queue = 0;
      bool exists = false;
      if (s = MembershipOf(member, id, &queue, &exists); !s.ok()) {
        return Status::IoError(path_ + ": " + s.message());
      }
      if (!exists) continue;
      doc.Bind(1, id);
      if (doc.Step() != SQLITE_ROW) {
        doc.Reset();
        return Status::Corruption(path_ + ": a ledger document has no recount");
      }
      const int64_t counted = doc.ColumnInt(0);
      const int64_t tokens = doc.ColumnInt(1);
      const bool decoded = DecodeTermCounts(doc.ColumnBlob(2), &terms);
      doc.Reset();
      if (!decoded)
        return Status::Corruption(path_ +
                                  ": a recounted document does not decode");
      if (counted == queue) continue;
      if (counted && (s = side.Subtract(counted, tokens, terms), !s.ok()))
        return s;
      if (queue && (s = side.Add(queue, tokens, terms), !s.ok())) return s;
      mark.Bind(2, id);
      if (queue) {
        mark.Bind(1, queue);
      } else {
        mark.BindNull(1);
      }
      if (s = mark.Run(); !s.ok()) return s;
      ++result->resynced;
    }
  }

  // Nothing may be missing: every ledger document recounted, every queue
  // with the current model's number of documents.
  {
    sql::Statement st(
        db,
        "SELECT (SELECT COUNT(*) FROM ledger) - (SELECT COUNT(*) FROM "
        "rebuild_docs), "
        "(SELECT COUNT(*) FROM queues q LEFT JOIN rebuild_queues r "
        "ON r.queue_id = q.id WHERE q.documents != IFNULL(r.documents, 0))");
    if (!st.ok() || st.Step() != SQLITE_ROW) return sql::ErrorStatus(db, path_);
    if (st.ColumnInt(0) != 0 || st.ColumnInt(1) != 0) {
      return Status::Corruption(
          path_ + ": the recount does not cover the current model (" +
          std::to_string(st.ColumnInt(0)) + " documents, " +
          std::to_string(st.ColumnInt(1)) +
          " queues differ); nothing was changed");
    }
  }

  // The swap: every ledger entry's own counts, then the tables by name.
  s = sql::Exec(
      db,
      "UPDATE ledger SET tokens = r.tokens, term_counts = r.term_counts "
      "FROM rebuild_docs r WHERE r.ledger_id = ledger.id;"
      "UPDATE queues SET tokens = IFNULL((SELECT r.tokens FROM rebuild_queues "
      "r "
      "WHERE r.queue_id = queues.id), 0);"
      "ALTER TABLE counts RENAME TO counts_old;"
      "ALTER TABLE terms RENAME TO terms_old;"
      "ALTER TABLE rebuild_terms RENAME TO terms;"
      "ALTER TABLE rebuild_counts RENAME TO counts;"
      "DELETE FROM rebuild; DELETE FROM candidate;");
  if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
  if (s = SaveSettingsInTransaction(info->settings); !s.ok()) return s;
  if (command.empty()) return Status::Ok();
  VersionDelta delta;
  delta.details = details;
  return RecordVersionInTransaction(command, change, delta, &result->made);
}

Status Store::RollbackWithRecount(int64_t v, const ChangeInfo& change,
                                  const RecountFunction& recount,
                                  RollbackResult* result) {
  *result = RollbackResult();
  {
    sql::Transaction tx(db_.get());
    if (!tx.status().ok())
      return Status::Busy(path_ + ": " + tx.status().message());
    VersionState target;
    Status s = LoadVersionState(v, &target);
    if (!s.ok()) return s;
    std::optional<RecountInfo> info;
    if (s = LoadRecount(&info); !s.ok()) return s;
    if (!info || !SameTokenizing(info->settings, target.settings)) {
      return Status::InvalidArgument(
          path_ + ": no recount with the tokenizing settings of version " +
          std::to_string(v) + " is ready");
    }
    SwapResult swap;
    s = SwapRecountInTransaction("", change, "", recount, &swap);
    if (s.ok()) {
      s = ApplyStateInTransaction(
          target, "rollback", change,
          "{\"rollback_to\":" + std::to_string(v) + ",\"recounted\":true}",
          result);
    }
    if (!s.ok()) return s;
    s = tx.Commit();
    if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  }
  DropRecountLeftovers();
  return Status::Ok();
}

Status Store::ChangeModelSettings(const StoreSettings& settings,
                                  const std::string& command,
                                  const ChangeInfo& change,
                                  const std::string& details,
                                  VersionInfo* made) {
  if (!SameTokenizing(settings, settings_)) {
    return Status::InvalidArgument(
        path_ + ": other tokenizing settings need a recount");
  }
  sql::Transaction tx(db_.get());
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  Status s = SaveSettingsInTransaction(settings);
  if (!s.ok()) return s;
  VersionDelta delta;
  delta.details = details;
  if (s = RecordVersionInTransaction(command, change, delta, made); !s.ok())
    return s;
  s = tx.Commit();
  return s.ok() ? s : Status::IoError(path_ + ": commit: " + s.message());
}

}  // namespace chute
