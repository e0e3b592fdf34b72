#include "store/store_file.h"

#include <sys/stat.h>

#include <cerrno>
#include <cstring>

#include "store/count_rows.h"
#include "store/schema.h"
#include "store/store.h"

namespace chute {

namespace {

Status PragmaInt(sqlite3* db, const char* pragma, int64_t* v) {
  sql::Statement st(db, pragma);
  if (!st.ok() || st.Step() != SQLITE_ROW) return sql::ErrorStatus(db, pragma);
  *v = st.ColumnInt(0);
  return Status::Ok();
}

}  // namespace

Status ConfigureStoreConnection(sqlite3* db) {
  sqlite3_busy_timeout(db, kBusyTimeoutMs);
  for (const char* pragma :
       {"PRAGMA foreign_keys = ON", "PRAGMA synchronous = FULL"}) {
    Status s = sql::Exec(db, pragma);
    if (!s.ok()) return s;
  }
  return RegisterCountRows(db);
}

Status OpenStoreFile(const std::string& path, sql::DbHandle* db,
                     int64_t* version) {
  struct stat st;
  if (::stat(path.c_str(), &st) != 0) {
    if (errno == ENOENT) {
      return Status::NotFound(
          path + ": no chute store here (create one with 'chute init')");
    }
    return Status::IoError(path + ": " + std::strerror(errno));
  }
  if (!S_ISREG(st.st_mode)) {
    return Status::InvalidArgument(path +
                                   ": not a chute store (not a regular file)");
  }
  sqlite3* raw = nullptr;
  // One connection per thread (a Store is not shared), so SQLite's own
  // mutexes are not needed.
  int rc = sqlite3_open_v2(
      path.c_str(), &raw, SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX, nullptr);
  db->reset(raw);
  if (rc != SQLITE_OK) {
    return Status::IoError(path + ": cannot open: " +
                           (raw ? sqlite3_errmsg(raw) : sqlite3_errstr(rc)));
  }
  sqlite3_extended_result_codes(raw, 1);
  sqlite3_busy_timeout(raw, kBusyTimeoutMs);
  int64_t app_id = 0;
  Status s = PragmaInt(raw, "PRAGMA application_id", &app_id);
  if (s.ok()) s = PragmaInt(raw, "PRAGMA user_version", version);
  if (!s.ok()) {
    if (s.code() == Status::Code::kCorruption) {
      return Status::Corruption(
          path + ": not a chute store (not an SQLite database, or damaged)");
    }
    return Status::IoError(path + ": " + s.message());
  }
  if (app_id != kApplicationId) {
    return Status::Corruption(
        path + ": not a chute store (an SQLite file of another program)");
  }
  if (*version > SchemaVersion()) {
    return Status::InvalidArgument(
        path + ": store has schema version " + std::to_string(*version) +
        ", newer than this chute understands (" +
        std::to_string(SchemaVersion()) + "); use a newer chute");
  }
  return Status::Ok();
}

bool SameFile(const std::string& a, const std::string& b) {
  struct stat sa, sb;
  return ::stat(a.c_str(), &sa) == 0 && ::stat(b.c_str(), &sb) == 0 &&
         sa.st_dev == sb.st_dev && sa.st_ino == sb.st_ino;
}

}  // namespace chute
