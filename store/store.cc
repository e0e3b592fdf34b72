#include "store/store.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cstdio>
#include <cerrno>
#include <charconv>
#include <cstring>
#include <unordered_map>
#include <unordered_set>

#include "store/count_writer.h"
#include "store/fault_point.h"
#include "store/queue_name.h"
#include "store/schema.h"
#include "store/store_file.h"
#include "store/term_counts_codec.h"

namespace chute {

namespace {

std::string FormatDouble(double v) {
  char buf[32];
  auto r = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, r.ptr);
}

// Opens a file that Create has just made (empty), read-write.
Status OpenNewDb(const std::string& path, sql::DbHandle* out) {
  sqlite3* raw = nullptr;
  int rc = sqlite3_open_v2(path.c_str(), &raw, SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX,
                           nullptr);
  out->reset(raw);
  if (rc != SQLITE_OK) {
    return Status::IoError(path + ": cannot open: " +
                           (raw ? sqlite3_errmsg(raw) : sqlite3_errstr(rc)));
  }
  sqlite3_extended_result_codes(raw, 1);
  return Status::Ok();
}

}  // namespace

Store::Store(std::string path, sql::DbHandle db)
    : path_(std::move(path)), db_(std::move(db)) {}

Status Store::Create(const std::string& path, const StoreSettings& settings,
                     std::unique_ptr<Store>* out, const ChangeInfo& change) {
  out->reset();
  struct stat st {};
  if (::lstat(path.c_str(), &st) == 0) {
    return Status::InvalidArgument(path + ": already exists; chute init never overwrites a store");
  }
  // The store is made whole under a temporary name in the same folder and
  // then given its name in one step that never replaces a file, so that a
  // crash leaves either no store or a complete one (at worst a stray
  // .chute-init-* file). mkstemp makes the file 0600 from its first
  // instant; SQLite gives its -wal and -shm files the same mode.
  const size_t slash = path.rfind('/');
  const std::string folder = slash == std::string::npos ? "." : path.substr(0, slash + 1);
  std::string tmp = (slash == std::string::npos ? std::string() : folder) + ".chute-init-XXXXXX";
  int fd = ::mkstemp(tmp.data());
  if (fd < 0) return Status::IoError(path + ": cannot create: " + std::strerror(errno));
  ::close(fd);
  auto remove_tmp = [&] {
    for (const char* suffix : {"", "-wal", "-shm", "-journal"}) ::unlink((tmp + suffix).c_str());
  };
  Status s;
  {
    sql::DbHandle db;
    s = OpenNewDb(tmp, &db);
    if (s.ok()) s = sql::Exec(db.get(), "PRAGMA journal_mode = WAL");
    if (s.ok()) s = ConfigureStoreConnection(db.get());
    if (s.ok()) s = Migrate(db.get(), SchemaVersion());
    if (s.ok()) {
      Store store(tmp, std::move(db));
      sql::Transaction tx(store.db_.get());
      s = tx.status();
      if (s.ok()) s = store.SaveSettingsInTransaction(settings);
      if (s.ok()) s = store.RecordVersionInTransaction("init", change, VersionDelta());
      if (s.ok()) s = tx.Commit();
      // Closing the only connection checkpoints the write-ahead log into
      // the file and deletes it (sqlite.org/wal.html), so the file alone is
      // the store.
    }
  }
  if (!s.ok()) {
    remove_tmp();
    return Status::IoError(path + ": " + s.message());
  }
  FaultPoint("init.before_name");
  if (::renameat2(AT_FDCWD, tmp.c_str(), AT_FDCWD, path.c_str(), RENAME_NOREPLACE) != 0) {
    int err = errno;
    if (err == EINVAL || err == ENOSYS) {
      // A filesystem without RENAME_NOREPLACE: a hard link never replaces.
      err = ::link(tmp.c_str(), path.c_str()) == 0 ? 0 : errno;
    }
    if (err != 0) {
      remove_tmp();
      if (err == EEXIST) {
        return Status::InvalidArgument(path + ": already exists; chute init never overwrites a store");
      }
      return Status::IoError(path + ": cannot create: " + std::strerror(err));
    }
  }
  remove_tmp();  // after a link, the temporary name; after a rename, nothing
  return Open(path, out);
}

