#include "store/check.h"

#include <algorithm>
#include <map>
#include <optional>
#include <unordered_map>
#include <unordered_set>
#include <utility>

#include "store/fingerprint.h"
#include "store/queue_name.h"
#include "store/schema.h"
#include "store/sqlite.h"
#include "store/store_file.h"
#include "store/store_settings.h"
#include "store/term_counts_codec.h"
#include "store/text_codec.h"
#include "store/version_codec.h"

namespace chute {

namespace {

// The findings of one check, listed up to kMaxFindingsPerCheck.
class Findings {
 public:
  Findings(CheckReport* report, std::string check)
      : report_(report), check_(std::move(check)) {}

  void Add(std::string detail) {
    if (++count_ <= kMaxFindingsPerCheck) {
      report_->lines.push_back({check_, false, std::move(detail)});
    }
  }
  // Closes the check: a summary of the unlisted findings, or the line that
  // says what was verified.
  void Finish(std::string verified) {
    if (count_ == 0) {
      report_->lines.push_back({check_, true, std::move(verified)});
    } else if (count_ > kMaxFindingsPerCheck) {
      report_->lines.push_back(
          {check_, false,
           "... and " + std::to_string(count_ - kMaxFindingsPerCheck) +
               " more like these"});
    }
  }

 private:
  CheckReport* report_;
  std::string check_;
  int64_t count_ = 0;
};

struct QueueRow {
  std::string name;
  int64_t documents = 0;
  int64_t tokens = 0;
  std::optional<double> set_prior;
  bool retired = false;
  // Summed from the ledger.
  int64_t ledger_documents = 0;
  int64_t ledger_tokens = 0;
  bool undecodable = false;  // a ledger entry of this queue does not decode
};

struct PairHash {
  size_t operator()(const std::pair<int64_t, int64_t>& p) const {
    return std::hash<int64_t>()(p.first * 1000003 ^ p.second);
  }
};

std::string Quote(std::string_view s) { return "'" + std::string(s) + "'"; }

std::string Plural(int64_t n, const std::string& one, const std::string& many) {
  return std::to_string(n) + " " + (n == 1 ? one : many);
}

class Checker {
 public:
  Checker(sqlite3* db, CheckReport* report) : db_(db), report_(report) {}

  Status Run() {
    Status s = SqliteIntegrity();
    if (s.ok()) s = ForeignKeys();
    if (s.ok()) s = LoadQueues();
    if (s.ok()) s = Settings();
    if (s.ok()) QueueNames();
    if (s.ok()) s = LoadTerms();
    if (s.ok()) s = Ledger();
    if (s.ok()) s = Counts();
    if (s.ok()) QueueTotals();
    if (s.ok()) s = History();
    if (s.ok()) s = Fingerprint();
    return s;
  }

 private:
  Status Error() { return sql::ErrorStatus(db_, "check"); }

  Status SqliteIntegrity() {
    Findings f(report_, "sqlite_integrity");
    sql::Statement st(db_, "PRAGMA integrity_check");
    if (!st.ok()) return Error();
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      std::string line(st.ColumnText(0));
      if (line != "ok") f.Add("SQLite reports: " + line);
    }
    if (rc != SQLITE_DONE) return Error();
    f.Finish("SQLite's integrity_check found the file sound");
    return Status::Ok();
  }

  Status ForeignKeys() {
    Findings f(report_, "foreign_keys");
    sql::Statement st(db_, "PRAGMA foreign_key_check");
    if (!st.ok()) return Error();
    std::map<std::pair<std::string, std::string>, int64_t>
        orphans;  // (table, parent)
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      ++orphans[{std::string(st.ColumnText(0)), std::string(st.ColumnText(2))}];
    }
    if (rc != SQLITE_DONE) return Error();
    for (const auto& [key, n] : orphans) {
      const auto& [table, parent] = key;
      std::string what = parent == "queues"  ? "a queue"
                         : parent == "terms" ? "a term"
                                             : "a row of " + parent;
      std::string rows = table == "ledger"
                             ? Plural(n, "ledger entry", "ledger entries")
                             : Plural(n, "row", "rows") + " of " + table;
      f.Add(rows + (n == 1 ? " names " : " name ") + what +
            " that does not exist");
    }
    f.Finish("no row names a queue or term that does not exist");
    return Status::Ok();
  }

