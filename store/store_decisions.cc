// The decision log of routing into folders, unreadable files and the queues'
// routing rules (decision_log.h; schema.h, version 4).
#include <algorithm>
#include <array>
#include <string>
#include <string_view>
#include <utility>

#include "store/fault_point.h"
#include "store/store.h"

namespace chute {

namespace {

constexpr std::array<std::pair<HeldReason, std::string_view>, 5> kHeldNames{{
    {HeldReason::kNone, ""},
    {HeldReason::kThreshold, "threshold"},
    {HeldReason::kNoTerms, "no_terms"},
    {HeldReason::kMinDocuments, "min_documents"},
    {HeldReason::kAudit, "audit"},
}};

constexpr std::array<std::pair<DeliveryMode, std::string_view>, 3> kModeNames{{
    {DeliveryMode::kMove, "move"},
    {DeliveryMode::kCopy, "copy"},
    {DeliveryMode::kLink, "link"},
}};

constexpr std::array<std::pair<ReviewKind, std::string_view>, 3> kReviewNames{{
    {ReviewKind::kNone, ""},
    {ReviewKind::kMoved, "moved"},
    {ReviewKind::kLeft, "left"},
}};

template <typename E, size_t N>
std::string_view NameOf(const std::array<std::pair<E, std::string_view>, N>& names, E e) {
  for (const auto& [value, name] : names) {
    if (value == e) return name;
  }
  return "";
}

template <typename E, size_t N>
bool Parse(const std::array<std::pair<E, std::string_view>, N>& names, std::string_view word,
           E* out) {
  for (const auto& [value, name] : names) {
    if (name == word) {
      *out = value;
      return true;
    }
  }
  return false;
}

// Binds text, or NULL when empty.
void BindTextOrNull(sql::Statement& st, int i, std::string_view text) {
  if (text.empty()) {
    st.BindNull(i);
  } else {
    st.Bind(i, text);
  }
}

std::string TextOrEmpty(const sql::Statement& st, int i) {
  return st.ColumnIsNull(i) ? std::string() : std::string(st.ColumnText(i));
}

// The columns ReadDecision reads, in its order.
constexpr char kDecisionColumns[] =
    "id, digest, source, destination, queue, confidence, runner_up, runner_up_posterior, "
    "held, model_version, time, by, mode, delivered, terms, unknown_terms, review, "
    "reviewed_queue, reviewed_path, reviewed_at";

Status ReadDecision(const sql::Statement& st, const std::string& path, DecisionRecord* r) {
  r->id = st.ColumnInt(0);
  r->digest = st.ColumnText(1);
  r->source = st.ColumnText(2);
  r->destination = st.ColumnText(3);
  r->queue = st.ColumnText(4);
  r->confidence = st.ColumnDouble(5);
  r->runner_up = TextOrEmpty(st, 6);
  r->runner_up_posterior.reset();
  if (!st.ColumnIsNull(7)) r->runner_up_posterior = st.ColumnDouble(7);
  if (!ParseHeld(TextOrEmpty(st, 8), &r->held)) {
    return Status::Corruption(path + ": decision " + std::to_string(r->id) +
                              ": unknown held reason");
  }
  r->model_version = st.ColumnInt(9);
  r->time = st.ColumnText(10);
  r->by = st.ColumnText(11);
  if (!ParseDeliveryMode(st.ColumnText(12), &r->mode)) {
    return Status::Corruption(path + ": decision " + std::to_string(r->id) +
                              ": unknown delivery mode");
  }
  r->delivered = st.ColumnInt(13) != 0;
  r->terms = st.ColumnInt(14);
  r->unknown_terms = st.ColumnInt(15);
  if (!ParseReviewKind(TextOrEmpty(st, 16), &r->review)) {
    return Status::Corruption(path + ": decision " + std::to_string(r->id) +
                              ": unknown review kind");
  }
  r->reviewed_queue = TextOrEmpty(st, 17);
  r->reviewed_path = TextOrEmpty(st, 18);
  r->reviewed_at = TextOrEmpty(st, 19);
  return Status::Ok();
}

}  // namespace

std::string_view HeldName(HeldReason reason) { return NameOf(kHeldNames, reason); }
bool ParseHeld(std::string_view name, HeldReason* out) { return Parse(kHeldNames, name, out); }
std::string_view DeliveryModeName(DeliveryMode mode) { return NameOf(kModeNames, mode); }
bool ParseDeliveryMode(std::string_view name, DeliveryMode* out) {
  return !name.empty() && Parse(kModeNames, name, out);
}
std::string_view ReviewKindName(ReviewKind kind) { return NameOf(kReviewNames, kind); }
bool ParseReviewKind(std::string_view name, ReviewKind* out) {
  return Parse(kReviewNames, name, out);
}

Status Store::LogIntended(std::vector<DecisionRecord>* records) {
  if (records->empty()) return Status::Ok();
  sql::Transaction tx(db_.get());
  if (!tx.status().ok()) return Status::Busy(path_ + ": " + tx.status().message());
  sql::Statement insert(
      db_.get(),
      "INSERT INTO decisions(digest, source, destination, queue, confidence, runner_up, "
      "runner_up_posterior, held, model_version, time, by, mode, delivered, terms, "
      "unknown_terms) VALUES(?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 0, ?, ?)");
  if (!insert.ok()) return Status::IoError(path_ + ": " + insert.error());
  for (DecisionRecord& r : *records) {
    insert.Reset();
    insert.Bind(1, r.digest).Bind(2, r.source).Bind(3, r.destination).Bind(4, r.queue);
    insert.Bind(5, r.confidence);
    BindTextOrNull(insert, 6, r.runner_up);
    if (r.runner_up_posterior) {
      insert.Bind(7, *r.runner_up_posterior);
    } else {
      insert.BindNull(7);
    }
    BindTextOrNull(insert, 8, HeldName(r.held));
    insert.Bind(9, r.model_version).Bind(10, r.time).Bind(11, r.by);
    insert.Bind(12, DeliveryModeName(r.mode));
    insert.Bind(13, r.terms).Bind(14, r.unknown_terms);
    Status s = insert.Run();
    if (!s.ok()) return Status::IoError(path_ + ": logging a decision: " + s.message());
    r.id = sqlite3_last_insert_rowid(db_.get());
    r.delivered = false;
  }
  FaultPoint("decisions.before_commit");
  Status s = tx.Commit();
  if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  return Status::Ok();
}

Status Store::SetDestination(int64_t id, const std::string& destination) {
  sql::Statement st(db_.get(),
                    "UPDATE decisions SET destination = ? WHERE id = ? AND delivered = 0");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  Status s = st.Bind(1, destination).Bind(2, id).Run();
  if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
  if (sqlite3_changes(db_.get()) != 1) {
    return Status::NotFound(path_ + ": no undelivered decision " + std::to_string(id));
  }
  return Status::Ok();
}

namespace {

// Runs `sql` (one ? for the id) for each id, in one transaction.
Status ForEachIdInTransaction(sqlite3* db, const std::string& path, const char* sql,
                              const std::vector<int64_t>& ids) {
  if (ids.empty()) return Status::Ok();
  sql::Transaction tx(db);
  if (!tx.status().ok()) return Status::Busy(path + ": " + tx.status().message());
  sql::Statement st(db, sql);
  if (!st.ok()) return Status::IoError(path + ": " + st.error());
  for (int64_t id : ids) {
    st.Reset();
    Status s = st.Bind(1, id).Run();
    if (!s.ok()) return Status::IoError(path + ": " + s.message());
  }
  Status s = tx.Commit();
  if (!s.ok()) return Status::IoError(path + ": commit: " + s.message());
  return Status::Ok();
}

}  // namespace

Status Store::MarkDelivered(const std::vector<int64_t>& ids) {
  return ForEachIdInTransaction(db_.get(), path_,
                                "UPDATE decisions SET delivered = 1 WHERE id = ?", ids);
}

Status Store::DropIntended(const std::vector<int64_t>& ids) {
  return ForEachIdInTransaction(db_.get(), path_,
                                "DELETE FROM decisions WHERE id = ? AND delivered = 0", ids);
}

Status Store::PendingDeliveries(std::vector<DecisionRecord>* out) {
  out->clear();
  sql::Statement st(db_.get(), std::string("SELECT ") + kDecisionColumns +
                                   " FROM decisions WHERE delivered = 0 ORDER BY id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    DecisionRecord r;
    Status s = ReadDecision(st, path_, &r);
    if (!s.ok()) return s;
    out->push_back(std::move(r));
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  return Status::Ok();
}

Status Store::DeliveredCopies(const std::vector<std::string>& digests,
                              std::vector<std::string>* delivered) {
  delivered->clear();
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  sql::Statement st(db_.get(),
                    "SELECT 1 FROM decisions WHERE digest = ? AND delivered = 1 "
                    "AND mode IN ('copy', 'link') LIMIT 1");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  for (const std::string& d : digests) {
    st.Reset();
    st.Bind(1, d);
    int rc = st.Step();
    if (rc == SQLITE_ROW) {
      delivered->push_back(d);
    } else if (rc != SQLITE_DONE) {
      return sql::ErrorStatus(db_.get(), path_);
    }
  }
  return Status::Ok();
}

Status Store::ReadDecisions(const DecisionQuery& query,
                            const std::function<Status(const DecisionRecord&)>& fn) {
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  std::string sql = std::string("SELECT ") + kDecisionColumns +
                    " FROM decisions WHERE (?1 = '' OR time >= ?1) AND (?2 = '' OR queue = ?2)";
  if (query.delivered_only) sql += " AND delivered = 1";
  sql += " ORDER BY time, id";
  sql::Statement st(db_.get(), sql);
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  st.Bind(1, query.since).Bind(2, query.queue);
  int rc;
  DecisionRecord r;
  while ((rc = st.Step()) == SQLITE_ROW) {
    Status s = ReadDecision(st, path_, &r);
    if (!s.ok()) return s;
    s = fn(r);
    if (!s.ok()) return s;
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  return Status::Ok();
}

Status Store::LearnReviewed(const LearnBatch& batch, const std::vector<ReviewMark>& marks,
                            const ChangeInfo& change, LearnResult* result) {
  return LearnAsVersion(batch, marks, "correct", change, result);
}

Status Store::MarkReviewsInTransaction(const std::vector<ReviewMark>& marks,
                                       const std::string& now) {
  if (marks.empty()) return Status::Ok();
  sql::Statement mark(db_.get(),
                      "UPDATE decisions SET review = ?, reviewed_queue = ?, reviewed_path = ?, "
                      "reviewed_at = ? WHERE id = ? AND delivered = 1");
  if (!mark.ok()) return Status::IoError(path_ + ": " + mark.error());
  for (const ReviewMark& m : marks) {
    if (m.kind == ReviewKind::kNone) {
      return Status::InvalidArgument(path_ + ": a review mark needs a kind");
    }
    mark.Reset();
    mark.Bind(1, ReviewKindName(m.kind)).Bind(2, m.queue).Bind(3, m.path).Bind(4, now);
    mark.Bind(5, m.decision_id);
    Status s = mark.Run();
    if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
    if (sqlite3_changes(db_.get()) != 1) {
      return Status::NotFound(path_ + ": no delivered decision " +
                              std::to_string(m.decision_id));
    }
  }
  return Status::Ok();
}

Status Store::FindLogged(const DocumentName& name, std::vector<std::string>* digests) {
  digests->clear();
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  auto collect = [&](const char* query, const std::string& a, const std::string& b) -> Status {
    sql::Statement st(db_.get(), query);
    if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
    st.Bind(1, a);
    if (!b.empty()) st.Bind(2, b);
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      std::string d(st.ColumnText(0));
      if (std::find(digests->begin(), digests->end(), d) == digests->end()) {
        digests->push_back(std::move(d));
      }
    }
    return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db_.get(), path_);
  };
  constexpr char kByDigest[] =
      "SELECT digest FROM decisions WHERE digest = ?1 UNION "
      "SELECT digest FROM unreadable WHERE digest = ?1 LIMIT 10";
  constexpr char kByPath[] =
      "SELECT digest FROM decisions WHERE source = ?1 OR destination = ?1 UNION "
      "SELECT digest FROM unreadable WHERE (path = ?1 OR set_aside = ?1) "
      "AND digest IS NOT NULL LIMIT 10";
  constexpr char kByPrefix[] =
      "SELECT digest FROM decisions WHERE digest >= ?1 AND digest < ?2 UNION "
      "SELECT digest FROM unreadable WHERE digest >= ?1 AND digest < ?2 LIMIT 10";
  Status s;
  if (!name.digest.empty()) {
    if (s = collect(kByDigest, name.digest, ""); !s.ok() || !digests->empty()) return s;
  }
  if (!name.source.empty()) {
    if (s = collect(kByPath, name.source, ""); !s.ok() || !digests->empty()) return s;
  }
  if (!name.prefix.empty()) s = collect(kByPrefix, name.prefix, name.prefix + "g");
  return s;
}

Status Store::RememberUnreadable(const UnreadableFile& file) {
  sql::Statement st(db_.get(),
                    "INSERT OR REPLACE INTO unreadable(path, size, mtime_ns, digest, reason, "
                    "first_seen, set_aside) VALUES(?, ?, ?, ?, ?, ?, ?)");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  st.Bind(1, file.path).Bind(2, file.size).Bind(3, file.mtime_ns);
  BindTextOrNull(st, 4, file.digest);
  st.Bind(5, file.reason).Bind(6, file.first_seen.empty() ? StoreClockNow() : file.first_seen);
  BindTextOrNull(st, 7, file.set_aside);
  Status s = st.Run();
  if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
  return Status::Ok();
}

namespace {

constexpr char kUnreadableColumns[] =
    "path, size, mtime_ns, digest, reason, first_seen, set_aside";

void ReadUnreadable(const sql::Statement& st, UnreadableFile* f) {
  f->path = st.ColumnText(0);
  f->size = st.ColumnInt(1);
  f->mtime_ns = st.ColumnInt(2);
  f->digest = TextOrEmpty(st, 3);
  f->reason = st.ColumnText(4);
  f->first_seen = st.ColumnText(5);
  f->set_aside = TextOrEmpty(st, 6);
}

}  // namespace

Status Store::FindUnreadable(const std::string& path, std::optional<UnreadableFile>* out) {
  out->reset();
  sql::Statement st(db_.get(), std::string("SELECT ") + kUnreadableColumns +
                                   " FROM unreadable WHERE path = ?");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  st.Bind(1, path);
  int rc = st.Step();
  if (rc == SQLITE_ROW) {
    UnreadableFile f;
    ReadUnreadable(st, &f);
    *out = std::move(f);
  } else if (rc != SQLITE_DONE) {
    return sql::ErrorStatus(db_.get(), path_);
  }
  return Status::Ok();
}

Status Store::ForgetUnreadable(const std::string& path) {
  sql::Statement st(db_.get(), "DELETE FROM unreadable WHERE path = ?");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  Status s = st.Bind(1, path).Run();
  if (!s.ok()) return Status::IoError(path_ + ": " + s.message());
  return Status::Ok();
}

Status Store::ListUnreadable(std::vector<UnreadableFile>* out) {
  out->clear();
  sql::Statement st(db_.get(), std::string("SELECT ") + kUnreadableColumns +
                                   " FROM unreadable ORDER BY path");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    UnreadableFile f;
    ReadUnreadable(st, &f);
    out->push_back(std::move(f));
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  return Status::Ok();
}

Status Store::QueuePolicies(std::vector<QueuePolicy>* out) {
  out->clear();
  sql::Statement st(db_.get(),
                    "SELECT name, documents, retired IS NOT NULL, threshold, min_documents "
                    "FROM queues ORDER BY name");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) {
    QueuePolicy p;
    p.name = st.ColumnText(0);
    p.documents = st.ColumnInt(1);
    p.retired = st.ColumnInt(2) != 0;
    if (!st.ColumnIsNull(3)) p.threshold = st.ColumnDouble(3);
    if (!st.ColumnIsNull(4)) p.min_documents = st.ColumnInt(4);
    out->push_back(std::move(p));
  }
  if (rc != SQLITE_DONE) return sql::ErrorStatus(db_.get(), path_);
  return Status::Ok();
}

