// Opening a file as a chute store at the SQLite level, shared by Store,
// CheckStore and the backup functions. Only store/ includes it.
#ifndef CHUTE_STORE_STORE_FILE_H_
#define CHUTE_STORE_STORE_FILE_H_

#include <cstdint>
#include <string>

#include "store/sqlite.h"
#include "store/status.h"

namespace chute {

// Opens path read-write (it must exist and be a regular file), sets the busy
// timeout, and checks that it is a chute store (application_id) of a schema
// this chute understands (user_version <= SchemaVersion()). *version gets
// the store's schema version. Nothing is changed in the file. Fails with a
// one-line message that names the file: NotFound, Corruption for a file
// that is not a chute store, InvalidArgument for a newer schema.
Status OpenStoreFile(const std::string& path, sql::DbHandle* db,
                     int64_t* version);

// The connection settings every store connection applies: busy timeout,
// foreign keys on, synchronous FULL.
Status ConfigureStoreConnection(sqlite3* db);

// True when a and b name the same existing file (same device and inode).
bool SameFile(const std::string& a, const std::string& b);

}  // namespace chute

#endif  // CHUTE_STORE_STORE_FILE_H_
