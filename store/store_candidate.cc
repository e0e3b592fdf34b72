// The candidate: a model that `promote` may make current (schema.h,
// version 3), from a rebuild or from corrections; and what the promotion
// gate reads to compare it with the current model.
#include <algorithm>
#include <charconv>
#include <map>
#include <string>
#include <unordered_map>
#include <unordered_set>
#include <utility>
#include <vector>

#include "store/store.h"
#include "store/term_counts_codec.h"
#include "store/version_codec.h"

namespace chute {

namespace {

// The candidate's own corrections: "ledger_id from_queue to_queue" lines.
std::string EncodeMoves(const std::vector<MemberChange>& moves) {
  std::string out;
  for (const MemberChange& m : moves) {
    out += std::to_string(m.ledger_id) + " " + std::to_string(m.from_queue) +
           " " + std::to_string(m.to_queue) + "\n";
  }
  return out;
}

bool DecodeMoves(std::string_view text, std::vector<MemberChange>* out) {
  out->clear();
  while (!text.empty()) {
    MemberChange m;
    for (int64_t* field : {&m.ledger_id, &m.from_queue, &m.to_queue}) {
      auto r = std::from_chars(text.data(), text.data() + text.size(), *field);
      if (r.ec != std::errc() || r.ptr == text.data() + text.size())
        return false;
      text.remove_prefix(static_cast<size_t>(r.ptr - text.data()) + 1);
    }
    out->push_back(m);
  }
  return true;
}

}  // namespace

Status Store::SaveRebuildCandidate(const StoreSettings& settings,
                                   const ChangeInfo& change, bool* replaced) {
  *replaced = false;
  sqlite3* db = db_.get();
  sql::Transaction tx(db);
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  std::optional<RecountInfo> recount;
  Status s = LoadRecount(&recount);
  if (!s.ok()) return s;
  VersionInfo current;
  if (s = CurrentVersion(&current); !s.ok()) return s;
  const bool keep = recount && !SameTokenizing(recount->settings, settings_);
  if (keep) {
    s = sql::Exec(db, "DELETE FROM candidate");
  } else {
    s = ClearCandidateInTransaction(replaced);
  }
  if (!s.ok()) return s;
  std::vector<VersionQueue> queues;
  std::vector<std::pair<int64_t, int64_t>> members;
  if (s = CurrentQueuesInTransaction(&queues); !s.ok()) return s;
  if (s = CurrentMembersInTransaction(&members); !s.ok()) return s;
  sql::Statement put(db,
                     "INSERT INTO candidate(id, kind, base_version, made, by, "
                     "header, members, "
                     "moves) VALUES(1, 'rebuild', ?, ?, ?, ?, ?, '')");
  if (!put.ok()) return Status::IoError(path_ + ": " + put.error());
  s = put.Bind(1, keep ? recount->base_version : current.version)
          .Bind(2, change.now)
          .Bind(3, change.by)
          .Bind(4, EncodeHeader(settings, queues))
          .BindBlob(5, EncodeMembers(members))
          .Run();
  if (!s.ok()) return s;
  return tx.Commit();
}

Status Store::CorrectCandidate(const std::vector<CorrectMove>& moves,
                               const LearnBatch& batch,
                               const ChangeInfo& change, CorrectResult* result,
                               bool* replaced) {
  *result = CorrectResult();
  sqlite3* db = db_.get();
  sql::Transaction tx(db);
  if (!tx.status().ok())
    return Status::Busy(path_ + ": " + tx.status().message());
  Status s = ClearCandidateInTransaction(replaced);
  if (!s.ok()) return s;
  std::vector<std::pair<int64_t, int64_t>> now;
  if (s = CurrentMembersInTransaction(&now); !s.ok()) return s;
  std::map<int64_t, int64_t> members(now.begin(), now.end());
  std::unordered_map<std::string, int64_t> queue_ids;
  auto queue_id = [&](const std::string& name, int64_t* id) {
    auto [it, inserted] = queue_ids.emplace(name, 0);
    bool created = false;
    Status q =
        inserted ? QueueIdInTransaction(name, change.now, &it->second, &created)
                 : Status::Ok();
    *id = it->second;
    return q;
  };
  std::vector<std::pair<int64_t, std::string>> names;
  if (s = QueueNames(&names); !s.ok()) return s;
  std::unordered_map<int64_t, std::string> name_of(names.begin(), names.end());
  std::vector<MemberChange> own;
  sql::Statement find(db, "SELECT id, queue_id FROM ledger WHERE digest = ?");
  if (!find.ok()) return Status::IoError(path_ + ": " + find.error());
  // A move of a known document, on the candidate's members.
  auto move = [&](const std::string& digest, int64_t to, std::string* from_name,
                  bool* found) -> Status {
    find.Bind(1, digest);
    *found = find.Step() == SQLITE_ROW;
    const int64_t id = *found ? find.ColumnInt(0) : 0;
    const int64_t ledger_queue = *found ? find.ColumnInt(1) : 0;
    find.Reset();
    if (!*found) return Status::Ok();
    auto m = members.find(id);
    const int64_t from = m == members.end() ? 0 : m->second;
    *from_name = name_of[from ? from : ledger_queue];
    if (from == to) return Status::Ok();
    own.push_back({id, from, to});
    members[id] = to;
    if (from) {
      ++result->moved;
    } else {
      ++result->learned.corrected;
    }
    return Status::Ok();
  };
  for (const CorrectMove& m : moves) {
    int64_t to = 0;
    if (s = queue_id(m.queue, &to); !s.ok()) return s;
    name_of[to] = m.queue;
    std::string from;
    bool found = false;
    if (s = move(m.digest, to, &from, &found); !s.ok()) return s;
    if (!found)
      return Status::NotFound(path_ + ": " + m.digest + " is not learned");
    result->from.push_back(from);
  }
  // New documents: into the ledger, out of the current model.
  sql::Statement add(
      db,
      "INSERT INTO ledger(digest, queue_id, source, learned_at, tokens, "
      "term_counts, in_model, text) VALUES(?, ?, ?, ?, ?, ?, 0, ?)");
  if (!add.ok()) return Status::IoError(path_ + ": " + add.error());
  LearnResult& learned = result->learned;
  std::vector<std::pair<std::string_view, int64_t>> terms;
  for (const LearnBatch::Document& d : batch.documents()) {
    int64_t to = 0;
    if (s = queue_id(d.queue, &to); !s.ok()) return s;
    name_of[to] = d.queue;
    std::string from;
    bool found = false;
    if (s = move(d.digest, to, &from, &found); !s.ok()) return s;
    if (found) {
      learned.outcomes.push_back(from == d.queue ? LearnOutcome::kAlreadyLearned
                                                 : LearnOutcome::kCorrected);
      learned.known_queue.push_back(from);
      continue;
    }
    terms.clear();
    for (const auto& [term, n] : d.counts)
      terms.emplace_back(batch.term(term), n);
    std::sort(terms.begin(), terms.end());
    add.Bind(1, d.digest)
        .Bind(2, to)
        .Bind(3, d.source)
        .Bind(4, change.now)
        .Bind(5, d.tokens);
    add.BindBlob(6, EncodeTermCounts(terms));
    if (d.packed_text.empty()) {
      add.BindNull(7);
    } else {
      add.BindBlob(7, d.packed_text);
    }
    if (s = add.Run(); !s.ok()) return s;
    const int64_t id = sqlite3_last_insert_rowid(db);
    own.push_back({id, 0, to});
    members[id] = to;
    learned.outcomes.push_back(LearnOutcome::kLearned);
    learned.known_queue.emplace_back();
    ++learned.learned;
  }
  VersionInfo current;
  if (s = CurrentVersion(&current); !s.ok()) return s;
  std::vector<VersionQueue> queues;
  if (s = CurrentQueuesInTransaction(&queues); !s.ok()) return s;
  sql::Statement put(db,
                     "INSERT INTO candidate(id, kind, base_version, made, by, "
                     "header, members, "
                     "moves) VALUES(1, 'correct', ?, ?, ?, ?, ?, ?)");
  if (!put.ok()) return Status::IoError(path_ + ": " + put.error());
  s = put.Bind(1, current.version)
          .Bind(2, change.now)
          .Bind(3, change.by)
          .Bind(4, EncodeHeader(settings_, queues))
          .BindBlob(5, EncodeMembers({members.begin(), members.end()}))
          .Bind(6, EncodeMoves(own))
          .Run();
  if (!s.ok()) return s;
  s = tx.Commit();
  if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  return Status::Ok();
}

Status Store::LoadCandidate(std::optional<Candidate>* out) {
  out->reset();
  sql::Statement st(
      db_.get(),
      "SELECT kind, base_version, made, by, header, members, moves, "
      "IFNULL(details, '') FROM candidate");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc = st.Step();
  if (rc == SQLITE_DONE) return Status::Ok();
  if (rc != SQLITE_ROW) return sql::ErrorStatus(db_.get(), path_);
  Candidate c;
  c.kind = st.ColumnText(0);
  c.base_version = st.ColumnInt(1);
  c.made = st.ColumnText(2);
  c.by = st.ColumnText(3);
  if (!DecodeHeader(st.ColumnText(4), &c.settings, &c.queues) ||
      !DecodeMembers(st.ColumnBlob(5), &c.members) ||
      !DecodeMoves(st.ColumnText(6), &c.moves)) {
    return Status::Corruption(path_ + ": the candidate is damaged");
  }
  c.details = st.ColumnText(7);
  *out = std::move(c);
  return Status::Ok();
}

Status Store::EraseFromCandidateInTransaction(const std::vector<int64_t>& ids) {
  std::optional<Candidate> c;
  Status s = LoadCandidate(&c);
  if (!s.ok() || !c || ids.empty()) return s;
  const std::unordered_set<int64_t> gone(ids.begin(), ids.end());
  std::erase_if(c->members,
                [&](const auto& m) { return gone.count(m.first) > 0; });
  std::erase_if(c->moves, [&](const MemberChange& m) {
    return gone.count(m.ledger_id) > 0;
  });
  sql::Statement put(db_.get(), "UPDATE candidate SET members = ?, moves = ?");
  if (!put.ok()) return Status::IoError(path_ + ": " + put.error());
  return put.BindBlob(1, EncodeMembers(c->members))
      .Bind(2, EncodeMoves(c->moves))
      .Run();
}

Status Store::SetCandidateDetails(const std::string& details) {
  sql::Statement st(db_.get(), "UPDATE candidate SET details = ?");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  return st.Bind(1, details).Run();
}

Status Store::CandidateMembers(const Candidate& candidate,
                               std::vector<std::pair<int64_t, int64_t>>* out) {
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  std::vector<std::pair<int64_t, int64_t>> now;
  Status s = CurrentMembersInTransaction(&now);
  if (!s.ok()) return s;
  std::map<int64_t, int64_t> members(now.begin(), now.end());
  sql::Statement exists(db_.get(),
                        "SELECT EXISTS (SELECT 1 FROM ledger WHERE id = ?)");
  if (!exists.ok()) return Status::IoError(path_ + ": " + exists.error());
  for (const MemberChange& m : candidate.moves) {
    exists.Bind(1, m.ledger_id);
    const bool there = exists.Step() == SQLITE_ROW && exists.ColumnInt(0) != 0;
    exists.Reset();
    if (there) members[m.ledger_id] = m.to_queue;
  }
  out->assign(members.begin(), members.end());
  return Status::Ok();
}

Status Store::CurrentMembers(std::vector<std::pair<int64_t, int64_t>>* out) {
  return CurrentMembersInTransaction(out);
}

Status Store::PromoteCandidate(const ChangeInfo& change,
                               const std::string& details,
                               const RecountFunction& recount,
                               RollbackResult* result) {
  *result = RollbackResult();
  {
    sql::Transaction tx(db_.get());
    if (!tx.status().ok())
      return Status::Busy(path_ + ": " + tx.status().message());
    std::optional<Candidate> candidate;
    Status s = LoadCandidate(&candidate);
    if (!s.ok()) return s;
    if (!candidate) return Status::NotFound(path_ + ": there is no candidate");
    if (SameTokenizing(candidate->settings, settings_)) {
      VersionState target;
      target.settings = candidate->settings;
      if (s = CurrentQueuesInTransaction(&target.queues); !s.ok()) return s;
      if (s = CandidateMembers(*candidate, &target.members); !s.ok()) return s;
      StoreSettings settings = settings_;
      settings.keep_text = candidate->settings.keep_text;
      if (s = SaveSettingsInTransaction(settings); !s.ok()) return s;
      s = ApplyStateInTransaction(target, "promote", change, details, result);
      bool had = false;
      if (s.ok()) s = ClearCandidateInTransaction(&had);
    } else {
      SwapResult swap;
      s = SwapRecountInTransaction("promote", change, details, recount, &swap);
      result->made = swap.made;
    }
    if (!s.ok()) return s;
    s = tx.Commit();
    if (!s.ok()) return Status::IoError(path_ + ": commit: " + s.message());
  }
  DropRecountLeftovers();
  return Status::Ok();
}

Status Store::NewestCorrections(int64_t limit, std::vector<Correction>* out) {
  out->clear();
  // Moves made by reviewers: corrections, learning a known document under
  // another queue, and promoted candidates of corrections. A rollback's
  // moves only undo.
  sql::Statement st(
      db_.get(),
      "SELECT c.document, c.to_queue FROM changes c "
      "JOIN versions v ON v.id = c.version "
      "WHERE c.from_queue IS NOT NULL AND c.to_queue IS NOT NULL "
      "AND v.command IN ('correct', 'learn', 'promote') "
      "AND EXISTS (SELECT 1 FROM ledger l WHERE l.id = c.document) "
      "ORDER BY c.version DESC, c.rowid DESC");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  std::unordered_set<int64_t> seen;
  int rc;
  while (static_cast<int64_t>(out->size()) < limit &&
         (rc = st.Step()) == SQLITE_ROW) {
    if (seen.insert(st.ColumnInt(0)).second)
      out->push_back({st.ColumnInt(0), st.ColumnInt(1)});
  }
  if (static_cast<int64_t>(out->size()) >= limit) return Status::Ok();
  return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db_.get(), path_);
}

