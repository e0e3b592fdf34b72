#include "store/count_rows.h"

#include <algorithm>
#include <cstddef>
#include <new>
#include <utility>
#include <string>

namespace chute {

namespace {

// A table over a std::vector<Row> bound as its hidden last column (the
// pointer type named Traits::kPointerType); Traits says the columns.
template <typename Traits>
struct RowsTable {
  using Row = typename Traits::Row;

  struct Cursor {
    sqlite3_vtab_cursor base;  // first, as SQLite requires
    const std::vector<Row>* rows = nullptr;
    size_t at = 0;
  };

  static int Connect(sqlite3* db, void*, int, const char* const*, sqlite3_vtab** out, char**) {
    int rc = sqlite3_declare_vtab(db, Traits::kSchema);
    if (rc != SQLITE_OK) return rc;
    auto* vtab = new (std::nothrow) sqlite3_vtab();
    if (vtab == nullptr) return SQLITE_NOMEM;
    *out = vtab;
    sqlite3_vtab_config(db, SQLITE_VTAB_INNOCUOUS);
    return SQLITE_OK;
  }

  static int Disconnect(sqlite3_vtab* vtab) {
    delete vtab;
    return SQLITE_OK;
  }

  // Usable only with its argument: name(?).
  static int BestIndex(sqlite3_vtab*, sqlite3_index_info* info) {
    for (int i = 0; i < info->nConstraint; ++i) {
      const auto& c = info->aConstraint[i];
      if (c.iColumn == Traits::kRowsColumn && c.op == SQLITE_INDEX_CONSTRAINT_EQ) {
        if (!c.usable) return SQLITE_CONSTRAINT;
        info->aConstraintUsage[i].argvIndex = 1;
        info->aConstraintUsage[i].omit = 1;
        info->idxNum = 1;
        info->estimatedCost = 1;
        info->estimatedRows = 1000;
        return SQLITE_OK;
      }
    }
    return SQLITE_CONSTRAINT;
  }

  static int Open(sqlite3_vtab*, sqlite3_vtab_cursor** out) {
    auto* cursor = new (std::nothrow) Cursor();
    if (cursor == nullptr) return SQLITE_NOMEM;
    *out = &cursor->base;
    return SQLITE_OK;
  }

  static int Close(sqlite3_vtab_cursor* base) {
    delete reinterpret_cast<Cursor*>(base);
    return SQLITE_OK;
  }

  static int Filter(sqlite3_vtab_cursor* base, int idx_num, const char*, int argc,
                    sqlite3_value** argv) {
    auto* cursor = reinterpret_cast<Cursor*>(base);
    cursor->at = 0;
    cursor->rows = idx_num == 1 && argc == 1
                       ? static_cast<const std::vector<Row>*>(
                             sqlite3_value_pointer(argv[0], Traits::kPointerType))
                       : nullptr;
    return SQLITE_OK;
  }

  static int Next(sqlite3_vtab_cursor* base) {
    ++reinterpret_cast<Cursor*>(base)->at;
    return SQLITE_OK;
  }

  static int Eof(sqlite3_vtab_cursor* base) {
    const auto* cursor = reinterpret_cast<Cursor*>(base);
    return cursor->rows == nullptr || cursor->at >= cursor->rows->size();
  }

  static int ColumnValue(sqlite3_vtab_cursor* base, sqlite3_context* ctx, int column) {
    const auto* cursor = reinterpret_cast<Cursor*>(base);
    Traits::Result(ctx, (*cursor->rows)[cursor->at], column);
    return SQLITE_OK;
  }

  static int RowId(sqlite3_vtab_cursor* base, sqlite3_int64* out) {
    *out = static_cast<sqlite3_int64>(reinterpret_cast<Cursor*>(base)->at);
    return SQLITE_OK;
  }

