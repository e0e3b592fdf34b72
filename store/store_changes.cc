// Changes to what was learned: naming a learned document, moving it to
// another queue (corrections), unlearning it (forget), going back to an
// earlier version (rollback). Each public call is one transaction, which
// records the version it makes (store_versions.cc).
#include <algorithm>
#include <cstdint>
#include <functional>
#include <string>
#include <unordered_map>
#include <utility>
#include <vector>

#include "store/count_tables.h"
#include "store/fault_point.h"
#include "store/store.h"
#include "store/term_counts_codec.h"

namespace chute {

namespace {

constexpr char kLedgerColumns[] =
    "SELECT l.id, l.digest, l.queue_id, q.name, l.source, l.learned_at, "
    "l.tokens, l.term_counts, l.in_model "
    "FROM ledger l JOIN queues q ON q.id = l.queue_id ";

// A ledger row with its own term counts decoded.
struct StoredDocument {
  int64_t ledger_id = 0;
  int64_t queue_id = 0;
  LedgerEntry entry;
  std::vector<TermCount> terms;
};

// Reads the ledger row of digest; *found is false when it is not learned.
Status ReadStoredWhere(sqlite3* db, const std::string& path, const char* where,
                       const std::function<void(sql::Statement&)>& bind,
                       const std::string& what, StoredDocument* out, bool* found) {
  *found = false;
  sql::Statement st(db, std::string(kLedgerColumns) + where);
  if (!st.ok()) return Status::IoError(path + ": " + st.error());
  bind(st);
  int rc = st.Step();
  if (rc == SQLITE_DONE) return Status::Ok();
  if (rc != SQLITE_ROW) return sql::ErrorStatus(db, path);
  out->ledger_id = st.ColumnInt(0);
  out->queue_id = st.ColumnInt(2);
  out->entry =
      LedgerEntry{std::string(st.ColumnText(1)), std::string(st.ColumnText(3)),
                  std::string(st.ColumnText(4)), std::string(st.ColumnText(5)),
                  st.ColumnInt(6), st.ColumnInt(8) != 0};
  if (!DecodeTermCounts(st.ColumnBlob(7), &out->terms)) {
    return Status::Corruption(path + ": the ledger entry of " + what +
                              " does not decode");
  }
  *found = true;
  return Status::Ok();
}

Status ReadStored(sqlite3* db, const std::string& path,
                  const std::string& digest, StoredDocument* out, bool* found) {
  return ReadStoredWhere(
      db, path, "WHERE l.digest = ?", [&](sql::Statement& st) { st.Bind(1, digest); },
      digest, out, found);
}

Status ReadStoredById(sqlite3* db, const std::string& path, int64_t id,
                      StoredDocument* out, bool* found) {
  return ReadStoredWhere(
      db, path, "WHERE l.id = ?", [&](sql::Statement& st) { st.Bind(1, id); },
      "ledger id " + std::to_string(id), out, found);
}

// Adds or subtracts one document's term counts in one queue (CountTables
// over terms and counts), with the queue's totals.
class CountEditor {
 public:
  CountEditor(sqlite3* db, std::string path)
      : tables_(db, path, "terms", "counts"),
        path_(std::move(path)),
        queue_totals_(
            db,
            "UPDATE queues SET documents = documents + ?, tokens = tokens + ? "
            "WHERE id = ?") {}

  Status status() const {
    if (!queue_totals_.ok()) return Status::IoError(path_ + ": " + queue_totals_.error());
    return tables_.status();
  }

  // N(q, w) += n for every term, N(q) += tokens, documents(q) += 1.
  Status Add(int64_t queue_id, const StoredDocument& doc) {
    for (const auto& [term, n] : doc.terms) {
      if (Status s = tables_.Add(queue_id, term, n); !s.ok()) return s;
    }
    return queue_totals_.Bind(1, int64_t{1})
        .Bind(2, doc.entry.tokens)
        .Bind(3, queue_id)
        .Run();
  }

