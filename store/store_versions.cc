// Versions: every committed change of the model is recorded, inside its own
// transaction, as a row of `versions` (who, when, what, the fingerprint and
// a header of settings and queues), the documents it moved in the change log
// (`changes`), and every kSnapshotEvery versions a snapshot of the
// membership. A version's model is its header plus its members, each counted
// from its own stored term counts (schema.h).
#include <algorithm>
#include <charconv>
#include <chrono>
#include <cstdio>
#include <ctime>
#include <string>
#include <unordered_map>
#include <utility>
#include <vector>

#include "store/fingerprint.h"
#include "store/store.h"
#include "store/term_counts_codec.h"
#include "store/version_codec.h"

namespace chute {

std::string StoreClockNow() {
  std::time_t t = std::chrono::system_clock::to_time_t(std::chrono::system_clock::now());
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

namespace {

VersionInfo ReadVersionRow(const sql::Statement& st) {
  VersionInfo v;
  v.version = st.ColumnInt(0);
  v.time = st.ColumnText(1);
  v.command = st.ColumnText(2);
  v.by = st.ColumnText(3);
  v.added = st.ColumnInt(4);
  v.moved = st.ColumnInt(5);
  v.removed = st.ColumnInt(6);
  v.fingerprint = st.ColumnText(7);
  v.details = st.ColumnText(8);
  return v;
}

constexpr char kVersionColumns[] =
    "SELECT id, time, command, by, added, moved, removed, fingerprint, "
    "IFNULL(details, '') FROM versions ";

}  // namespace

Status Store::CurrentMembersInTransaction(std::vector<std::pair<int64_t, int64_t>>* out) {
  out->clear();
  sql::Statement st(db_.get(), "SELECT id, queue_id FROM ledger WHERE in_model = 1 ORDER BY id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) out->emplace_back(st.ColumnInt(0), st.ColumnInt(1));
  return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db_.get(), path_);
}

Status Store::WriteSnapshotInTransaction(int64_t v) {
  std::vector<std::pair<int64_t, int64_t>> members;
  Status s = CurrentMembersInTransaction(&members);
  if (!s.ok()) return s;
  sql::Statement put(db_.get(),
                     "INSERT INTO snapshots(version, members) VALUES(?, ?) "
                     "ON CONFLICT(version) DO UPDATE SET members = excluded.members");
  if (!put.ok()) return Status::IoError(path_ + ": " + put.error());
  return put.Bind(1, v).BindBlob(2, EncodeMembers(members)).Run();
}

Status Store::StartRunningSumInTransaction() {
  if (sum_state_ != SumState::kFresh) return Status::Ok();
  sql::Statement get(db_.get(), "SELECT value FROM settings WHERE key = 'counts_sum'");
  if (!get.ok()) return Status::IoError(path_ + ": " + get.error());
  if (get.Step() == SQLITE_ROW && CountsSum::FromHex(get.ColumnText(0), &running_sum_)) {
    sum_state_ = SumState::kRunning;
    return Status::Ok();
  }
  // Not recorded yet (or damaged): sum every count once.
  ModelCounts counts;
  if (Status s = LoadModelCounts(&counts); !s.ok()) return s;
  running_sum_ = SumOfCounts(counts);
  sum_state_ = SumState::kRunning;
  return Status::Ok();
}

Status Store::EraseFromSnapshotsInTransaction(const std::vector<int64_t>& ids) {
  if (ids.empty()) return Status::Ok();
  std::vector<int64_t> gone(ids);
  std::sort(gone.begin(), gone.end());
  sql::Statement all(db_.get(), "SELECT version, members FROM snapshots");
  sql::Statement put(db_.get(), "UPDATE snapshots SET members = ? WHERE version = ?");
  if (!all.ok() || !put.ok()) return Status::IoError(path_ + ": " + all.error() + put.error());
  std::vector<std::pair<int64_t, std::string>> rewritten;
  std::vector<std::pair<int64_t, int64_t>> members;
  int rc;
  while ((rc = all.Step()) == SQLITE_ROW) {
    if (!DecodeMembers(all.ColumnBlob(1), &members)) {
      return Status::Corruption(path_ + ": the snapshot of version " +
                                std::to_string(all.ColumnInt(0)) + " is damaged");
    }
    size_t before = members.size();
    std::erase_if(members, [&](const std::pair<int64_t, int64_t>& m) {
      return std::binary_search(gone.begin(), gone.end(), m.first);
    });
    if (members.size() != before) rewritten.emplace_back(all.ColumnInt(0), EncodeMembers(members));
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  for (const auto& [version, blob] : rewritten) {
    if (Status s = put.BindBlob(1, blob).Bind(2, version).Run(); !s.ok()) return s;
  }
  return Status::Ok();
}

Status Store::CurrentQueuesInTransaction(std::vector<VersionQueue>* out) {
  out->clear();
  sql::Statement st(db_.get(),
                    "SELECT id, name, set_prior, retired IS NOT NULL FROM queues ORDER BY id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    VersionQueue q;
    q.id = st.ColumnInt(0);
    q.name = st.ColumnText(1);
    if (!st.ColumnIsNull(2)) q.set_prior = st.ColumnDouble(2);
    q.retired = st.ColumnInt(3) != 0;
    out->push_back(std::move(q));
  }
  return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db_.get(), path_);
}

Status Store::RecordVersionInTransaction(const std::string& command, const ChangeInfo& change,
                                         const VersionDelta& delta, VersionInfo* made) {
  sqlite3* db = db_.get();
  // The settings as this transaction sees them: another process (a
  // rebuild) may have changed them since this one opened the store.
  if (Status s = LoadSettings(); !s.ok()) return s;
  // The queues (and, unless a running sum was kept, every count).
  ModelCounts counts;
  Status s;
  CountsSum sum;
  if (sum_state_ == SumState::kRunning) {
    s = LoadQueueCounts(&counts);
    sum = running_sum_;
  } else {
    s = LoadModelCounts(&counts);
    sum = SumOfCounts(counts);
  }
  sum_state_ = SumState::kFresh;
  if (!s.ok()) return s;
  {
    sql::Statement put(db,
                       "INSERT INTO settings(key, value) VALUES('counts_sum', ?) "
                       "ON CONFLICT(key) DO UPDATE SET value = excluded.value");
    if (!put.ok()) return Status::IoError(path_ + ": " + put.error());
    if (s = put.Bind(1, sum.Hex()).Run(); !s.ok()) return s;
  }
  std::vector<VersionQueue> queues;
  if (s = CurrentQueuesInTransaction(&queues); !s.ok()) return s;
  VersionInfo v;
  v.time = change.now.empty() ? StoreClockNow() : change.now;
  v.command = command;
  v.by = change.by;
  v.added = delta.added;
  v.moved = delta.moved;
  v.removed = delta.removed;
  v.fingerprint = ModelFingerprint(settings_, counts, sum);
  v.details = delta.details;
  sql::Statement add(db,
                     "INSERT INTO versions(time, command, by, added, moved, removed, "
                     "fingerprint, header, details) VALUES(?, ?, ?, ?, ?, ?, ?, ?, ?)");
  if (!add.ok()) return Status::IoError(path_ + ": " + add.error());
  add.Bind(1, v.time).Bind(2, v.command).Bind(3, v.by).Bind(4, v.added).Bind(5, v.moved);
  add.Bind(6, v.removed).Bind(7, v.fingerprint).Bind(8, EncodeHeader(settings_, queues));
  if (v.details.empty()) {
    add.BindNull(9);
  } else {
    add.Bind(9, v.details);
  }
  if (s = add.Run(); !s.ok()) return s;
  v.version = sqlite3_last_insert_rowid(db);
  sql::Statement log(db,
                     "INSERT INTO changes(version, document, from_queue, to_queue) "
                     "VALUES(?, ?, ?, ?)");
  if (!log.ok()) return Status::IoError(path_ + ": " + log.error());
  for (const MemberChange& c : delta.changes) {
    log.Bind(1, v.version).Bind(2, c.ledger_id);
    if (c.from_queue) {
      log.Bind(3, c.from_queue);
    } else {
      log.BindNull(3);
    }
    if (c.to_queue) {
      log.Bind(4, c.to_queue);
    } else {
      log.BindNull(4);
    }
    if (s = log.Run(); !s.ok()) return s;
  }
  if (v.version % kSnapshotEvery == 0) {
    if (s = WriteSnapshotInTransaction(v.version); !s.ok()) return s;
  }
  if (made) *made = std::move(v);
  return Status::Ok();
}

Status Store::EnsureFirstVersion() {
  {
    sql::Statement any(db_.get(), "SELECT EXISTS (SELECT 1 FROM versions)");
    if (!any.ok() || any.Step() != SQLITE_ROW) return sql::ErrorStatus(db_.get(), path_);
    if (any.ColumnInt(0) != 0) return Status::Ok();
  }
  sql::Transaction tx(db_.get());
  if (!tx.status().ok()) return Status::Busy(path_ + ": " + tx.status().message());
  // Another process may have recorded it while this one waited.
  sql::Statement any(db_.get(), "SELECT EXISTS (SELECT 1 FROM versions)");
  if (!any.ok() || any.Step() != SQLITE_ROW) return sql::ErrorStatus(db_.get(), path_);
  if (any.ColumnInt(0) != 0) return Status::Ok();
  any.Reset();
  VersionDelta delta;
  std::vector<std::pair<int64_t, int64_t>> members;
  Status s = CurrentMembersInTransaction(&members);
  if (!s.ok()) return s;
  for (const auto& [id, queue] : members) delta.changes.push_back({id, 0, queue});
  delta.added = static_cast<int64_t>(members.size());
  s = RecordVersionInTransaction("upgrade", ChangeInfo{"", "chute"}, delta);
  if (!s.ok()) return s;
  return tx.Commit();
}

Status Store::ListVersions(std::vector<VersionInfo>* out) {
  out->clear();
  sql::Statement st(db_.get(), std::string(kVersionColumns) + "ORDER BY id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) out->push_back(ReadVersionRow(st));
  return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db_.get(), path_);
}

Status Store::CurrentVersion(VersionInfo* out) {
  sql::Statement st(db_.get(), std::string(kVersionColumns) + "ORDER BY id DESC LIMIT 1");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc = st.Step();
  if (rc == SQLITE_ROW) {
    *out = ReadVersionRow(st);
    return Status::Ok();
  }
  if (rc == SQLITE_DONE) return Status::NotFound(path_ + ": no version has been recorded");
  return sql::ErrorStatus(db_.get(), path_);
}

Status Store::LoadVersionState(int64_t v, VersionState* out) {
  *out = VersionState();
  sqlite3* db = db_.get();
  sql::ReadTransaction read(db);
  if (!read.status().ok()) return read.status();
  {
    sql::Statement st(db, std::string(kVersionColumns) + "WHERE id = ?");
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    st.Bind(1, v);
    if (st.Step() != SQLITE_ROW) {
      sql::Statement range(db, "SELECT MIN(id), MAX(id) FROM versions");
      std::string known;
      if (range.ok() && range.Step() == SQLITE_ROW && !range.ColumnIsNull(0)) {
        known = "; versions " + std::to_string(range.ColumnInt(0)) + " to " +
                std::to_string(range.ColumnInt(1)) + " are kept";
      }
      return Status::NotFound(path_ + ": there is no version " + std::to_string(v) + known);
    }
    out->info = ReadVersionRow(st);
  }
  {
    sql::Statement st(db, "SELECT header FROM versions WHERE id = ?");
    st.Bind(1, v);
    if (st.Step() != SQLITE_ROW || !DecodeHeader(st.ColumnText(0), &out->settings, &out->queues)) {
      return Status::Corruption(path_ + ": the header of version " + std::to_string(v) +
                                " is damaged");
    }
  }
  // The nearest snapshot at or before v, then the change log after it.
  int64_t from = 0;
  std::vector<std::pair<int64_t, int64_t>> snapshot;
  {
    sql::Statement st(db,
                      "SELECT version, members FROM snapshots WHERE version <= ? "
                      "ORDER BY version DESC LIMIT 1");
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    st.Bind(1, v);
    if (st.Step() == SQLITE_ROW) {
      from = st.ColumnInt(0);
      if (!DecodeMembers(st.ColumnBlob(1), &snapshot)) {
        return Status::Corruption(path_ + ": the snapshot of version " + std::to_string(from) +
                                  " is damaged");
      }
    } else {
      // Without a snapshot the log must reach back to the first version.
      sql::Statement first(db, "SELECT MIN(id) FROM versions");
      if (first.Step() != SQLITE_ROW || first.ColumnInt(0) != 1) {
        return Status::Corruption(path_ + ": the history before version " + std::to_string(v) +
                                  " has neither a snapshot nor its first version");
      }
    }
  }
  std::unordered_map<int64_t, int64_t> members(snapshot.begin(), snapshot.end());
  sql::Statement log(db,
                     "SELECT document, to_queue FROM changes WHERE version > ? AND version <= ? "
                     "ORDER BY version, rowid");
  if (!log.ok()) return Status::IoError(path_ + ": " + log.error());
  log.Bind(1, from).Bind(2, v);
  int rc;
  while ((rc = log.Step()) == SQLITE_ROW) {
    if (log.ColumnIsNull(1)) {
      members.erase(log.ColumnInt(0));
    } else {
      members[log.ColumnInt(0)] = log.ColumnInt(1);
    }
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db, path_);
  out->members.assign(members.begin(), members.end());
  std::sort(out->members.begin(), out->members.end());
  return Status::Ok();
}

Status Store::ModelAtVersion(int64_t v, VersionInfo* info, StoreSettings* settings,
                             ModelCounts* out) {
  *out = ModelCounts();
  sqlite3* db = db_.get();
  sql::ReadTransaction read(db);
  if (!read.status().ok()) return read.status();
  VersionState state;
  Status s = LoadVersionState(v, &state);
  if (!s.ok()) return s;
  if (!SameTokenizing(state.settings, settings_)) {
    return Status::InvalidArgument(
        path_ + ": version " + std::to_string(v) +
        " tokenized with other settings than the store's documents are counted with now "
        "(a rebuild changed them); its documents must be recounted from their kept text");
  }
  s = SumMembers(state.queues, state.members, /*recounted=*/false, out);
  if (!s.ok()) return s;
  *info = state.info;
  *settings = state.settings;
  return Status::Ok();
}

Status Store::SumMembers(const std::vector<VersionQueue>& queues,
                         const std::vector<std::pair<int64_t, int64_t>>& members, bool recounted,
                         ModelCounts* out) {
  *out = ModelCounts();
  sqlite3* db = db_.get();
  // Columns: the queues that are not retired, by name.
  std::vector<const VersionQueue*> live;
  for (const VersionQueue& q : queues) {
    if (!q.retired) live.push_back(&q);
  }
  std::sort(live.begin(), live.end(),
            [](const VersionQueue* a, const VersionQueue* b) { return a->name < b->name; });
  std::unordered_map<int64_t, size_t> column;
  for (const VersionQueue* q : live) {
    column[q->id] = out->queues.size();
    QueueCounts qc;
    qc.name = q->name;
    qc.set_prior = q->set_prior;
    out->queues.push_back(std::move(qc));
  }
  const size_t nq = out->queues.size();
  std::unordered_map<std::string, size_t> row_of;
  std::vector<std::string> terms;
  std::vector<int64_t> sums;
  sql::Statement doc(db, recounted
                             ? "SELECT tokens, term_counts FROM rebuild_docs WHERE ledger_id = ?"
                             : "SELECT tokens, term_counts FROM ledger WHERE id = ?");
  if (!doc.ok()) return Status::IoError(path_ + ": " + doc.error());
  std::vector<TermCount> own;
  for (const auto& [id, queue] : members) {
    auto col = column.find(queue);
    if (col == column.end()) {
      return Status::Corruption(path_ + ": a model counts a document in a queue it does not list");
    }
    doc.Bind(1, id);
    if (doc.Step() != SQLITE_ROW || !DecodeTermCounts(doc.ColumnBlob(1), &own)) {
      doc.Reset();
      return Status::Corruption(path_ + ": a document of a model is missing from the " +
                                (recounted ? "recount" : "ledger") + " or does not decode");
    }
    QueueCounts& qc = out->queues[col->second];
    ++qc.documents;
    qc.tokens += doc.ColumnInt(0);
    doc.Reset();
    for (auto& [term, n] : own) {
      auto [it, inserted] = row_of.emplace(std::move(term), terms.size());
      if (inserted) {
        terms.push_back(it->first);
        sums.resize(sums.size() + nq, 0);
      }
      sums[it->second * nq + col->second] += n;
    }
  }
  std::vector<size_t> order(terms.size());
  for (size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::sort(order.begin(), order.end(), [&](size_t a, size_t b) { return terms[a] < terms[b]; });
  out->terms.reserve(terms.size());
  out->counts.reserve(sums.size());
  for (size_t r : order) {
    out->terms.push_back(std::move(terms[r]));
    out->counts.insert(out->counts.end(), sums.begin() + static_cast<ptrdiff_t>(r * nq),
                       sums.begin() + static_cast<ptrdiff_t>((r + 1) * nq));
  }
  return Status::Ok();
}

Status Store::PruneVersions(int64_t before, int64_t* dropped) {
  *dropped = 0;
  sqlite3* db = db_.get();
  Status s = sql::Exec(db, "PRAGMA secure_delete = ON");
  if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
  sql::Transaction tx(db);
  if (!tx.status().ok()) return Status::Busy(path_ + ": " + tx.status().message());
  VersionState state;
  s = LoadVersionState(before, &state);
  if (!s.ok()) return s;
  sql::Statement put(db,
                     "INSERT INTO snapshots(version, members) VALUES(?, ?) "
                     "ON CONFLICT(version) DO UPDATE SET members = excluded.members");
  if (!put.ok()) return Status::IoError(path_ + ": " + put.error());
  s = put.Bind(1, before).BindBlob(2, EncodeMembers(state.members)).Run();
  if (!s.ok()) return s;
  for (const char* sql : {"DELETE FROM changes WHERE version <= ?",
                          "DELETE FROM snapshots WHERE version < ?",
                          "DELETE FROM versions WHERE id < ?"}) {
    sql::Statement st(db, sql);
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    if (s = st.Bind(1, before).Run(); !s.ok()) return s;
    if (std::string_view(sql).find("versions") != std::string_view::npos) {
      *dropped = sqlite3_changes(db);
    }
  }
  return tx.Commit();
}

}  // namespace chute