  static sqlite3_module Module() {
    sqlite3_module m{};
    m.iVersion = 0;
    m.xCreate = nullptr;  // eponymous only: no CREATE VIRTUAL TABLE
    m.xConnect = Connect;
    m.xBestIndex = BestIndex;
    m.xDisconnect = Disconnect;
    m.xDestroy = Disconnect;
    m.xOpen = Open;
    m.xClose = Close;
    m.xFilter = Filter;
    m.xNext = Next;
    m.xEof = Eof;
    m.xColumn = ColumnValue;
    m.xRowid = RowId;
    return m;
  }
};

struct CountRowsTraits {
  using Row = CountRow;
  static constexpr char kSchema[] =
      "CREATE TABLE x(term_id INTEGER, queue_id INTEGER, n INTEGER, rows HIDDEN)";
  static constexpr char kPointerType[] = "chute-count-rows";
  static constexpr int kRowsColumn = 3;
  static void Result(sqlite3_context* ctx, const CountRow& row, int column) {
    switch (column) {
      case 0:
        sqlite3_result_int64(ctx, row.term_id);
        break;
      case 1:
        sqlite3_result_int64(ctx, row.queue_id);
        break;
      case 2:
        sqlite3_result_int64(ctx, row.n);
        break;
      default:
        sqlite3_result_null(ctx);
    }
  }
};

struct TermRowsTraits {
  using Row = TermRow;
  static constexpr char kSchema[] = "CREATE TABLE x(id INTEGER, text TEXT, rows HIDDEN)";
  static constexpr char kPointerType[] = "chute-term-rows";
  static constexpr int kRowsColumn = 2;
  static void Result(sqlite3_context* ctx, const TermRow& row, int column) {
    switch (column) {
      case 0:
        sqlite3_result_int64(ctx, row.id);
        break;
      case 1:
        // The vector and the bytes it views outlive the statement's run.
        sqlite3_result_text(ctx, row.text.data(), static_cast<int>(row.text.size()),
                            SQLITE_STATIC);
        break;
      default:
        sqlite3_result_null(ctx);
    }
  }
};

constexpr char kChangesType[] = "chute-count-changes";

bool KeyLess(const CountRow& a, int64_t term_id, int64_t queue_id) {
  return a.term_id != term_id ? a.term_id < term_id : a.queue_id < queue_id;
}

// count_after(changes, term_id, queue_id, n); see CountChanges.
void CountAfter(sqlite3_context* ctx, int argc, sqlite3_value** argv) {
  auto* c = argc == 4 ? static_cast<CountChanges*>(sqlite3_value_pointer(argv[0], kChangesType))
                      : nullptr;
  if (c == nullptr || c->deltas == nullptr) {
    sqlite3_result_error(ctx, "count_after: no changes bound", -1);
    return;
  }
  const int64_t term_id = sqlite3_value_int64(argv[1]);
  const int64_t queue_id = sqlite3_value_int64(argv[2]);
  const int64_t n = sqlite3_value_int64(argv[3]);
  const std::vector<CountRow>& d = *c->deltas;
  size_t i = c->at;
  if (i >= d.size() || KeyLess(d[i], term_id, queue_id)) {
    // Forward, as a pass in key order goes: a few steps at most, else a
    // binary search.
    size_t steps = 0;
    while (i < d.size() && KeyLess(d[i], term_id, queue_id) && steps < 8) ++i, ++steps;
    if (i < d.size() && KeyLess(d[i], term_id, queue_id)) {
      i = static_cast<size_t>(std::lower_bound(d.begin() + static_cast<std::ptrdiff_t>(i), d.end(),
                                               std::make_pair(term_id, queue_id),
                                               [](const CountRow& r, const auto& key) {
                                                 return KeyLess(r, key.first, key.second);
                                               }) -
                              d.begin());
    }
  } else if (d[i].term_id != term_id || d[i].queue_id != queue_id) {
    // Behind the last row found (not a pass in key order): search from the start.
    i = static_cast<size_t>(std::lower_bound(d.begin(), d.begin() + static_cast<std::ptrdiff_t>(i),
                                             std::make_pair(term_id, queue_id),
                                             [](const CountRow& r, const auto& key) {
                                               return KeyLess(r, key.first, key.second);
                                             }) -
                            d.begin());
  }
  c->at = i;
  if (i >= d.size() || d[i].term_id != term_id || d[i].queue_id != queue_id) {
    sqlite3_result_int64(ctx, n);
    return;
  }
  (*c->before)[i] = n;
  (*c->seen)[i] = 1;
  if (n + d[i].n < 0) {
    if (c->negative < 0) c->negative = static_cast<int64_t>(i);
    sqlite3_result_int64(ctx, n);
    return;
  }
  sqlite3_result_int64(ctx, n + d[i].n);
}

const sqlite3_module kCountRows = RowsTable<CountRowsTraits>::Module();
const sqlite3_module kTermRows = RowsTable<TermRowsTraits>::Module();

}  // namespace

Status RegisterCountRows(sqlite3* db) {
  int rc = sqlite3_create_module(db, "count_rows", &kCountRows, nullptr);
  if (rc == SQLITE_OK) rc = sqlite3_create_module(db, "term_rows", &kTermRows, nullptr);
  if (rc == SQLITE_OK) {
    rc = sqlite3_create_function_v2(db, "count_after", 4, SQLITE_UTF8 | SQLITE_DIRECTONLY,
                                    nullptr, CountAfter, nullptr, nullptr, nullptr);
  }
  if (rc != SQLITE_OK)
    return Status::IoError(std::string("registering count_rows: ") + sqlite3_errmsg(db));
  return Status::Ok();
}

int BindCountChanges(sqlite3_stmt* stmt, int i, CountChanges* changes) {
  return sqlite3_bind_pointer(stmt, i, changes, kChangesType, nullptr);
}

int BindCountRows(sqlite3_stmt* stmt, int i, const std::vector<CountRow>* rows) {
  return sqlite3_bind_pointer(stmt, i, const_cast<std::vector<CountRow>*>(rows),
                              CountRowsTraits::kPointerType, nullptr);
}

int BindTermRows(sqlite3_stmt* stmt, int i, const std::vector<TermRow>* rows) {
  return sqlite3_bind_pointer(stmt, i, const_cast<std::vector<TermRow>*>(rows),
                              TermRowsTraits::kPointerType, nullptr);
}

}  // namespace chute