Status Store::Open(const std::string& path, std::unique_ptr<Store>* out) {
  sql::DbHandle db;
  int64_t version = 0;
  Status s = OpenStoreFile(path, &db, &version);
  if (!s.ok()) return s;
  s = ConfigureStoreConnection(db.get());
  if (s.ok() && version < SchemaVersion()) s = Migrate(db.get(), SchemaVersion());
  if (!s.ok()) return Status::IoError(path + ": " + s.message());
  std::unique_ptr<Store> store(new Store(path, std::move(db)));
  s = store->LoadSettings();
  if (s.ok()) s = store->EnsureFirstVersion();
  if (!s.ok()) return s;
  *out = std::move(store);
  return Status::Ok();
}

Status Store::SaveSettings(const StoreSettings& settings) {
  sql::Transaction tx(db_.get());
  if (!tx.status().ok()) return tx.status();
  Status s = SaveSettingsInTransaction(settings);
  if (!s.ok()) return s;
  return tx.Commit();
}

Status Store::SaveSettingsInTransaction(const StoreSettings& settings) {
  const auto rows = EncodeSettings(settings);
  sql::Statement put(db_.get(),
                     "INSERT INTO settings(key, value) VALUES(?, ?) "
                     "ON CONFLICT(key) DO UPDATE SET value = excluded.value");
  if (!put.ok()) return Status::IoError(put.error());
  for (const auto& [key, value] : rows) {
    Status s = put.Bind(1, std::string_view(key)).Bind(2, value).Run();
    if (!s.ok()) return s;
  }
  settings_ = settings;
  return Status::Ok();
}

Status Store::LoadSettings() {
  sql::Statement st(db_.get(), "SELECT key, value FROM settings");
  if (!st.ok()) return Status::Corruption(path_ + ": " + st.error());
  std::vector<std::pair<std::string, std::string>> rows;
  while (st.Step() == SQLITE_ROW) rows.emplace_back(st.ColumnText(0), st.ColumnText(1));
  std::string why;
  if (!DecodeSettings(rows, &settings_, &why)) {
    return Status::Corruption(path_ + ": the store's settings are damaged (" + why + ")");
  }
  return Status::Ok();
}

Status Store::ListQueues(std::vector<QueueInfo>* out, TermTally tally) {
  out->clear();
  // Queues and counts from one snapshot.
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  // The rows of every queue in one pass over counts (its key begins with
  // the term, so a query per queue would read all of counts each time).
  std::unordered_map<int64_t, int64_t> rows;
  if (tally == TermTally::kWith) {
    sql::Statement st(db_.get(), "SELECT queue_id FROM counts");
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) ++rows[st.ColumnInt(0)];
    if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  }
  sql::Statement st(db_.get(),
                    "SELECT q.name, q.documents, q.tokens, q.set_prior, q.id, "
                    "q.retired IS NOT NULL "
                    "FROM queues q ORDER BY q.name");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    QueueInfo q;
    q.name = st.ColumnText(0);
    q.documents = st.ColumnInt(1);
    q.tokens = st.ColumnInt(2);
    if (!st.ColumnIsNull(3)) q.set_prior = st.ColumnDouble(3);
    if (auto it = rows.find(st.ColumnInt(4)); it != rows.end()) q.distinct_terms = it->second;
    q.retired = st.ColumnInt(5) != 0;
    out->push_back(std::move(q));
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  return Status::Ok();
}

Status Store::VocabularySize(int64_t* out) {
  sql::Statement st(db_.get(), "SELECT COUNT(*) FROM terms");
  if (!st.ok() || st.Step() != SQLITE_ROW) return sql::ErrorStatus(db_.get(), path_);
  *out = st.ColumnInt(0);
  return Status::Ok();
}