  // The reverse of Add. With drop_terms, a term whose counts are all gone
  // is deleted from the vocabulary (counted in *dropped). Fails on counts
  // smaller than the document's own (a damaged store).
  Status Subtract(int64_t queue_id, const StoredDocument& doc, bool drop_terms,
                  int64_t* dropped) {
    for (const auto& [term, n] : doc.terms) {
      bool too_small = false;
      Status s = tables_.Subtract(queue_id, term, n, drop_terms, dropped, &too_small);
      if (!s.ok()) return s;
      if (too_small) {
        return Status::Corruption(
            path_ + ": the counts of queue '" + doc.entry.queue +
            "' are smaller than those of its document " + doc.entry.digest);
      }
    }
    return queue_totals_.Bind(1, int64_t{-1})
        .Bind(2, -doc.entry.tokens)
        .Bind(3, queue_id)
        .Run();
  }

 private:
  CountTables tables_;
  std::string path_;
  sql::Statement queue_totals_;
};

}  // namespace

Status Store::MoveInTransaction(
    const std::vector<std::pair<std::string, int64_t>>& moves,
    std::vector<std::string>* from, VersionDelta* delta) {
  from->clear();
  if (moves.empty()) return Status::Ok();
  sqlite3* db = db_.get();
  sum_state_ = SumState::kInvalid;  // CountEditor does not keep the sum
  CountEditor edit(db, path_);
  Status s = edit.status();
  if (!s.ok()) return s;
  sql::Statement relabel(db, "UPDATE ledger SET queue_id = ?, in_model = 1 WHERE id = ?");
  if (!relabel.ok()) return Status::IoError(path_ + ": " + relabel.error());
  for (const auto& [digest, to_queue_id] : moves) {
    StoredDocument doc;
    bool found = false;
    s = ReadStored(db, path_, digest, &doc, &found);
    if (!s.ok()) return s;
    if (!found)
      return Status::NotFound(path_ + ": " + digest + " is not learned");
    from->push_back(doc.entry.queue);
    if (doc.entry.in_model) {
      if (doc.queue_id == to_queue_id) continue;
      int64_t dropped = 0;
      s = edit.Subtract(doc.queue_id, doc, /*drop_terms=*/false, &dropped);
      delta->changes.push_back({doc.ledger_id, doc.queue_id, to_queue_id});
      ++delta->moved;
    } else {
      // Kept only for history: a correction counts it again.
      delta->changes.push_back({doc.ledger_id, 0, to_queue_id});
      ++delta->added;
    }
    if (s.ok()) s = edit.Add(to_queue_id, doc);
    if (s.ok()) s = relabel.Bind(1, to_queue_id).Bind(2, doc.ledger_id).Run();
    if (!s.ok()) return s;
  }
  return Status::Ok();
}

Status Store::ResolveDocument(const DocumentName& name, Resolution* out) {
  *out = Resolution();
  sqlite3* db = db_.get();
  sql::ReadTransaction read(db);
  if (!read.status().ok()) return read.status();
  // At most this many candidates are listed for an ambiguous name.
  constexpr int64_t kShown = 5;
  auto query = [&](const std::string& where,
                   const std::vector<std::string>& values,
                   bool* done) -> Status {
    *done = false;
    sql::Statement st(
        db,
        "SELECT l.digest, q.name, l.source, l.learned_at, l.tokens, l.in_model "
        "FROM ledger l JOIN queues q ON q.id = l.queue_id WHERE " +
            where + " ORDER BY l.digest LIMIT ?");
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    int i = 1;
    for (const std::string& v : values) st.Bind(i++, v);
    st.Bind(i, kShown + 1);
    std::vector<LedgerEntry> rows;
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      rows.push_back(LedgerEntry{
          std::string(st.ColumnText(0)), std::string(st.ColumnText(1)),
          std::string(st.ColumnText(2)), std::string(st.ColumnText(3)),
          st.ColumnInt(4), st.ColumnInt(5) != 0});
    }
    if (rc != SQLITE_DONE) return sql::ErrorStatus(db, path_);
    if (rows.empty()) return Status::Ok();
    *done = true;
    if (rows.size() == 1) {
      out->kind = Resolution::Kind::kFound;
      out->entry = std::move(rows[0]);
    } else {
      out->kind = Resolution::Kind::kAmbiguous;
      for (const LedgerEntry& e : rows) out->candidates.push_back(e.digest);
    }
    return Status::Ok();
  };
  bool done = false;
  Status s;
  if (!name.digest.empty()) {
    s = query("l.digest = ?", {name.digest}, &done);
    if (!s.ok() || done) return s;
  }
  if (!name.source.empty()) {
    s = query("l.source = ?", {name.source}, &done);
    if (!s.ok() || done) return s;
  }
  if (!name.prefix.empty()) {
    // Digests are lowercase hex, and 'g' sorts after every hex digit, so
    // [p, p + "g") holds exactly the digests that begin with p.
    s = query("l.digest >= ? AND l.digest < ?",
              {name.prefix, name.prefix + "g"}, &done);
    if (!s.ok()) return s;
  }
  return Status::Ok();
}