Status Store::CountsOfMembers(
    const std::vector<std::pair<int64_t, int64_t>>& members, bool recounted,
    ModelCounts* out) {
  sql::ReadTransaction read(db_.get());
  if (!read.status().ok()) return read.status();
  std::vector<VersionQueue> queues;
  Status s = CurrentQueuesInTransaction(&queues);
  if (!s.ok()) return s;
  return SumMembers(queues, members, recounted, out);
}

Status Store::DocumentTerms(const std::vector<int64_t>& ids, bool recounted,
                            std::vector<std::vector<TermCount>>* out) {
  out->assign(ids.size(), {});
  sql::Statement st(
      db_.get(),
      recounted ? "SELECT term_counts FROM rebuild_docs WHERE ledger_id = ?"
                : "SELECT term_counts FROM ledger WHERE id = ?");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  for (size_t i = 0; i < ids.size(); ++i) {
    st.Bind(1, ids[i]);
    const bool ok = st.Step() == SQLITE_ROW &&
                    DecodeTermCounts(st.ColumnBlob(0), &(*out)[i]);
    st.Reset();
    if (!ok) {
      return Status::Corruption(path_ + ": the counts of ledger entry " +
                                std::to_string(ids[i]) +
                                " are missing or do not decode");
    }
  }
  return Status::Ok();
}

Status Store::QueueNames(std::vector<std::pair<int64_t, std::string>>* out) {
  out->clear();
  sql::Statement st(db_.get(), "SELECT id, name FROM queues ORDER BY id");
  if (!st.ok()) return Status::IoError(path_ + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW)
    out->emplace_back(st.ColumnInt(0), st.ColumnText(1));
  return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db_.get(), path_);
}

}  // namespace chute
