// Copies of a whole store, taken and put back with SQLite's online backup
// API (sqlite3_backup_init/step/finish; SQLite documentation, "Online
// Backup API", https://sqlite.org/backup.html), so that other processes may
// keep routing and learning while a copy is made or put back.
#ifndef CHUTE_STORE_BACKUP_H_
#define CHUTE_STORE_BACKUP_H_

#include <cstdint>
#include <string>

#include "store/status.h"

namespace chute {

struct BackupResult {
  int64_t documents = 0;  // ledger entries in the copy
  int64_t queues = 0;
  int64_t bytes = 0;  // size of the copy
};

// Copies the store at db_path to `file`: one consistent snapshot of the
// store (one read transaction; writers in other processes go on, and what
// they commit meanwhile is not in the copy). The copy is written to a
// temporary file beside `file` (mode 0600), checked to be a chute store of
// the same schema (application_id, user_version, SQLite's quick_check),
// flushed to disk and then renamed over `file`, so that `file` is either
// absent, the old file, or the whole copy. Fails, changing nothing, when
// `file` exists and !replace, when it is the store itself, or when db_path
// is not a chute store.
Status BackupStore(const std::string& db_path, const std::string& file,
                   bool replace, BackupResult* result);

struct RestoreResult {
  bool created = false;          // db_path did not exist and was created
  int64_t documents_before = 0;  // ledger entries db_path held before
  int64_t documents = 0;         // ledger entries after the restore
  int64_t queues = 0;
  int64_t schema_of_copy =
      0;  // the copy's schema version (older ones are upgraded)
};

// Puts the copy `file` back as the store at db_path. `file` must be a chute
// store of a schema this chute understands that passes SQLite's quick_check;
// it is only read. When db_path exists it must be a chute store, and when it
// holds learned documents `replace` must be true (restoring discards them);
// the copy is then written INTO it with the backup API in one write
// transaction, so that routers running meanwhile see the old model, then the
// new one. When db_path does not exist it is created (mode 0600). An older
// schema is upgraded after the copy. Fails, changing nothing, when `file` is
// the store itself.
Status RestoreStore(const std::string& file, const std::string& db_path,
                    bool replace, RestoreResult* result);

}  // namespace chute

#endif  // CHUTE_STORE_BACKUP_H_