Status Store::Correct(const std::vector<CorrectMove>& moves,
                      const LearnBatch& batch, const ChangeInfo& change,
                      CorrectResult* result) {
  *result = CorrectResult();
  sum_state_ = SumState::kFresh;
  struct SumReset {
    SumState* state;
    ~SumReset() { *state = SumState::kFresh; }
  } sum_reset{&sum_state_};
  sql::Transaction tx(db_.get());
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  std::vector<std::pair<std::string, int64_t>> targets;
  std::unordered_map<std::string, int64_t> queue_ids;
  for (const CorrectMove& m : moves) {
    auto [it, inserted] = queue_ids.emplace(m.queue, 0);
    if (inserted) {
      bool created = false;
      Status s =
          QueueIdInTransaction(m.queue, change.now.empty() ? StoreClockNow() : change.now, &it->second, &created);
      if (!s.ok()) return s;
    }
    targets.emplace_back(m.digest, it->second);
  }
  VersionDelta delta;
  if (Status s = MoveInTransaction(targets, &result->from, &delta); !s.ok())
    return s;
  result->moved = delta.moved + delta.added;
  if (!batch.empty()) {
    Status s = LearnInTransaction(
        batch, change.now.empty() ? StoreClockNow() : change.now,
        &result->learned, &delta);
    if (!s.ok()) return s;
  }
  if (!delta.changes.empty()) {
    Status s = RecordVersionInTransaction("correct", change, delta);
    if (!s.ok()) return s;
  }
  FaultPoint("correct.before_commit");
  Status s = tx.Commit();
  if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  return Status::Ok();
}

