#include "store/count_writer.h"

#include <algorithm>
#include <atomic>
#include <thread>
#include <unordered_map>
#include <utility>

#include "store/count_rows.h"
#include "store/sqlite.h"

namespace chute {

namespace {

Status Damaged(sqlite3* db, const std::string& path, int64_t queue_id, std::string_view term) {
  std::string name = "#" + std::to_string(queue_id);
  sql::Statement st(db, "SELECT name FROM queues WHERE id = ?");
  if (st.ok() && st.Bind(1, queue_id).Step() == SQLITE_ROW) name = std::string(st.ColumnText(0));
  return Status::Corruption(path + ": the count of term '" + std::string(term) + "' in queue '" +
                            name + "' is smaller than its documents' own");
}

// before[i] = the count of rows[i] now, 0 when it has no row, read term by
// term. REQUIRES: rows sorted by (term_id, queue_id).
Status ReadBefore(sqlite3* db, const std::string& path, const std::string& counts,
                  const std::vector<CountRow>& rows, std::vector<int64_t>* before) {
  sql::Statement st(db, "SELECT queue_id, n FROM " + counts + " WHERE term_id = ? ORDER BY queue_id");
  if (!st.ok()) return Status::IoError(path + ": " + st.error());
  size_t i = 0;
  while (i < rows.size()) {
    const int64_t term_id = rows[i].term_id;
    st.Bind(1, term_id);
    int rc;
    while ((rc = st.Step()) == SQLITE_ROW) {
      const int64_t queue_id = st.ColumnInt(0);
      while (i < rows.size() && rows[i].term_id == term_id && rows[i].queue_id < queue_id) ++i;
      if (i < rows.size() && rows[i].term_id == term_id && rows[i].queue_id == queue_id)
        (*before)[i++] = st.ColumnInt(1);
    }
    st.Reset();
    if (rc != SQLITE_DONE) return sql::ErrorStatus(db, path);
    while (i < rows.size() && rows[i].term_id == term_id) ++i;
  }
  return Status::Ok();
}

}  // namespace

Status ReadQueueNames(sqlite3* db, const std::string& path,
                      std::unordered_map<int64_t, std::string>* out) {
  sql::Statement st(db, "SELECT id, name FROM queues");
  if (!st.ok()) return Status::IoError(path + ": " + st.error());
  int rc;
  while ((rc = st.Step()) == SQLITE_ROW) out->emplace(st.ColumnInt(0), st.ColumnText(1));
  return rc == SQLITE_DONE ? Status::Ok() : sql::ErrorStatus(db, path);
}

size_t CountSums::ColumnOf(int64_t queue_id) {
  size_t c = 0;
  while (c < queue_ids_.size() && queue_ids_[c] != queue_id) ++c;
  if (c == queue_ids_.size()) {
    queue_ids_.push_back(queue_id);
    columns_.emplace_back();
  }
  return c;
}

void CountSums::Add(const CountSums& other) {
  std::vector<uint32_t> number(other.terms_.size());
  for (uint32_t t = 0; t < number.size(); ++t) number[t] = terms_.Number(other.terms_.term(t));
  for (size_t oc = 0; oc < other.queue_ids_.size(); ++oc) {
    std::vector<int64_t>& mine = column(ColumnOf(other.queue_ids_[oc]));
    const std::vector<int64_t>& theirs = other.columns_[oc];
    for (uint32_t t = 0; t < theirs.size(); ++t) mine[number[t]] += theirs[t];
  }
}

Status CountSums::Write(sqlite3* db, const std::string& path, const CountWriteOptions& options,
                        CountsSum* running, CountWriteResult* result) const {
  std::vector<std::string_view> terms(terms_.size());
  for (uint32_t t = 0; t < terms.size(); ++t) terms[t] = terms_.term(t);
  std::vector<CountChange> changes;
  for (size_t c = 0; c < columns_.size(); ++c) {
    for (uint32_t t = 0; t < columns_[c].size(); ++t) {
      if (columns_[c][t] != 0) changes.push_back({t, queue_ids_[c], columns_[c][t]});
    }
  }
  return WriteCountChanges(db, path, terms, std::move(changes), options, running, result);
}

Status WriteCountChanges(sqlite3* db, const std::string& path,
                         const std::vector<std::string_view>& terms,
                         std::vector<CountChange> changes,
                         const CountWriteOptions& options, CountsSum* running,
                         CountWriteResult* result) {
  *result = CountWriteResult();
  // Table names chute itself gives (never user input).
  const std::string terms_table = options.terms_table, counts = options.counts_table;
  sql::Statement find_term(db, "SELECT id FROM " + terms_table + " WHERE text = ?");
  sql::Statement add_terms(
      db, "INSERT INTO " + terms_table + "(id, text) SELECT id, text FROM term_rows(?)");
  // The counts before the change are needed (for the fingerprint's sum and
  // to find damage): change_in_pass records them as it goes, or they are
  // read first. A statement with RETURNING n would cost SQLite a temporary
  // table per row (measured: ten times the file writes of a correction).
  sql::Statement change_in_pass(
      db,
      "UPDATE " + counts + " SET n = count_after(?1, term_id, queue_id, n) "
      "WHERE term_id BETWEEN ?2 AND ?3 AND count_after(?1, term_id, queue_id, n) NOT IN (0, n)");
  sql::Statement upsert(db,
                        "INSERT INTO " + counts + "(term_id, queue_id, n) "
                        "SELECT term_id, queue_id, n FROM count_rows(?) WHERE true "
                        "ON CONFLICT(term_id, queue_id) DO UPDATE SET n = excluded.n");
  sql::Statement remove(db, "DELETE FROM " + counts + " WHERE term_id = ? AND queue_id = ?");
  sql::Statement drop_term(db,
                           "DELETE FROM " + terms_table + " WHERE id = ? AND NOT EXISTS "
                           "(SELECT 1 FROM " + counts + " WHERE term_id = ?)");
  for (const sql::Statement* st :
       {&find_term, &add_terms, &change_in_pass, &upsert, &remove, &drop_term}) {
    if (!st->ok()) return Status::IoError(path + ": " + st->error());
  }
  if (changes.empty()) return Status::Ok();

  // Per term, whether a change adds (the term may have to be made) and
  // whether one takes away; the terms changed, in byte order.
  std::vector<uint8_t> adds(terms.size(), 0), takes(terms.size(), 0);
  for (const CountChange& c : changes) (c.n > 0 ? adds : takes)[c.term] = 1;
  std::vector<uint32_t> order;
  for (uint32_t t = 0; t < terms.size(); ++t) {
    if (adds[t] || takes[t]) order.push_back(t);
  }
  if (!options.terms_sorted) {
    std::sort(order.begin(), order.end(),
              [&](uint32_t a, uint32_t b) { return terms[a] < terms[b]; });
  }

  // The largest term id (the vocabulary's size, give or take the ids of
  // terms that left) decides between a read per term and one pass over
  // the table, here and for the counts.
  int64_t largest_id = 0;
  {
    sql::Statement st(db, "SELECT IFNULL(MAX(id), 0) FROM " + terms_table);
    if (!st.ok() || st.Step() != SQLITE_ROW) return sql::ErrorStatus(db, path);
    largest_id = st.ColumnInt(0);
  }
  std::vector<int64_t> term_ids(terms.size(), 0);
  if (static_cast<int64_t>(order.size()) * 4 > largest_id) {
    // terms' index on text is in byte order (SQLite's BINARY collation is
    // memcmp, as std::string_view's <), the order of `order`: one merge.
    if (largest_id > 0) {
      sql::Statement scan(db,
                          "SELECT text, id FROM " + terms_table + " WHERE text >= ? ORDER BY text");
      if (!scan.ok()) return Status::IoError(path + ": " + scan.error());
      scan.Bind(1, terms[order[0]]);
      size_t j = 0;
      int rc = SQLITE_DONE;
      while (j < order.size() && (rc = scan.Step()) == SQLITE_ROW) {
        const std::string_view text = scan.ColumnText(0);
        while (j < order.size() && terms[order[j]] < text) ++j;
        if (j < order.size() && terms[order[j]] == text) term_ids[order[j++]] = scan.ColumnInt(1);
      }
      if (j < order.size() && rc != SQLITE_DONE) return sql::ErrorStatus(db, path);
    }
  } else {
    for (uint32_t t : order) {
      find_term.Bind(1, terms[t]);
      int rc = find_term.Step();
      if (rc == SQLITE_ROW) term_ids[t] = find_term.ColumnInt(0);
      find_term.Reset();
      if (rc != SQLITE_ROW && rc != SQLITE_DONE) return sql::ErrorStatus(db, path);
    }
  }
  // Terms not in the vocabulary yet join it, in byte order, by one
  // statement, with the ids SQLite would give them one by one (one above
  // the largest).
  {
    std::vector<TermRow> added;
    for (uint32_t t : order) {
      if (term_ids[t] != 0) continue;
      if (takes[t])
        return Status::Corruption(path + ": a learned term is missing from the vocabulary");
      term_ids[t] = largest_id + 1 + static_cast<int64_t>(added.size());
      added.push_back({term_ids[t], terms[t]});
    }
    if (!added.empty()) {
      BindTermRows(add_terms.handle(), 1, &added);
      if (Status s = add_terms.Run(); !s.ok()) return s;
      result->new_terms = static_cast<int64_t>(added.size());
    }
  }

  // The rows in key order (term id, queue id), with n the change, and the
  // term of each: two counting sorts, by queue id and then (stably) by the
  // place of the term in `order` sorted by id.
  std::sort(order.begin(), order.end(),
            [&](uint32_t a, uint32_t b) { return term_ids[a] < term_ids[b]; });
  std::vector<CountRow> rows(changes.size());
  std::vector<uint32_t> row_terms(changes.size());
  {
    std::vector<int64_t> queue_ids;
    for (const CountChange& c : changes) queue_ids.push_back(c.queue_id);
    std::sort(queue_ids.begin(), queue_ids.end());
    queue_ids.erase(std::unique(queue_ids.begin(), queue_ids.end()), queue_ids.end());
    auto queue_rank = [&](int64_t id) {
      return static_cast<size_t>(std::lower_bound(queue_ids.begin(), queue_ids.end(), id) -
                                 queue_ids.begin());
    };
    std::vector<size_t> by_queue(changes.size());
    {
      std::vector<size_t> next(queue_ids.size() + 1, 0);
      for (const CountChange& c : changes) ++next[queue_rank(c.queue_id) + 1];
      for (size_t q = 0; q < queue_ids.size(); ++q) next[q + 1] += next[q];
      for (size_t i = 0; i < changes.size(); ++i) by_queue[next[queue_rank(changes[i].queue_id)]++] = i;
    }
    std::vector<uint32_t> place(terms.size(), 0);  // of a term in `order`
    for (uint32_t p = 0; p < order.size(); ++p) place[order[p]] = p;
    std::vector<size_t> next(order.size() + 1, 0);
    for (const CountChange& c : changes) ++next[place[c.term] + 1];
    for (size_t p = 0; p < order.size(); ++p) next[p + 1] += next[p];
    for (size_t i : by_queue) {
      const CountChange& c = changes[i];
      const size_t at = next[place[c.term]]++;
      rows[at] = {term_ids[c.term], c.queue_id, c.n};
      row_terms[at] = c.term;
    }
  }
  std::vector<CountChange>().swap(changes);  // in rows now
  auto term_of = [&](size_t i) { return terms[row_terms[i]]; };

  // The counts of the rows, before and after. When the change touches a
  // large part of counts, one statement passes over it in key order and
  // changes what changes (count_rows.h, count_after): a pass costs about a
  // tenth of a statement per row. Otherwise each term's rows are read, and
  // the new counts written by one statement (count_rows). The rows left are
  // those that begin (inserted) and those that end (deleted).
  std::vector<int64_t> before(rows.size(), 0);
  std::vector<CountRow> written;  // the rows the second statement writes
  const std::vector<CountRow>* to_write = &written;
  const bool pass = static_cast<int64_t>(order.size()) * 4 > largest_id;
  if (pass && largest_id > 0) {
    std::vector<uint8_t> seen(rows.size(), 0);
    CountChanges pending{&rows, &before, &seen};
    BindCountChanges(change_in_pass.handle(), 1, &pending);
    change_in_pass.Bind(2, rows.front().term_id).Bind(3, std::min(rows.back().term_id, largest_id));
    if (Status s = change_in_pass.Run(); !s.ok()) return s;
    if (pending.negative >= 0) {
      const auto i = static_cast<size_t>(pending.negative);
      return Damaged(db, path, rows[i].queue_id, term_of(i));
    }
    for (size_t i = 0; i < rows.size(); ++i) {
      if (seen[i]) continue;
      if (rows[i].n < 0) return Damaged(db, path, rows[i].queue_id, term_of(i));
      written.push_back(rows[i]);
    }
  } else if (pass) {
    // No term had an id before: every row is new, its count the change.
    for (size_t i = 0; i < rows.size(); ++i) {
      if (rows[i].n < 0) return Damaged(db, path, rows[i].queue_id, term_of(i));
    }
    to_write = &rows;
  } else {
    if (Status s = ReadBefore(db, path, counts, rows, &before); !s.ok()) return s;
    for (size_t i = 0; i < rows.size(); ++i) {
      const int64_t after = before[i] + rows[i].n;
      if (after < 0) return Damaged(db, path, rows[i].queue_id, term_of(i));
      if (after > 0) written.push_back({rows[i].term_id, rows[i].queue_id, after});
    }
  }

  // The running sum's row digests are computed on a second thread while
  // the rest is written, and on this one too once it is: both take chunks
  // of rows, each into a sum of its own, added at the end.
  std::unordered_map<int64_t, std::string> queue_names;
  if (running) {
    if (Status s = ReadQueueNames(db, path, &queue_names); !s.ok()) return s;
  }
  std::atomic<size_t> next_chunk{0};
  auto hash_chunks = [&](CountsSum* sum) {
    constexpr size_t kChunk = 4096;
    for (size_t begin; (begin = next_chunk.fetch_add(kChunk)) < rows.size();) {
      const size_t end = std::min(begin + kChunk, rows.size());
      for (size_t i = begin; i < end; ++i) {
        const CountRow& r = rows[i];
        sum->Change(term_of(i), queue_names.at(r.queue_id), before[i], before[i] + r.n);
      }
    }
  };
  CountsSum second_sum;
  struct Joiner {
    std::thread thread;
    ~Joiner() {
      if (thread.joinable()) thread.join();
    }
  } hashing;
  if (running) hashing.thread = std::thread([&] { hash_chunks(&second_sum); });
  if (!to_write->empty()) {
    BindCountRows(upsert.handle(), 1, to_write);
    if (Status s = upsert.Run(); !s.ok()) return s;
  }
  // Rows that reach zero are deleted (one statement per row measured
  // faster than one DELETE ... IN (SELECT ... FROM count_rows(?)), which
  // SQLite runs through a temporary index); with drop_terms, a term that
  // lost a row leaves the vocabulary when it has no count left.
  bool emptied = false;  // a row of the current term was deleted
  for (size_t i = 0; i < rows.size(); ++i) {
    const CountRow& r = rows[i];
    if (before[i] + r.n == 0) {
      Status s = remove.Bind(1, r.term_id).Bind(2, r.queue_id).Run();
      if (!s.ok()) return s;
      emptied = true;
    }
    const bool last_of_term = i + 1 == rows.size() || rows[i + 1].term_id != r.term_id;
    if (last_of_term) {
      if (emptied && options.drop_terms) {
        Status s = drop_term.Bind(1, r.term_id).Bind(2, r.term_id).Run();
        if (!s.ok()) return s;
        result->dropped_terms += sqlite3_changes(db);
      }
      emptied = false;
    }
  }
  if (running) {
    CountsSum this_sum;
    hash_chunks(&this_sum);
    hashing.thread.join();
    running->Add(second_sum);
    running->Add(this_sum);
  }
  return Status::Ok();
}

}  // namespace chute
