// Changes to what was learned: naming a learned document, moving it to
// another queue (corrections), unlearning it (forget), going back to an
// earlier version (rollback). Each public call is one transaction, which
// records the version it makes (store_versions.cc).
#include <algorithm>
#include <cstdint>
#include <functional>
#include <map>
#include <string>
#include <string_view>
#include <thread>
#include <unordered_map>
#include <utility>
#include <vector>

#include "store/count_writer.h"
#include "store/fault_point.h"
#include "store/store.h"
#include "store/term_counts_codec.h"

namespace chute {

namespace {

constexpr char kLedgerColumns[] =
    "SELECT l.id, l.digest, l.queue_id, q.name, l.source, l.learned_at, "
    "l.tokens, l.term_counts, l.in_model "
    "FROM ledger l JOIN queues q ON q.id = l.queue_id ";

// A ledger row with its own term counts, encoded (term_counts_codec.h):
// CountDelta reads them without a string per term.
struct StoredDocument {
  int64_t ledger_id = 0;
  int64_t queue_id = 0;
  LedgerEntry entry;
  std::string term_counts;
};

// Reads ledger rows with their term counts, by digest or by ledger id,
// through statements prepared once.
class LedgerReader {
 public:
  LedgerReader(sqlite3* db, std::string path)
      : db_(db),
        path_(std::move(path)),
        by_digest_(db, std::string(kLedgerColumns) + "WHERE l.digest = ?"),
        by_id_(db, std::string(kLedgerColumns) + "WHERE l.id = ?") {}

  Status status() const {
    if (!by_digest_.ok() || !by_id_.ok())
      return Status::IoError(path_ + ": " + by_digest_.error() + by_id_.error());
    return Status::Ok();
  }

  // *found is false when the digest is not learned.
  Status ByDigest(const std::string& digest, StoredDocument* out, bool* found) {
    by_digest_.Bind(1, digest);
    return Read(&by_digest_, out, found);
  }
  Status ById(int64_t id, StoredDocument* out, bool* found) {
    by_id_.Bind(1, id);
    return Read(&by_id_, out, found);
  }

 private:
  Status Read(sql::Statement* st, StoredDocument* out, bool* found) {
    *found = false;
    int rc = st->Step();
    Status s = Status::Ok();
    if (rc == SQLITE_ROW) {
      out->ledger_id = st->ColumnInt(0);
      out->queue_id = st->ColumnInt(2);
      out->entry = LedgerEntry{
          std::string(st->ColumnText(1)), std::string(st->ColumnText(3)),
          std::string(st->ColumnText(4)), std::string(st->ColumnText(5)),
          st->ColumnInt(6), st->ColumnInt(8) != 0};
      out->term_counts.assign(st->ColumnBlob(7));
      *found = true;
    } else if (rc != SQLITE_DONE) {
      s = sql::ErrorStatus(db_, path_);
    }
    st->Reset();
    return s;
  }

  sqlite3* db_;
  std::string path_;
  sql::Statement by_digest_, by_id_;
};

// The counts change of a whole transaction: whole documents added to or
// taken out of queues are summed in memory per (term, queue) and per queue,
// then Apply writes each (term, queue) once through the counts writer
// (count_writer.h), as learn does, and each queue's documents and N(q)
// once. Counts never hold a zero row: a sum that reaches zero deletes the
// row.
class CountDelta {
 public:
  // N(q, w) += sign * n for every term of doc, N(q) += sign * tokens,
  // documents(q) += sign. sign is +1 or -1.
  void Add(int64_t queue_id, const StoredDocument& doc, int sign) {
    Count(queue_id, sign, doc.entry.tokens);
    if (!Number(doc)) return;
    std::vector<int64_t>& column = sums_.column(sums_.ColumnOf(queue_id));
    for (const Entry& e : entries_) column[e.number] += sign * e.n;
  }