Status Store::Forget(const std::vector<std::string>& digests,
                     const ChangeInfo& change, ForgetResult* result) {
  *result = ForgetResult();
  sqlite3* db = db_.get();
  // Deleted rows, index entries and freed pages are overwritten with zeros
  // (SQLite, "PRAGMA secure_delete", sqlite.org/pragma.html).
  Status s = sql::Exec(db, "PRAGMA secure_delete = ON");
  if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
  // What a rebuild stopped before its clean-up left (the old vocabulary and
  // counts) may hold the document's terms: it goes first.
  if (s = DropRecountLeftovers(); !s.ok()) return s;
  {
    sql::Transaction tx(db);
    if (!tx.status().ok())
      return Status::Busy(path_ + ": " + tx.status().message());
    CountEditor edit(db, path_);
    if (s = edit.status(); !s.ok()) return s;
    sql::Statement remove(db, "DELETE FROM ledger WHERE id = ?");
    sql::Statement unlog(db, "DELETE FROM changes WHERE document = ?");
    if (!remove.ok() || !unlog.ok())
      return Status::IoError(path_ + ": " + remove.error() + unlog.error());
    VersionDelta delta;
    std::vector<int64_t> erased;
    for (const std::string& digest : digests) {
      StoredDocument doc;
      bool found = false;
      s = ReadStored(db, path_, digest, &doc, &found);
      if (!s.ok()) return s;
      if (!found)
        return Status::NotFound(path_ + ": " + digest + " is not learned");
      if (doc.entry.in_model) {
        s = edit.Subtract(doc.queue_id, doc, /*drop_terms=*/true,
                          &result->removed_terms);
        if (!s.ok()) return s;
        ++delta.removed;
      }
      s = remove.Bind(1, doc.ledger_id).Run();
      // Every trace in the history too: the change log and the snapshots;
      // and its recount, when a rebuild or a candidate holds one.
      if (s.ok()) s = unlog.Bind(1, doc.ledger_id).Run();
      if (s.ok()) s = ForgetRecountInTransaction(doc.ledger_id);
      if (!s.ok()) return s;
      erased.push_back(doc.ledger_id);
      result->forgotten.push_back(std::move(doc.entry));
    }
    if (s = EraseFromSnapshotsInTransaction(erased); !s.ok()) return s;
    if (s = EraseFromCandidateInTransaction(erased); !s.ok()) return s;
    // The version records how many documents left, never which.
    s = RecordVersionInTransaction("forget", change, delta);
    if (!s.ok()) return s;
    FaultPoint("forget.before_commit");
    s = tx.Commit();
    if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  }
  FaultPoint("forget.before_checkpoint");
  // Empty the write-ahead log, which otherwise keeps the pages as they were
  // before.
  result->checkpointed = sql::CheckpointTruncate(db);
  return Status::Ok();
}

}  // namespace chute

