#include "store/backup.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <cstring>
#include <filesystem>
#include <memory>
#include <thread>

#include "store/schema.h"
#include "store/sqlite.h"
#include "store/store.h"
#include "store/store_file.h"

namespace chute {

namespace {

struct BackupCloser {
  void operator()(sqlite3_backup* b) const { sqlite3_backup_finish(b); }
};

// Copies every page of `from` into `to` in one step (one read transaction
// on `from`, one write transaction on `to`). A lock held by another
// connection is waited for, up to kBusyTimeoutMs.
Status CopyPages(sqlite3* from, sqlite3* to, const std::string& what) {
  sqlite3_backup* raw = sqlite3_backup_init(to, "main", from, "main");
  if (raw == nullptr) return sql::ErrorStatus(to, what);
  std::unique_ptr<sqlite3_backup, BackupCloser> backup(raw);
  const auto deadline = std::chrono::steady_clock::now() +
                        std::chrono::milliseconds(kBusyTimeoutMs);
  for (;;) {
    int rc = sqlite3_backup_step(raw, -1);
    if (rc == SQLITE_DONE) break;
    if ((rc & 0xff) == SQLITE_BUSY || (rc & 0xff) == SQLITE_LOCKED) {
      if (std::chrono::steady_clock::now() > deadline) {
        return Status::Busy(what +
                            ": the store stayed locked; try again later");
      }
      std::this_thread::sleep_for(std::chrono::milliseconds(20));
      continue;
    }
    if (rc != SQLITE_OK) {
      return Status::IoError(what + ": " + sqlite3_errstr(rc));
    }
  }
  int rc = sqlite3_backup_finish(backup.release());
  if (rc != SQLITE_OK) return Status::IoError(what + ": " + sqlite3_errstr(rc));
  return Status::Ok();
}

Status QueryInt(sqlite3* db, const char* sql, int64_t* v) {
  sql::Statement st(db, sql);
  if (!st.ok() || st.Step() != SQLITE_ROW) return sql::ErrorStatus(db, sql);
  *v = st.ColumnInt(0);
  return Status::Ok();
}

// SQLite's quick_check: "ok", or the first problem it reports.
Status QuickCheck(sqlite3* db, const std::string& path) {
  sql::Statement st(db, "PRAGMA quick_check");
  if (!st.ok() || st.Step() != SQLITE_ROW) {
    return Status::Corruption(path + ": damaged (" + sqlite3_errmsg(db) + ")");
  }
  std::string first(st.ColumnText(0));
  if (first != "ok")
    return Status::Corruption(path + ": damaged (SQLite reports: " + first +
                              ")");
  return Status::Ok();
}

Status CountStore(sqlite3* db, int64_t* documents, int64_t* queues) {
  Status s = QueryInt(db, "SELECT COUNT(*) FROM ledger", documents);
  if (s.ok()) s = QueryInt(db, "SELECT COUNT(*) FROM queues", queues);
  return s;
}

void RemoveWithCompanions(const std::string& path) {
  for (const char* suffix : {"", "-wal", "-shm", "-journal"}) {
    ::unlink((path + suffix).c_str());
  }
}

Status SyncPath(const std::string& path, int flags) {
  int fd = ::open(path.c_str(), flags | O_CLOEXEC);
  if (fd < 0) return Status::IoError(path + ": " + std::strerror(errno));
  int rc = ::fsync(fd);
  ::close(fd);
  if (rc != 0)
    return Status::IoError(path + ": cannot flush: " + std::strerror(errno));
  return Status::Ok();
}

std::string FolderOf(const std::string& path) {
  std::string parent = std::filesystem::path(path).parent_path().string();
  return parent.empty() ? "." : parent;
}

}  // namespace

Status BackupStore(const std::string& db_path, const std::string& file,
                   bool replace, BackupResult* result) {
  *result = BackupResult();
  struct stat st;
  if (::stat(file.c_str(), &st) == 0) {
    if (SameFile(db_path, file)) {
      return Status::InvalidArgument(
          file + ": is the store itself; back up to another file");
    }
    if (!S_ISREG(st.st_mode)) {
      return Status::InvalidArgument(file +
                                     ": exists and is not a regular file");
    }
    if (!replace) {
      return Status::InvalidArgument(
          file + ": already exists; add --force to replace it");
    }
  }
  sql::DbHandle source;
  int64_t version = 0;
  Status s = OpenStoreFile(db_path, &source, &version);
  if (!s.ok()) return s;

  // The copy is made beside `file` (same file system, so the rename is
  // atomic), 0600 from its first instant (mkstemp).
  std::string temp = file + ".tmp-XXXXXX";
  int fd = ::mkstemp(temp.data());
  if (fd < 0)
    return Status::IoError(
        file + ": cannot create a file beside it: " + std::strerror(errno));
  ::close(fd);
  auto fail = [&](Status failed) {
    RemoveWithCompanions(temp);
    return failed;
  };
  {
    sqlite3* raw = nullptr;
    int rc =
        sqlite3_open_v2(temp.c_str(), &raw,
                        SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX, nullptr);
    sql::DbHandle copy(raw);
    if (rc != SQLITE_OK)
      return fail(
          Status::IoError(temp + ": cannot open: " + sqlite3_errstr(rc)));
    s = CopyPages(source.get(), copy.get(), db_path + ": backup");
    if (!s.ok()) return fail(s);
  }
  source.reset();
  {
    // Check the copy as a fresh reader would see it.
    sql::DbHandle copy;
    int64_t copy_version = 0;
    s = OpenStoreFile(temp, &copy, &copy_version);
    if (s.ok() && copy_version != version) {
      s = Status::Corruption(temp + ": the copy has schema version " +
                             std::to_string(copy_version) + ", the store " +
                             std::to_string(version));
    }
    if (s.ok()) s = QuickCheck(copy.get(), temp);
    if (s.ok()) s = CountStore(copy.get(), &result->documents, &result->queues);
    if (!s.ok())
      return fail(Status::Corruption(
          file + ": the copy failed its check: " + s.message()));
  }
  s = SyncPath(temp, O_RDONLY);
  if (!s.ok()) return fail(s);
  if (::rename(temp.c_str(), file.c_str()) != 0) {
    return fail(Status::IoError(
        file + ": cannot rename the copy into place: " + std::strerror(errno)));
  }
  RemoveWithCompanions(
      temp);  // only companions can be left; the copy is renamed
  s = SyncPath(FolderOf(file), O_RDONLY | O_DIRECTORY);
  if (!s.ok()) return s;
  if (::stat(file.c_str(), &st) == 0) result->bytes = st.st_size;
  return Status::Ok();
}

Status RestoreStore(const std::string& file, const std::string& db_path,
                    bool replace, RestoreResult* result) {
  *result = RestoreResult();
  sql::DbHandle source;
  Status s = OpenStoreFile(file, &source, &result->schema_of_copy);
  if (!s.ok()) return s;
  s = QuickCheck(source.get(), file);
  if (!s.ok()) return s;

  sql::DbHandle target;
  struct stat st;
  if (::stat(db_path.c_str(), &st) == 0) {
    if (SameFile(file, db_path)) {
      return Status::InvalidArgument(
          file + ": is the store itself; nothing to restore");
    }
    int64_t target_version = 0, queues = 0;
    s = OpenStoreFile(db_path, &target, &target_version);
    if (!s.ok()) return s;
    s = ConfigureStoreConnection(target.get());
    if (s.ok())
      s = CountStore(target.get(), &result->documents_before, &queues);
    if (!s.ok()) return Status::IoError(db_path + ": " + s.message());
    if (result->documents_before > 0 && !replace) {
      return Status::InvalidArgument(db_path + ": holds " +
                                     std::to_string(result->documents_before) +
                                     " learned documents that restoring " +
                                     file + " would replace; add --force");
    }
  } else if (errno == ENOENT) {
    int fd =
        ::open(db_path.c_str(), O_CREAT | O_EXCL | O_WRONLY | O_CLOEXEC, 0600);
    if (fd < 0)
      return Status::IoError(db_path +
                             ": cannot create: " + std::strerror(errno));
    ::close(fd);
    result->created = true;
    sqlite3* raw = nullptr;
    int rc =
        sqlite3_open_v2(db_path.c_str(), &raw,
                        SQLITE_OPEN_READWRITE | SQLITE_OPEN_NOMUTEX, nullptr);
    target.reset(raw);
    if (rc == SQLITE_OK) sqlite3_busy_timeout(raw, kBusyTimeoutMs);
    if (rc != SQLITE_OK) {
      target.reset();
      RemoveWithCompanions(db_path);
      return Status::IoError(db_path + ": cannot open: " + sqlite3_errstr(rc));
    }
  } else {
    return Status::IoError(db_path + ": " + std::strerror(errno));
  }

  s = CopyPages(source.get(), target.get(), db_path + ": restore from " + file);
  // The store stays in WAL mode (readers never block the writer).
  if (s.ok()) s = sql::Exec(target.get(), "PRAGMA journal_mode = WAL");
  target.reset();
  source.reset();
  if (!s.ok()) {
    if (result->created) RemoveWithCompanions(db_path);
    return s;
  }
  // Open as every command does: this upgrades an older schema.
  std::unique_ptr<Store> store;
  s = Store::Open(db_path, &store);
  if (!s.ok()) return s;
  std::vector<QueueInfo> queues;
  s = store->ListQueues(&queues);
  if (!s.ok()) return s;
  result->queues = static_cast<int64_t>(queues.size());
  for (const QueueInfo& q : queues) result->documents += q.documents;
  return Status::Ok();
}

}  // namespace chute