namespace {

// Sets one column of a queue's row; NotFound for an unknown queue.
Status SetQueueColumn(sqlite3* db, const std::string& path, const char* sql,
                      const std::string& queue, const std::function<void(sql::Statement&)>& bind) {
  sql::Statement st(db, sql);
  if (!st.ok()) return Status::IoError(path + ": " + st.error());
  bind(st);
  st.Bind(2, queue);
  Status s = st.Run();
  if (!s.ok()) return Status::IoError(path + ": " + s.message());
  if (sqlite3_changes(db) != 1) return Status::NotFound("no queue named '" + queue + "'");
  return Status::Ok();
}

}  // namespace

Status Store::SetQueueThreshold(const std::string& queue, std::optional<double> threshold) {
  if (threshold && !(*threshold > 0 && *threshold <= 1)) {
    return Status::InvalidArgument("a threshold must be above 0 and at most 1");
  }
  return SetQueueColumn(db_.get(), path_, "UPDATE queues SET threshold = ? WHERE name = ?", queue,
                        [&](sql::Statement& st) {
                          if (threshold) {
                            st.Bind(1, *threshold);
                          } else {
                            st.BindNull(1);
                          }
                        });
}

Status Store::SetQueueMinDocuments(const std::string& queue,
                                   std::optional<int64_t> min_documents) {
  if (min_documents && *min_documents < 0) {
    return Status::InvalidArgument("a minimum of documents cannot be negative");
  }
  return SetQueueColumn(db_.get(), path_, "UPDATE queues SET min_documents = ? WHERE name = ?",
                        queue, [&](sql::Statement& st) {
                          if (min_documents) {
                            st.Bind(1, *min_documents);
                          } else {
                            st.BindNull(1);
                          }
                        });
}

}  // namespace chute