namespace chute {

Status Store::Rollback(int64_t v, const ChangeInfo& change,
                       RollbackResult* result) {
  *result = RollbackResult();
  sql::Transaction tx(db_.get());
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  VersionState target;
  Status s = LoadVersionState(v, &target);
  if (!s.ok()) return s;
  if (!SameTokenizing(target.settings, settings_)) {
    return Status::InvalidArgument(
        path_ + ": version " + std::to_string(v) +
        " tokenized with other settings than the store's documents are "
        "counted with now (a rebuild changed them); its documents must be "
        "recounted from their kept text");
  }
  s = ApplyStateInTransaction(target, "rollback", change,
                              "{\"rollback_to\":" + std::to_string(v) + "}",
                              result);
  if (!s.ok()) return s;
  FaultPoint("rollback.before_commit");
  s = tx.Commit();
  if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  return Status::Ok();
}

Status Store::ApplyState(const VersionState& target, const std::string& command,
                         const ChangeInfo& change, const std::string& details,
                         RollbackResult* result) {
  *result = RollbackResult();
  sql::Transaction tx(db_.get());
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  if (!SameTokenizing(target.settings, settings_)) {
    return Status::InvalidArgument(
        path_ + ": the model to apply tokenizes with other settings than the "
        "store's documents are counted with");
  }
  Status s = ApplyStateInTransaction(target, command, change, details, result);
  if (!s.ok()) return s;
  s = tx.Commit();
  if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  return Status::Ok();
}

Status Store::ApplyStateInTransaction(const VersionState& target,
                                      const std::string& command,
                                      const ChangeInfo& change,
                                      const std::string& details,
                                      RollbackResult* result) {
  sqlite3* db = db_.get();
  Status s;

  // Queues: names, hand-set priors and retirements as they were. Names
  // change in two steps, through names no queue can have ('\x01' is refused
  // by queue_name.h), so that swapped names never collide.
  {
    sql::Statement park(db, "UPDATE queues SET name = ? WHERE id = ?");
    sql::Statement set(db,
                       "UPDATE queues SET name = ?, set_prior = ?, retired = "
                       "CASE WHEN ? THEN IFNULL(retired, ?) ELSE NULL END "
                       "WHERE id = ?");
    if (!park.ok() || !set.ok())
      return Status::IoError(path_ + ": " + park.error() + set.error());
    for (const VersionQueue& q : target.queues) {
      s = park.Bind(1, "\x01" + std::to_string(q.id)).Bind(2, q.id).Run();
      if (!s.ok()) return s;
    }
    for (const VersionQueue& q : target.queues) {
      set.Bind(1, q.name);
      if (q.set_prior) {
        set.Bind(2, *q.set_prior);
      } else {
        set.BindNull(2);
      }
      const std::string now = change.now.empty() ? StoreClockNow() : change.now;
      s = set.Bind(3, int64_t{q.retired}).Bind(4, now).Bind(5, q.id).Run();
      if (!s.ok()) return s;
    }
    // Queues made after v have no documents at v: their priors go.
    sql::Statement later(db, "UPDATE queues SET set_prior = NULL WHERE id > ?");
    int64_t last = 0;
    for (const VersionQueue& q : target.queues) last = std::max(last, q.id);
    if (s = later.Bind(1, last).Run(); !s.ok()) return s;
  }

  // Members: out, back in, or moved back.
  std::vector<std::pair<int64_t, int64_t>> now_members;
  if (s = CurrentMembersInTransaction(&now_members); !s.ok()) return s;
  std::unordered_map<int64_t, int64_t> current(now_members.begin(),
                                               now_members.end());
  VersionDelta delta;
  CountEditor edit(db, path_);
  if (s = edit.status(); !s.ok()) return s;
  sql::Statement leave(db, "UPDATE ledger SET in_model = 0 WHERE id = ?");
  sql::Statement enter(db,
                       "UPDATE ledger SET in_model = 1, queue_id = ? WHERE id = ?");
  if (!leave.ok() || !enter.ok())
    return Status::IoError(path_ + ": " + leave.error() + enter.error());
  int64_t dropped = 0;
  // Leaving first, so that the vocabulary never holds a term without a count.
  std::unordered_map<int64_t, int64_t> wanted(target.members.begin(),
                                              target.members.end());
  for (const auto& [id, queue] : now_members) {
    auto w = wanted.find(id);
    if (w != wanted.end() && w->second == queue) continue;
    StoredDocument doc;
    bool found = false;
    if (s = ReadStoredById(db, path_, id, &doc, &found); !s.ok()) return s;
    if (!found) return Status::Corruption(path_ + ": a member is not in the ledger");
    s = edit.Subtract(queue, doc, /*drop_terms=*/true, &dropped);
    if (!s.ok()) return s;
    if (w == wanted.end()) {
      if (s = leave.Bind(1, id).Run(); !s.ok()) return s;
      delta.changes.push_back({id, queue, 0});
      ++delta.removed;
    }
  }
  for (const auto& [id, queue] : target.members) {
    auto c = current.find(id);
    if (c != current.end() && c->second == queue) continue;
    StoredDocument doc;
    bool found = false;
    if (s = ReadStoredById(db, path_, id, &doc, &found); !s.ok()) return s;
    if (!found) return Status::Corruption(path_ + ": a member is not in the ledger");
    s = edit.Add(queue, doc);
    if (s.ok()) s = enter.Bind(1, queue).Bind(2, id).Run();
    if (!s.ok()) return s;
    if (c == current.end()) {
      delta.changes.push_back({id, 0, queue});
      ++delta.added;
    } else {
      delta.changes.push_back({id, c->second, queue});
      ++delta.moved;
    }
  }

  // The model settings of v (its tokenizing settings are the store's).
  StoreSettings settings = settings_;
  settings.model = target.settings.model;
  if (s = SaveSettingsInTransaction(settings); !s.ok()) return s;

  delta.details = details;
  s = RecordVersionInTransaction(command, change, delta, &result->made);
  if (!s.ok()) return s;
  result->added = delta.added;
  result->moved = delta.moved;
  result->removed = delta.removed;
  return Status::Ok();
}

}  // namespace chute