  // Add(from, doc, -1) and Add(to, doc, +1), each term looked up once.
  void Move(int64_t from_queue, int64_t to_queue, const StoredDocument& doc) {
    Count(from_queue, -1, doc.entry.tokens);
    Count(to_queue, +1, doc.entry.tokens);
    if (!Number(doc)) return;
    const size_t from = sums_.ColumnOf(from_queue), to = sums_.ColumnOf(to_queue);
    std::vector<int64_t>& out = sums_.column(from);
    std::vector<int64_t>& in = sums_.column(to);
    for (const Entry& e : entries_) {
      __builtin_prefetch(&out[e.number]);
      __builtin_prefetch(&in[e.number]);
    }
    for (const Entry& e : entries_) {
      out[e.number] -= e.n;
      in[e.number] += e.n;
    }
  }

  // Adds another delta's sums and totals to this one's.
  void Add(const CountDelta& other) {
    if (other.malformed_ >= 0 && malformed_ < 0) malformed_ = other.malformed_;
    sums_.Add(other.sums_);
    for (const auto& [queue_id, t] : other.totals_) {
      totals_[queue_id].documents += t.documents;
      totals_[queue_id].tokens += t.tokens;
    }
  }

  // Writes the sums. Terms a sum adds to are created when missing. With
  // drop_terms, a term whose counts are all gone is deleted from the
  // vocabulary (counted in *dropped). With running (not null), keeps the
  // sum of count digests (fingerprint.h) up to date with every row
  // written. Fails on counts smaller than what is taken out of them (a
  // damaged store).
  Status Apply(sqlite3* db, const std::string& path, bool drop_terms,
               int64_t* dropped, CountsSum* running) {
    if (malformed_ >= 0) {
      return Status::Corruption(path + ": the term counts of ledger entry " +
                                std::to_string(malformed_) + " do not decode");
    }
    sql::Statement queue_totals(
        db,
        "UPDATE queues SET documents = documents + ?, tokens = tokens + ? "
        "WHERE id = ?");
    if (!queue_totals.ok()) return Status::IoError(path + ": " + queue_totals.error());
    CountWriteOptions options;
    options.drop_terms = drop_terms;
    CountWriteResult written;
    if (Status s = sums_.Write(db, path, options, running, &written); !s.ok()) return s;
    *dropped += written.dropped_terms;
    for (const auto& [queue_id, t] : totals_) {  // by queue id
      if (t.documents == 0 && t.tokens == 0) continue;
      Status s = queue_totals.Bind(1, t.documents).Bind(2, t.tokens).Bind(3, queue_id).Run();
      if (!s.ok()) return s;
    }
    return Status::Ok();
  }

 private:
  struct Totals {
    int64_t documents = 0;
    int64_t tokens = 0;
  };
  // The queue's totals changed by one document of `tokens` tokens (sign +1
  // or -1).
  void Count(int64_t queue_id, int sign, int64_t tokens) {
    Totals& t = totals_[queue_id];
    t.documents += sign;
    t.tokens += sign * tokens;
  }

  // One term of a document: where its bytes are in text_, its count, its
  // hash, its number in the sums' numbering.
  struct Entry {
    size_t at;
    size_t length;
    int64_t n;
    uint64_t hash;
    uint32_t number;
  };

  // Reads the document's term counts into entries_, each with its number
  // (made on first sight). The table is prefetched for the whole document
  // before it is read: a document's terms are spread over all of it, and
  // the lookups, waiting on memory one after the other, were a sixth of a
  // correction's time (measured with perf on the benchmark corpus).
  // False (and the document noted as malformed) when they do not decode.
  bool Number(const StoredDocument& doc) {
    entries_.clear();
    text_.clear();
    TermNumbering& terms = sums_.terms();
    TermCountsReader reader(doc.term_counts);
    std::string_view term;
    int64_t n = 0;
    while (reader.Next(&term, &n)) {
      const uint64_t hash = TermNumbering::Hash(term);
      terms.Prefetch(hash);
      entries_.push_back({text_.size(), term.size(), n, hash, 0});
      text_.append(term);
    }
    if (!reader.ok()) {
      if (malformed_ < 0) malformed_ = doc.ledger_id;
      return false;
    }
    for (Entry& e : entries_) {
      e.number = terms.Number(std::string_view(text_).substr(e.at, e.length), e.hash);
    }
    return true;
  }