Status Store::LoadModelCounts(ModelCounts* out, VersionInfo* version) {
  *out = ModelCounts();
  // Read in one transaction so that settings, queues and counts agree: a
  // rebuild may have changed the settings since the store was opened, and
  // counts must be read with the settings they were made with.
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  if (Status s = LoadSettings(); !s.ok()) return s;

  std::unordered_map<int64_t, size_t> column;
  {
    sql::Statement st(db_.get(),
                      "SELECT id, name, documents, tokens, set_prior FROM queues "
                      "WHERE retired IS NULL ORDER BY name");
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    while (st.Step() == SQLITE_ROW) {
      QueueCounts q;
      q.name = st.ColumnText(1);
      q.documents = st.ColumnInt(2);
      q.tokens = st.ColumnInt(3);
      if (!st.ColumnIsNull(4)) q.set_prior = st.ColumnDouble(4);
      column[st.ColumnInt(0)] = out->queues.size();
      out->queues.push_back(std::move(q));
    }
  }
  const size_t nq = out->queues.size();
  // Terms in byte order of their text, whatever order they were learned in:
  // the rows of a model, and so the order in which a document's terms are
  // summed, depend only on the counts (a forgotten document leaves the model
  // bit for bit as if it had never been learned).
  sql::Statement st(db_.get(),
                    "SELECT c.term_id, t.text, c.queue_id, c.n "
                    "FROM terms t JOIN counts c ON c.term_id = t.id "
                    "ORDER BY t.text, c.queue_id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int64_t last_term = -1;
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    int64_t term_id = st.ColumnInt(0);
    if (term_id != last_term) {
      out->terms.emplace_back(st.ColumnText(1));
      out->counts.resize(out->counts.size() + nq, 0);
      last_term = term_id;
    }
    auto col = column.find(st.ColumnInt(2));
    if (col == column.end()) {
      return Status::Corruption(path_ + ": counts name a queue that does not exist");
    }
    out->counts[(out->terms.size() - 1) * nq + col->second] = st.ColumnInt(3);
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  return version ? CurrentVersion(version) : Status::Ok();
}

Status Store::LoadQueueCounts(ModelCounts* out) {
  *out = ModelCounts();
  sql::Statement st(db_.get(),
                    "SELECT name, documents, tokens, set_prior FROM queues "
                    "WHERE retired IS NULL ORDER BY name");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    QueueCounts q;
    q.name = st.ColumnText(0);
    q.documents = st.ColumnInt(1);
    q.tokens = st.ColumnInt(2);
    if (!st.ColumnIsNull(3)) q.set_prior = st.ColumnDouble(3);
    out->queues.push_back(std::move(q));
  }
  return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db_.get(), path_);
}

Status Store::FindDocument(const std::string& digest,
                           std::optional<LedgerEntry>* out) {
  out->reset();
  if (!find_document_.ok()) {
    find_document_ = sql::Statement(db_.get(),
                                    "SELECT l.digest, q.name, l.source, l.learned_at, l.tokens, "
                                    "l.in_model "
                                    "FROM ledger l JOIN queues q ON q.id = l.queue_id "
                                    "WHERE l.digest = ?");
    if (!find_document_.ok()) return Status::IoError(path_ + ": " + find_document_.error());
  }
  sql::Statement& st = find_document_;
  st.Bind(1, digest);
  int rc = st.Step();
  if (rc == SQLITE_ROW) {
    *out = LedgerEntry{std::string(st.ColumnText(0)), std::string(st.ColumnText(1)),
                       std::string(st.ColumnText(2)), std::string(st.ColumnText(3)),
                       st.ColumnInt(4), st.ColumnInt(5) != 0};
  }
  Status s = rc == SQLITE_ROW || rc == SQLITE_DONE ? Status::Ok()
                                                   : sql::ErrorStatus(db_.get(), path_);
  st.Reset();  // ends the statement's read of the store
  return s;
}