  Status LoadQueues() {
    sql::Statement st(
        db_,
        "SELECT id, name, documents, tokens, set_prior, retired IS NOT NULL "
        "FROM queues");
    if (!st.ok()) return Error();
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      QueueRow q;
      q.name = st.ColumnText(1);
      q.documents = st.ColumnInt(2);
      q.tokens = st.ColumnInt(3);
      if (!st.ColumnIsNull(4)) q.set_prior = st.ColumnDouble(4);
      q.retired = st.ColumnInt(5) != 0;
      queues_.emplace(st.ColumnInt(0), std::move(q));
    }
    if (rc != SQLITE_DONE) return Error();
    report_->queues = static_cast<int64_t>(queues_.size());
    return Status::Ok();
  }

  Status Settings() {
    Findings f(report_, "settings");
    sql::Statement st(db_, "SELECT key, value FROM settings");
    if (!st.ok()) return Error();
    std::vector<std::pair<std::string, std::string>> rows;
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW)
      rows.emplace_back(st.ColumnText(0), st.ColumnText(1));
    if (rc != SQLITE_DONE) return Error();
    std::string why;
    settings_ok_ = DecodeSettings(rows, &settings_, &why);
    if (!settings_ok_) f.Add(why);
    double sum = 0;
    for (const auto& [id, q] : queues_) {
      if (!q.set_prior) continue;
      if (!(*q.set_prior > 0 && *q.set_prior < 1)) {
        f.Add("queue " + Quote(q.name) +
              " has a hand-set prior outside (0, 1)");
      }
      sum += *q.set_prior;
    }
    // The same tolerance as Store::SetPrior.
    if (sum > 1.0 + 1e-12) f.Add("the hand-set priors sum to more than 1");
    f.Finish(
        "the model settings are complete and usable; hand-set priors sum to at "
        "most 1");
    return Status::Ok();
  }

  void QueueNames() {
    Findings f(report_, "queue_names");
    for (const auto& [id, q] : queues_) {
      Status v = ValidateQueueName(q.name);
      if (!v.ok())
        f.Add("queue name " + Quote(q.name) + " is not valid: " + v.message());
    }
    f.Finish("every queue name is valid");
  }

  Status LoadTerms() {
    sql::Statement st(db_, "SELECT id, text FROM terms");
    if (!st.ok()) return Error();
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      int64_t id = st.ColumnInt(0);
      std::string text(st.ColumnText(1));
      term_id_.emplace(text, id);
      term_text_.emplace(id, std::move(text));
    }
    if (rc != SQLITE_DONE) return Error();
    report_->terms = static_cast<int64_t>(term_text_.size());
    return Status::Ok();
  }

  // Decodes every ledger blob and sums the ledger per queue and per
  // (term, queue).
  Status Ledger() {
    Findings blobs(report_, "ledger_blobs");
    Findings tokens(report_, "ledger_tokens");
    Findings texts(report_, "ledger_text");
    sql::Statement st(db_,
                      "SELECT digest, queue_id, tokens, term_counts, in_model, id, "
                      "text FROM ledger ORDER BY id");
    if (!st.ok()) return Error();
    std::vector<TermCount> terms;
    TextCodec codec;
    std::string kept_text;
    int64_t kept = 0;
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      ++report_->documents;
      std::string digest(st.ColumnText(0));
      if (!st.ColumnIsNull(6)) {
        ++kept;
        if (Status u = codec.Unpack(st.ColumnBlob(6), &kept_text); !u.ok()) {
          texts.Add("the kept text of ledger entry " + digest +
                    " does not unpack: " + u.message());
        }
      }
      int64_t queue_id = st.ColumnInt(1);
      int64_t doc_tokens = st.ColumnInt(2);
      const bool in_model = st.ColumnInt(4) != 0;
      if (in_model) members_.emplace_back(st.ColumnInt(5), queue_id);
      auto q = queues_.find(queue_id);
      QueueRow* queue =
          q == queues_.end() ? nullptr : &q->second;  // else an orphan
      // Documents kept only for history are not counted in the model.
      if (!in_model) queue = nullptr;
      if (queue) {
        ++queue->ledger_documents;
        queue->ledger_tokens += doc_tokens;
      }
      if (!DecodeTermCounts(st.ColumnBlob(3), &terms)) {
        blobs.Add("the term counts of ledger entry " + digest +
                  " do not decode" +
                  (queue ? "; the counts of queue " + Quote(queue->name) +
                               " are not compared with the ledger"
                         : std::string()));
        if (queue) queue->undecodable = true;
        continue;
      }
      int64_t sum = 0;
      for (const auto& [text, n] : terms) sum += n;
      if (sum != doc_tokens) {
        tokens.Add("ledger entry " + digest + " records " +
                   std::to_string(doc_tokens) +
                   " tokens but its term counts sum to " + std::to_string(sum));
      }
      if (!queue) continue;
      for (const auto& [text, n] : terms) {
        auto t = term_id_.find(text);
        if (t == term_id_.end()) {
          missing_terms_[{text, queue_id}] += n;
        } else {
          ledger_sums_[{t->second, queue_id}] += n;
        }
      }
    }
    if (rc != SQLITE_DONE) return Error();
    blobs.Finish("all " + Plural(report_->documents, "ledger entry decodes",
                                 "ledger entries decode"));
    tokens.Finish(
        "each ledger entry's tokens equal the sum of its term counts");
    texts.Finish("all " + Plural(kept, "kept text unpacks", "kept texts unpack") +
                 " (" + Plural(report_->documents - kept, "entry keeps", "entries keep") +
                 " no text)");
    return Status::Ok();
  }

  std::string QueueName(int64_t id) const { return Quote(queues_.at(id).name); }

  Status Counts() {
    Findings positive(report_, "counts_positive");
    Findings match(report_, "counts_match_ledger");
    sql::Statement st(
        db_,
        "SELECT term_id, queue_id, n FROM counts ORDER BY term_id, queue_id");
    if (!st.ok()) return Error();
    std::unordered_map<int64_t, int64_t> term_totals;  // of positive counts
    int64_t rows = 0;
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      ++rows;
      int64_t term_id = st.ColumnInt(0), queue_id = st.ColumnInt(1),
              n = st.ColumnInt(2);
      auto t = term_text_.find(term_id);
      auto q = queues_.find(queue_id);
      if (t == term_text_.end() || q == queues_.end())
        continue;  // orphans: foreign_keys
      if (n <= 0) {
        positive.Add("the count of term " + Quote(t->second) + " in queue " +
                     Quote(q->second.name) + " is " + std::to_string(n));
      } else {
        term_totals[term_id] += n;
        model_rows_.push_back({&t->second, queue_id, n});
      }
      auto l = ledger_sums_.find({term_id, queue_id});
      int64_t ledger = l == ledger_sums_.end() ? 0 : l->second;
      if (l != ledger_sums_.end()) ledger_sums_.erase(l);
      // A row that is not positive is counts_positive's finding; here it
      // stands for no count at all, as the model reads it.
      if (!q->second.undecodable && ledger != std::max<int64_t>(n, 0)) {
        match.Add("term " + Quote(t->second) + " in queue " +
                  Quote(q->second.name) + ": the counts say " +
                  std::to_string(n) + ", the queue's ledger entries sum to " +
                  std::to_string(ledger));
      }
    }
    if (rc != SQLITE_DONE) return Error();
    // What the ledger holds and the counts do not.
    std::vector<std::string> no_row;  // sorted, for a stable report
    for (const auto& [key, n] : ledger_sums_) {
      if (queues_.at(key.second).undecodable) continue;
      no_row.push_back(
          "term " + Quote(term_text_.at(key.first)) + " in queue " +
          QueueName(key.second) +
          ": the counts have no row, the queue's ledger entries sum to " +
          std::to_string(n));
    }
    std::sort(no_row.begin(), no_row.end());
    for (std::string& line : no_row) match.Add(std::move(line));
    for (const auto& [key, n] : missing_terms_) {
      if (queues_.at(key.second).undecodable) continue;
      match.Add("term " + Quote(key.first) + " in queue " +
                QueueName(key.second) +
                ": not in the vocabulary, the queue's ledger entries sum to " +
                std::to_string(n));
    }
    positive.Finish("all " + Plural(rows, "count is", "counts are") +
                    " positive");
    match.Finish(
        "every count N(q, w) equals the sum of its queue's ledger entries");

    Findings vocabulary(report_, "vocabulary");
    for (const auto& [id, text] : term_text_) {
      if (term_totals.count(id) == 0) {
        vocabulary.Add("term " + Quote(text) + " has no count in any queue");
      }
    }
    vocabulary.Finish("all " +
                      Plural(report_->terms, "term has", "terms have") +
                      " a count, so |V| = " + std::to_string(report_->terms));
    return Status::Ok();
  }

  void QueueTotals() {
    Findings f(report_, "queue_totals");
    for (const auto& [id, q] : queues_) {
      if (q.documents != q.ledger_documents) {
        f.Add("queue " + Quote(q.name) + " records " +
              std::to_string(q.documents) + " documents but the ledger holds " +
              std::to_string(q.ledger_documents));
      }
      if (q.tokens != q.ledger_tokens) {
        f.Add("queue " + Quote(q.name) + " records " +
              std::to_string(q.tokens) +
              " tokens but its ledger entries hold " +
              std::to_string(q.ledger_tokens));
      }
    }
    f.Finish("each queue's documents and tokens equal its ledger entries'");
  }

  // The version history: every header and snapshot decodes, the change log
  // names only documents the ledger holds (forget leaves no trace), and
  // replaying it from the newest snapshot gives the current model's
  // members.
  Status History() {
    Findings f(report_, "history");
    int64_t newest = 0, versions = 0;
    {
      sql::Statement st(db_, "SELECT id, header FROM versions ORDER BY id");
      if (!st.ok()) return Error();
      StoreSettings settings;
      std::vector<VersionQueue> queues;
      int rc;
      while ((rc = st.Step()) == SQLITE_ROW) {
        ++versions;
        newest = st.ColumnInt(0);
        if (!DecodeHeader(st.ColumnText(1), &settings, &queues)) {
          f.Add("the header of version " + std::to_string(newest) +
                " does not decode");
        }
      }
      if (rc != SQLITE_DONE) return Error();
    }
    if (versions == 0) {
      f.Finish("no version recorded yet (a store upgraded and not yet opened)");
      return Status::Ok();
    }
    std::unordered_set<int64_t> ledger_ids;
    {
      sql::Statement st(db_, "SELECT id FROM ledger");
      if (!st.ok()) return Error();
      while (st.Step() == SQLITE_ROW) ledger_ids.insert(st.ColumnInt(0));
    }
    int64_t from = 0;
    std::vector<std::pair<int64_t, int64_t>> members;
    {
      sql::Statement st(db_, "SELECT version, members FROM snapshots ORDER BY version");
      if (!st.ok()) return Error();
      std::vector<std::pair<int64_t, int64_t>> decoded;
      int rc;
      while ((rc = st.Step()) == SQLITE_ROW) {
        int64_t v = st.ColumnInt(0);
        if (!DecodeMembers(st.ColumnBlob(1), &decoded)) {
          f.Add("the snapshot of version " + std::to_string(v) + " does not decode");
          continue;
        }
        for (const auto& [id, queue] : decoded) {
          if (!ledger_ids.count(id)) {
            f.Add("the snapshot of version " + std::to_string(v) +
                  " names ledger id " + std::to_string(id) + ", which the ledger does not hold");
            break;
          }
        }
        from = v;
        members = decoded;
      }
      if (rc != SQLITE_DONE) return Error();
    }
    std::map<int64_t, int64_t> replay(members.begin(), members.end());
    {
      sql::Statement st(db_,
                        "SELECT version, document, to_queue FROM changes "
                        "ORDER BY version, rowid");
      if (!st.ok()) return Error();
      int rc;
      while ((rc = st.Step()) == SQLITE_ROW) {
        int64_t v = st.ColumnInt(0), id = st.ColumnInt(1);
        if (!ledger_ids.count(id)) {
          f.Add("the change log of version " + std::to_string(v) + " names ledger id " +
                std::to_string(id) + ", which the ledger does not hold");
        }
        if (v <= from) continue;
        if (st.ColumnIsNull(2)) {
          replay.erase(id);
        } else {
          replay[id] = st.ColumnInt(2);
        }
      }
      if (rc != SQLITE_DONE) return Error();
    }
    std::vector<std::pair<int64_t, int64_t>> replayed(replay.begin(), replay.end());
    if (replayed != members_) {
      f.Add("replaying the history to version " + std::to_string(newest) + " gives " +
            Plural(static_cast<int64_t>(replayed.size()), "document", "documents") +
            " in the model, the ledger has " +
            Plural(static_cast<int64_t>(members_.size()), "document", "documents") +
            " in it (or the same number in other queues)");
    }
    f.Finish("the history of " + Plural(versions, "version", "versions") +
             " replays to the current model's documents and queues");
    return Status::Ok();
  }

  // The newest version's fingerprint is the current model's.
  Status Fingerprint() {
    Findings f(report_, "fingerprint");
    sql::Statement st(db_, "SELECT id, fingerprint FROM versions ORDER BY id DESC LIMIT 1");
    if (!st.ok()) return Error();
    if (st.Step() != SQLITE_ROW) {
      f.Finish("no version recorded yet");
      return Status::Ok();
    }
    const int64_t version = st.ColumnInt(0);
    const std::string recorded(st.ColumnText(1));
    if (!settings_ok_) {
      f.Add("the fingerprint cannot be computed without usable settings");
      f.Finish("");
      return Status::Ok();
    }
    ModelCounts counts;
    std::map<int64_t, size_t> column;
    for (const auto& [id, q] : queues_) {
      if (q.retired) continue;
      column[id] = counts.queues.size();
      counts.queues.push_back({q.name, q.documents, q.tokens, q.set_prior});
    }
    std::sort(model_rows_.begin(), model_rows_.end(),
              [](const ModelRow& a, const ModelRow& b) { return *a.term < *b.term; });
    const size_t nq = counts.queues.size();
    for (const ModelRow& r : model_rows_) {
      auto c = column.find(r.queue_id);
      if (c == column.end()) continue;  // a retired queue's count: counts_match_ledger
      if (counts.terms.empty() || counts.terms.back() != *r.term) {
        counts.terms.push_back(*r.term);
        counts.counts.resize(counts.counts.size() + nq, 0);
      }
      counts.counts[(counts.terms.size() - 1) * nq + c->second] = r.n;
    }
    std::string actual = ModelFingerprint(settings_, counts);
    if (actual != recorded) {
      f.Add("the model's fingerprint is " + actual + ", version " + std::to_string(version) +
            " recorded " + recorded);
    }
    f.Finish("the model's fingerprint is the one version " + std::to_string(version) +
             " recorded (" + recorded.substr(0, 12) + ")");
    return Status::Ok();
  }

  struct ModelRow {
    const std::string* term;
    int64_t queue_id;
    int64_t n;
  };

  sqlite3* db_;
  CheckReport* report_;
  StoreSettings settings_;
  bool settings_ok_ = false;
  std::vector<std::pair<int64_t, int64_t>> members_;  // in_model: (ledger id, queue id)
  std::vector<ModelRow> model_rows_;                  // positive counts
  std::map<int64_t, QueueRow> queues_;  // by id
  std::unordered_map<std::string, int64_t> term_id_;
  std::map<int64_t, std::string> term_text_;
  std::unordered_map<std::pair<int64_t, int64_t>, int64_t, PairHash>
      ledger_sums_;
  std::map<std::pair<std::string, int64_t>, int64_t> missing_terms_;
};

}  // namespace

bool CheckReport::consistent() const {
  for (const CheckLine& l : lines) {
    if (!l.ok) return false;
  }
  return true;
}

Status CheckStore(const std::string& path, CheckReport* report) {
  *report = CheckReport();
  sql::DbHandle db;
  int64_t version = 0;
  Status s = OpenStoreFile(path, &db, &version);
  if (!s.ok()) return s;
  s = ConfigureStoreConnection(db.get());
  if (s.ok() && version < SchemaVersion())
    s = Migrate(db.get(), SchemaVersion());
  if (!s.ok()) return Status::IoError(path + ": " + s.message());
  sql::ReadTransaction read(db.get());
  if (!read.status().ok())
    return Status::IoError(path + ": " + read.status().message());
  Checker checker(db.get(), report);
  s = checker.Run();
  if (!s.ok()) {
    if (s.code() == Status::Code::kCorruption) {
      return Status::Corruption(path +
                                ": too damaged to check: " + s.message());
    }
    return Status::IoError(path + ": " + s.message());
  }
  return Status::Ok();
}

}  // namespace chute