  CountSums sums_;
  std::map<int64_t, Totals> totals_;  // by queue id
  std::vector<Entry> entries_;        // the document being summed (Number)
  std::string text_;                  // its terms' bytes, one after the other
  int64_t malformed_ = -1;            // the first ledger entry that did not decode
};

}  // namespace

Status Store::MoveInTransaction(
    const std::vector<std::pair<std::string, int64_t>>& moves,
    std::vector<std::string>* from, VersionDelta* delta) {
  from->clear();
  if (moves.empty()) return Status::Ok();
  sqlite3* db = db_.get();
  LedgerReader ledger(db, path_);
  Status s = ledger.status();
  if (!s.ok()) return s;
  std::unordered_map<int64_t, std::string> queue_names;
  if (s = ReadQueueNames(db, path_, &queue_names); !s.ok()) return s;
  // Each document read once; the moves are followed in order in memory
  // (where each document is, whether it is counted), then only the net
  // change is counted: out of the queue it was in, into the one it ends in.
  struct Moving {
    StoredDocument doc;  // as the ledger had it before the moves
    int64_t queue_id = 0;
    bool in_model = false;
  };
  std::vector<Moving> docs;
  std::unordered_map<std::string, size_t> index;
  for (const auto& [digest, to_queue_id] : moves) {
    auto [it, inserted] = index.emplace(digest, docs.size());
    if (inserted) {
      Moving m;
      bool found = false;
      s = ledger.ByDigest(digest, &m.doc, &found);
      if (!s.ok()) return s;
      if (!found)
        return Status::NotFound(path_ + ": " + digest + " is not learned");
      m.queue_id = m.doc.queue_id;
      m.in_model = m.doc.entry.in_model;
      docs.push_back(std::move(m));
    }
    Moving& m = docs[it->second];
    from->push_back(queue_names[m.queue_id]);
    if (m.in_model) {
      if (m.queue_id == to_queue_id) continue;
      delta->changes.push_back({m.doc.ledger_id, m.queue_id, to_queue_id});
      ++delta->moved;
    } else {
      // Kept only for history: a correction counts it again.
      delta->changes.push_back({m.doc.ledger_id, 0, to_queue_id});
      ++delta->added;
    }
    m.queue_id = to_queue_id;
    m.in_model = true;
  }
  sql::Statement relabel(db, "UPDATE ledger SET queue_id = ?, in_model = 1 WHERE id = ?");
  if (!relabel.ok()) return Status::IoError(path_ + ": " + relabel.error());
  // The documents that change queue; their counts are summed on two
  // threads, each half into a CountDelta of its own, then added (the sums
  // were a sixth of a correction's time on one thread), while this one also
  // relabels them in the ledger.
  std::vector<const Moving*> changing;
  for (const Moving& m : docs) {
    if (!m.in_model) continue;  // counted neither before nor after
    if (m.doc.entry.in_model && m.doc.queue_id == m.queue_id) continue;  // back
    changing.push_back(&m);
  }
  auto sum = [&changing](size_t begin, size_t end, CountDelta* into) {
    for (size_t i = begin; i < end; ++i) {
      const Moving& m = *changing[i];
      if (m.doc.entry.in_model) {
        into->Move(m.doc.queue_id, m.queue_id, m.doc);
      } else {
        into->Add(m.queue_id, m.doc, +1);
      }
    }
  };
  CountDelta counts, second_half;
  const size_t half = changing.size() / 2;
  {
    struct Joiner {
      std::thread thread;
      ~Joiner() {
        if (thread.joinable()) thread.join();
      }
    } summing;
    // A handful of documents is summed here alone.
    const size_t mine = changing.size() < 64 ? changing.size() : half;
    if (mine < changing.size())
      summing.thread = std::thread(sum, mine, changing.size(), &second_half);
    for (const Moving* m : changing) {
      s = relabel.Bind(1, m->queue_id).Bind(2, m->doc.ledger_id).Run();
      if (!s.ok()) return s;
    }
    sum(0, mine, &counts);
  }
  counts.Add(second_half);
  // Moves keep every term's total, so no term leaves the vocabulary.
  if (sum_state_ == SumState::kFresh) {
    if (s = StartRunningSumInTransaction(); !s.ok()) return s;
  }
  int64_t dropped = 0;
  return counts.Apply(db, path_, /*drop_terms=*/false, &dropped,
                      sum_state_ == SumState::kRunning ? &running_sum_ : nullptr);
}

Status Store::ResolveDocument(const DocumentName& name, Resolution* out) {
  *out = Resolution();
  sqlite3* db = db_.get();
  sql::ReadTransaction read(db);
  if (!read.status().ok()) return read.status();
  // At most this many candidates are listed for an ambiguous name.
  constexpr int64_t kShown = 5;
  // Prepared once per store: a correction names thousands of documents.
  auto query = [&](size_t which, const std::string& where,
                   const std::vector<std::string>& values,
                   bool* done) -> Status {
    *done = false;
    sql::Statement& st = resolve_statements_[which];
    if (!st.ok()) {
      st = sql::Statement(
          db,
          "SELECT l.digest, q.name, l.source, l.learned_at, l.tokens, l.in_model "
          "FROM ledger l JOIN queues q ON q.id = l.queue_id WHERE " +
              where + " ORDER BY l.digest LIMIT ?");
    }
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    struct ResetAfter {
      sql::Statement* st;
      ~ResetAfter() { st->Reset(); }
    } reset_after{&st};
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
    s = query(0, "l.digest = ?", {name.digest}, &done);
    if (!s.ok() || done) return s;
  }
  if (!name.source.empty()) {
    s = query(1, "l.source = ?", {name.source}, &done);
    if (!s.ok() || done) return s;
  }
  if (!name.prefix.empty()) {
    // Digests are lowercase hex, and 'g' sorts after every hex digit, so
    // [p, p + "g") holds exactly the digests that begin with p.
    s = query(2, "l.digest >= ? AND l.digest < ?",
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
    LedgerReader ledger(db, path_);
    if (s = ledger.status(); !s.ok()) return s;
    sql::Statement remove(db, "DELETE FROM ledger WHERE id = ?");
    sql::Statement unlog(db, "DELETE FROM changes WHERE document = ?");
    if (!remove.ok() || !unlog.ok())
      return Status::IoError(path_ + ": " + remove.error() + unlog.error());
    // The decision log and the unreadable files keep paths and digests.
    sql::Statement undecide(db, "DELETE FROM decisions WHERE digest = ?");
    sql::Statement unread(db, "DELETE FROM unreadable WHERE digest = ?");
    if (!undecide.ok() || !unread.ok())
      return Status::IoError(path_ + ": " + undecide.error() + unread.error());
    auto erase_log = [&](const std::string& digest, bool* any) -> Status {
      undecide.Reset();
      Status e = undecide.Bind(1, digest).Run();
      if (!e.ok()) return e;
      const int64_t decided = sqlite3_changes(db);
      result->decisions += decided;
      unread.Reset();
      if (e = unread.Bind(1, digest).Run(); !e.ok()) return e;
      *any = decided > 0 || sqlite3_changes(db) > 0;
      return Status::Ok();
    };
    VersionDelta delta;
    std::vector<int64_t> erased;
    // The documents' counts are summed and taken out at the end, each
    // (term, queue) once.
    CountDelta counts;
    for (const std::string& digest : digests) {
      StoredDocument doc;
      bool found = false;
      s = ledger.ByDigest(digest, &doc, &found);
      if (!s.ok()) return s;
      bool logged = false;
      if (s = erase_log(digest, &logged); !s.ok()) return s;
      if (!found) {
        if (!logged) return Status::NotFound(path_ + ": " + digest + " is not learned");
        result->log_only.push_back(digest);
        continue;
      }
      if (doc.entry.in_model) {
        counts.Add(doc.queue_id, doc, -1);
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
    // The running sum is this change's only (a failed change must not
    // leave its sum to the next one).
    sum_state_ = SumState::kFresh;
    struct SumReset {
      SumState* state;
      ~SumReset() { *state = SumState::kFresh; }
    } sum_reset{&sum_state_};
    if (s = StartRunningSumInTransaction(); !s.ok()) return s;
    s = counts.Apply(db, path_, /*drop_terms=*/true, &result->removed_terms,
                     sum_state_ == SumState::kRunning ? &running_sum_ : nullptr);
    if (!s.ok()) return s;
    if (s = EraseFromSnapshotsInTransaction(erased); !s.ok()) return s;
    if (s = EraseFromCandidateInTransaction(erased); !s.ok()) return s;
    // The version records how many documents left, never which. Erasing
    // only decision log rows does not change the model: no version.
    if (!erased.empty()) {
      s = RecordVersionInTransaction("forget", change, delta);
      if (!s.ok()) return s;
    }
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
  LedgerReader ledger(db, path_);
  if (s = ledger.status(); !s.ok()) return s;
  sql::Statement leave(db, "UPDATE ledger SET in_model = 0 WHERE id = ?");
  sql::Statement enter(db,
                       "UPDATE ledger SET in_model = 1, queue_id = ? WHERE id = ?");
  if (!leave.ok() || !enter.ok())
    return Status::IoError(path_ + ": " + leave.error() + enter.error());
  // The counts of the documents that leave, enter or move are summed in
  // memory and written at the end, each (term, queue) once; a moving
  // document is read once, for both of its queues.
  CountDelta counts;
  std::unordered_map<int64_t, int64_t> wanted(target.members.begin(),
                                              target.members.end());
  for (const auto& [id, queue] : now_members) {
    auto w = wanted.find(id);
    if (w != wanted.end() && w->second == queue) continue;
    StoredDocument doc;
    bool found = false;
    if (s = ledger.ById(id, &doc, &found); !s.ok()) return s;
    if (!found) return Status::Corruption(path_ + ": a member is not in the ledger");
    if (w == wanted.end()) {
      counts.Add(queue, doc, -1);
      if (s = leave.Bind(1, id).Run(); !s.ok()) return s;
      delta.changes.push_back({id, queue, 0});
      ++delta.removed;
    } else {
      counts.Move(queue, w->second, doc);
    }
  }
  for (const auto& [id, queue] : target.members) {
    auto c = current.find(id);
    if (c != current.end() && c->second == queue) continue;
    if (c == current.end()) {
      StoredDocument doc;
      bool found = false;
      if (s = ledger.ById(id, &doc, &found); !s.ok()) return s;
      if (!found) return Status::Corruption(path_ + ": a member is not in the ledger");
      counts.Add(queue, doc, +1);
    }
    if (s = enter.Bind(1, queue).Bind(2, id).Run(); !s.ok()) return s;
    if (c == current.end()) {
      delta.changes.push_back({id, 0, queue});
      ++delta.added;
    } else {
      delta.changes.push_back({id, c->second, queue});
      ++delta.moved;
    }
  }
  // A term whose counts are all gone leaves the vocabulary.
  int64_t dropped = 0;
  if (s = counts.Apply(db, path_, /*drop_terms=*/true, &dropped, nullptr); !s.ok()) return s;

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