Status Store::ReadLedger(const std::function<void(LedgerDocument&)>& fn) {
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  sql::Statement st(db_.get(),
                    "SELECT l.digest, q.name, l.source, l.learned_at, l.tokens, l.term_counts "
                    "FROM ledger l JOIN queues q ON q.id = l.queue_id WHERE l.in_model = 1 "
                    "ORDER BY l.id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  LedgerDocument doc;
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    doc.digest = st.ColumnText(0);
    doc.queue = st.ColumnText(1);
    doc.source = st.ColumnText(2);
    doc.learned_at = st.ColumnText(3);
    doc.tokens = st.ColumnInt(4);
    if (!DecodeTermCounts(st.ColumnBlob(5), &doc.terms)) {
      return Status::Corruption(path_ + ": the ledger entry of " + doc.digest +
                                " does not decode");
    }
    fn(doc);
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  return Status::Ok();
}

Status Store::ReadCountsAndLedger(ModelCounts* counts,
                                  const std::function<void(LedgerDocument&)>& fn) {
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  Status s = LoadModelCounts(counts);
  return s.ok() ? ReadLedger(fn) : s;
}

Status Store::Learn(const LearnBatch& batch, const ChangeInfo& change,
                    LearnResult* result) {
  return LearnAsVersion(batch, {}, "learn", change, result);
}

Status Store::LearnAsVersion(const LearnBatch& batch, const std::vector<ReviewMark>& marks,
                             const std::string& command, const ChangeInfo& change,
                             LearnResult* result) {
  sql::Transaction tx(db_.get());
  if (!tx.status().ok()) {
    return Status::Busy(path_ + ": " + tx.status().message());
  }
  // The running sum is this change's only (a failed change must not leave
  // its sum to the next one).
  sum_state_ = SumState::kFresh;
  struct SumReset {
    SumState* state;
    ~SumReset() { *state = SumState::kFresh; }
  } sum_reset{&sum_state_};
  VersionDelta delta;
  const std::string now = change.now.empty() ? StoreClockNow() : change.now;
  Status s = LearnInTransaction(batch, now, result, &delta);
  if (!s.ok()) return s;
  if (s = MarkReviewsInTransaction(marks, now); !s.ok()) return s;
  if (!delta.changes.empty()) {
    s = RecordVersionInTransaction(command, change, delta);
    if (!s.ok()) return s;
  }
  FaultPoint(command == "learn" ? "learn.before_commit" : "review.before_commit");
  s = tx.Commit();
  if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  return Status::Ok();
}

Status Store::QueueIdInTransaction(const std::string& name, const std::string& now,
                                   int64_t* id, bool* created) {
  *created = false;
  sql::Statement find(db_.get(), "SELECT id, retired IS NOT NULL FROM queues WHERE name = ?");
  if (!find.ok()) return Status::IoError(path_ + ": " + find.error());
  find.Bind(1, name);
  if (find.Step() == SQLITE_ROW) {
    *id = find.ColumnInt(0);
    if (find.ColumnInt(1) == 0) return Status::Ok();
    // Documents learned under a retired queue's name bring it back.
    sql::Statement revive(db_.get(), "UPDATE queues SET retired = NULL WHERE id = ?");
    return revive.Bind(1, *id).Run();
  }
  Status v = ValidateQueueName(name);
  if (!v.ok()) return v;
  sql::Statement add(db_.get(), "INSERT INTO queues(name, created) VALUES(?, ?)");
  if (!add.ok()) return Status::IoError(path_ + ": " + add.error());
  Status s = add.Bind(1, name).Bind(2, now).Run();
  if (!s.ok()) return s;
  *id = sqlite3_last_insert_rowid(db_.get());
  *created = true;
  return Status::Ok();
}

Status Store::LearnInTransaction(const LearnBatch& batch, const std::string& now,
                                 LearnResult* result, VersionDelta* delta) {
  *result = LearnResult();
  // The batch was tokenized with the settings read when the store was
  // opened; a rebuild may have changed them since. Counts made under other
  // settings must never mix with the store's.
  if (!batch.empty()) {
    const StoreSettings tokenized_with = settings_;
    if (Status s = LoadSettings(); !s.ok()) return s;
    if (!SameTokenizing(tokenized_with, settings_)) {
      return Status::Busy(path_ +
                          ": a rebuild changed the tokenizer settings while these documents "
                          "were read; nothing was learned, run the command again");
    }
  }
  const auto& docs = batch.documents();
  sqlite3* db = db_.get();
  auto fail = [&](const Status& s) {
    return Status(s.code() == Status::Code::kOk ? Status::IoError("unknown error") : s);
  };

  // Queues of the batch: existing ids, or created now.
  std::vector<std::string> queue_names;
  std::unordered_map<std::string, size_t> queue_index;
  for (const auto& d : docs) {
    if (queue_index.emplace(d.queue, queue_names.size()).second) {
      queue_names.push_back(d.queue);
    }
  }
  std::vector<int64_t> queue_ids(queue_names.size(), 0);
  std::vector<bool> queue_created(queue_names.size(), false);
  for (size_t i = 0; i < queue_names.size(); ++i) {
    bool created = false;
    Status s = QueueIdInTransaction(queue_names[i], now, &queue_ids[i], &created);
    if (!s.ok()) return fail(s);
    queue_created[i] = created;
  }

  // Which documents are new; the ledger (and this batch) may know some.
  result->outcomes.assign(docs.size(), LearnOutcome::kLearned);
  result->known_queue.assign(docs.size(), std::string());
  {
    sql::Statement known(db,
                         "SELECT q.name FROM ledger l JOIN queues q ON q.id = l.queue_id "
                         "WHERE l.digest = ? AND l.in_model = 1");
    if (!known.ok()) return Status::IoError(path_ + ": " + known.error());
    // The queue each digest is in after the documents before this one.
    std::unordered_map<std::string_view, std::string_view> current;
    for (size_t i = 0; i < docs.size(); ++i) {
      std::string queue;
      if (auto it = current.find(docs[i].digest); it != current.end()) {
        queue = it->second;
      } else {
        known.Bind(1, docs[i].digest);
        if (known.Step() == SQLITE_ROW) queue = known.ColumnText(0);
        known.Reset();
      }
      if (!queue.empty()) {
        result->outcomes[i] = queue == docs[i].queue ? LearnOutcome::kAlreadyLearned
                                                     : LearnOutcome::kCorrected;
        result->known_queue[i] = queue;
      }
      current[docs[i].digest] = docs[i].queue;
    }
  }

  // Rank the batch's terms by their bytes once; from here on, integer ranks
  // give the key order (term text, then queue name) and the ledger's order.
  const auto nt = static_cast<uint32_t>(batch.term_count());
  std::vector<uint32_t> by_text(nt);
  for (uint32_t t = 0; t < nt; ++t) by_text[t] = t;
  std::sort(by_text.begin(), by_text.end(),
            [&](uint32_t a, uint32_t b) { return batch.term(a) < batch.term(b); });
  std::vector<uint32_t> rank(nt);
  for (uint32_t r = 0; r < nt; ++r) rank[by_text[r]] = r;
  const size_t nq = queue_names.size();

  // Aggregate N(q, w) and the queue totals over the new documents, one
  // queue at a time through one dense array; each (term, queue) sum is then
  // written once (count_writer.h), which puts them in key order.
  std::vector<CountChange> changes;
  std::vector<int64_t> queue_docs(nq, 0), queue_tokens(nq, 0);
  std::vector<std::vector<size_t>> docs_of_queue(nq);
  for (size_t i = 0; i < docs.size(); ++i) {
    if (result->outcomes[i] != LearnOutcome::kLearned) continue;
    docs_of_queue[queue_index[docs[i].queue]].push_back(i);
    ++result->learned;
  }
  {
    std::vector<int64_t> dense(nt, 0);
    std::vector<uint32_t> touched;
    for (size_t q = 0; q < nq; ++q) {
      for (size_t i : docs_of_queue[q]) {
        ++queue_docs[q];
        queue_tokens[q] += docs[i].tokens;
        for (const auto& [term, count] : docs[i].counts) {
          if (dense[term] == 0) touched.push_back(term);
          dense[term] += count;
        }
      }
      for (uint32_t t : touched) {
        changes.push_back({rank[t], queue_ids[q], dense[t]});
        dense[t] = 0;
      }
      touched.clear();
    }
  }

  {
    // The batch's terms by rank, which is byte order.
    std::vector<std::string_view> texts(nt);
    for (uint32_t r = 0; r < nt; ++r) texts[r] = batch.term(by_text[r]);
    if (sum_state_ == SumState::kFresh) {
      if (Status s = StartRunningSumInTransaction(); !s.ok()) return fail(s);
    }
    CountWriteOptions options;
    options.terms_sorted = true;
    CountWriteResult written;
    Status s = WriteCountChanges(db, path_, texts, std::move(changes), options,
                                 sum_state_ == SumState::kRunning ? &running_sum_ : nullptr,
                                 &written);
    if (!s.ok()) return fail(s);
    result->new_terms += written.new_terms;
  }

  {
    sql::Statement update(db,
                          "UPDATE queues SET documents = documents + ?, tokens = tokens + ? "
                          "WHERE id = ?");
    if (!update.ok()) return Status::IoError(path_ + ": " + update.error());
    for (size_t q = 0; q < nq; ++q) {
      if (queue_docs[q] == 0) continue;
      Status s = update.Bind(1, queue_docs[q]).Bind(2, queue_tokens[q]).Bind(3, queue_ids[q]).Run();
      if (!s.ok()) return fail(s);
    }
  }

  {
    // A document kept only for history (in_model = 0) enters the model
    // again under its ledger id, so that the change log follows it.
    sql::Statement add(db,
                       "INSERT INTO ledger(digest, queue_id, source, learned_at, tokens, "
                       "term_counts, text) VALUES(?, ?, ?, ?, ?, ?, ?) "
                       "ON CONFLICT(digest) DO UPDATE SET queue_id = excluded.queue_id, "
                       "source = excluded.source, learned_at = excluded.learned_at, "
                       "tokens = excluded.tokens, term_counts = excluded.term_counts, "
                       "text = COALESCE(excluded.text, text), in_model = 1 RETURNING id");
    if (!add.ok()) return Status::IoError(path_ + ": " + add.error());
    std::vector<std::pair<uint32_t, int64_t>> ranked;
    std::vector<std::pair<std::string_view, int64_t>> own;
    for (size_t i = 0; i < docs.size(); ++i) {
      if (result->outcomes[i] != LearnOutcome::kLearned) continue;
      const auto& d = docs[i];
      ranked.clear();
      for (const auto& [term, count] : d.counts) ranked.emplace_back(rank[term], count);
      std::sort(ranked.begin(), ranked.end());
      own.clear();
      for (const auto& [r, count] : ranked) own.emplace_back(batch.term(by_text[r]), count);
      const int64_t queue_id = queue_ids[queue_index[d.queue]];
      add.Bind(1, d.digest)
          .Bind(2, queue_id)
          .Bind(3, d.source)
          .Bind(4, now)
          .Bind(5, d.tokens)
          .BindBlob(6, EncodeTermCounts(own));  // copied (SQLITE_TRANSIENT)
      // The text packed on the tokenizing thread; NULL when not kept (a
      // store set to keep no text keeps none, whatever the caller packed).
      if (settings_.keep_text && !d.packed_text.empty()) {
        add.BindBlob(7, d.packed_text);
      } else {
        add.BindNull(7);
      }
      if (add.Step() != SQLITE_ROW) return fail(sql::ErrorStatus(db, path_));
      const int64_t ledger_id = add.ColumnInt(0);
      Status s = add.Run();  // finishes the statement (RETURNING) and resets it
      if (!s.ok()) return fail(s);
      delta->changes.push_back({ledger_id, 0, queue_id});
      ++delta->added;
    }
  }
  // Corrections, in batch order, now that every new document is in the
  // ledger (a digest learned and relabelled in one batch moves too).
  {
    std::vector<std::pair<std::string, int64_t>> moves;
    for (size_t i = 0; i < docs.size(); ++i) {
      if (result->outcomes[i] != LearnOutcome::kCorrected) continue;
      moves.emplace_back(docs[i].digest, queue_ids[queue_index[docs[i].queue]]);
    }
    std::vector<std::string> from;
    Status s = MoveInTransaction(moves, &from, delta);
    if (!s.ok()) return fail(s);
    result->corrected = static_cast<int64_t>(moves.size());
  }
  // Queues created for documents that all turned out to be known stay out.
  {
    sql::Statement drop(db, "DELETE FROM queues WHERE id = ? AND documents = 0");
    for (size_t q = 0; q < nq; ++q) {
      if (queue_docs[q] != 0 || !queue_created[q]) continue;
      Status s = drop.Bind(1, queue_ids[q]).Run();
      if (!s.ok()) return fail(s);
    }
  }
  return Status::Ok();
}

Status Store::SetPrior(const std::string& queue, std::optional<double> prior,
                       const ChangeInfo& change) {
  sql::Transaction tx(db_.get());
  if (!tx.status().ok()) return tx.status();
  sql::Statement find(db_.get(), "SELECT id FROM queues WHERE name = ? AND retired IS NULL");
  find.Bind(1, queue);
  if (find.Step() != SQLITE_ROW) {
    return Status::NotFound("queue '" + queue + "' does not exist in " + path_);
  }
  int64_t id = find.ColumnInt(0);
  if (prior) {
    sql::Statement sum(db_.get(),
                       "SELECT COALESCE(SUM(set_prior), 0) FROM queues WHERE id != ?");
    sum.Bind(1, id);
    if (sum.Step() != SQLITE_ROW) return sql::ErrorStatus(db_.get(), path_);
    double others = sum.ColumnDouble(0);
    if (others + *prior > 1.0 + 1e-12) {
      return Status::InvalidArgument("priors set by hand would sum to " +
                                     FormatDouble(others + *prior) + ", more than 1");
    }
  }
  sql::Statement set(db_.get(), "UPDATE queues SET set_prior = ? WHERE id = ?");
  if (prior) {
    set.Bind(1, *prior);
  } else {
    set.BindNull(1);
  }
  Status s = set.Bind(2, id).Run();
  if (!s.ok()) return s;
  s = RecordVersionInTransaction("queues", change, VersionDelta());
  if (!s.ok()) return s;
  return tx.Commit();
}

}  // namespace chute
