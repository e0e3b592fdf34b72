#include "store/schema.h"

#include <iterator>
#include <string>

#include "store/sqlite.h"

namespace chute {

namespace {

// Migration i (1-based) brings a store from version i-1 to version i.
// Released migrations are never edited; add new ones at the end.
constexpr const char* kMigrations[] = {
    // 1: the model and its ledger.
    R"sql(
CREATE TABLE settings (
  key   TEXT PRIMARY KEY,
  value TEXT NOT NULL
) WITHOUT ROWID;
CREATE TABLE queues (
  id        INTEGER PRIMARY KEY,
  name      TEXT NOT NULL UNIQUE,
  documents INTEGER NOT NULL DEFAULT 0 CHECK (documents >= 0),
  tokens    INTEGER NOT NULL DEFAULT 0 CHECK (tokens >= 0),
  set_prior REAL CHECK (set_prior IS NULL OR (set_prior > 0 AND set_prior < 1)),
  created   TEXT NOT NULL
);
CREATE TABLE terms (
  id   INTEGER PRIMARY KEY,
  text TEXT NOT NULL UNIQUE
);
CREATE TABLE counts (
  term_id  INTEGER NOT NULL REFERENCES terms(id),
  queue_id INTEGER NOT NULL REFERENCES queues(id),
  n        INTEGER NOT NULL CHECK (n > 0),
  PRIMARY KEY (term_id, queue_id)
) WITHOUT ROWID;
CREATE TABLE ledger (
  id          INTEGER PRIMARY KEY,
  digest      TEXT NOT NULL UNIQUE,
  queue_id    INTEGER NOT NULL REFERENCES queues(id),
  source      TEXT,
  learned_at  TEXT NOT NULL,
  tokens      INTEGER NOT NULL CHECK (tokens > 0),
  term_counts BLOB NOT NULL
);
CREATE INDEX ledger_by_queue ON ledger(queue_id);
)sql",
    // 2: versions (a change log with snapshots), kept text, retired queues.
    R"sql(
ALTER TABLE ledger ADD COLUMN in_model INTEGER NOT NULL DEFAULT 1
  CHECK (in_model IN (0, 1));
ALTER TABLE ledger ADD COLUMN text BLOB;
CREATE INDEX ledger_by_source ON ledger(source);
ALTER TABLE queues ADD COLUMN retired TEXT;
INSERT OR IGNORE INTO settings(key, value) VALUES('keep_text', 'on');
CREATE TABLE versions (
  id          INTEGER PRIMARY KEY,
  time        TEXT NOT NULL,
  command     TEXT NOT NULL,
  by          TEXT NOT NULL,
  added       INTEGER NOT NULL CHECK (added >= 0),
  moved       INTEGER NOT NULL CHECK (moved >= 0),
  removed     INTEGER NOT NULL CHECK (removed >= 0),
  fingerprint TEXT NOT NULL,
  header      TEXT NOT NULL,
  details     TEXT
);
CREATE TABLE changes (
  version    INTEGER NOT NULL REFERENCES versions(id) ON DELETE CASCADE,
  document   INTEGER NOT NULL,
  from_queue INTEGER,
  to_queue   INTEGER,
  CHECK (from_queue IS NOT NULL OR to_queue IS NOT NULL)
);
CREATE INDEX changes_by_version ON changes(version);
CREATE INDEX changes_by_document ON changes(document);
CREATE TABLE snapshots (
  version INTEGER PRIMARY KEY REFERENCES versions(id) ON DELETE CASCADE,
  members BLOB NOT NULL
);
)sql",
    // 3: a rebuild's recount beside the current counts, and the candidate.
    R"sql(
CREATE TABLE rebuild (
  id           INTEGER PRIMARY KEY CHECK (id = 1),
  base_version INTEGER NOT NULL,
  settings     TEXT NOT NULL,
  started      TEXT NOT NULL,
  by           TEXT NOT NULL
);
CREATE TABLE rebuild_docs (
  ledger_id     INTEGER PRIMARY KEY,
  counted_queue INTEGER,
  tokens        INTEGER NOT NULL CHECK (tokens > 0),
  term_counts   BLOB NOT NULL
);
CREATE TABLE rebuild_queues (
  queue_id  INTEGER PRIMARY KEY,
  documents INTEGER NOT NULL CHECK (documents >= 0),
  tokens    INTEGER NOT NULL CHECK (tokens >= 0)
);
CREATE TABLE candidate (
  id           INTEGER PRIMARY KEY CHECK (id = 1),
  kind         TEXT NOT NULL CHECK (kind IN ('rebuild', 'correct')),
  base_version INTEGER NOT NULL,
  made         TEXT NOT NULL,
  by           TEXT NOT NULL,
  header       TEXT NOT NULL,
  members      BLOB NOT NULL,
  moves        TEXT NOT NULL,
  details      TEXT
);
)sql",
    // 4: the decision log of routing into folders, unreadable files, and
    // each queue's routing rules.
    R"sql(
CREATE TABLE decisions (
  id                  INTEGER PRIMARY KEY,
  digest              TEXT NOT NULL,
  source              TEXT NOT NULL,
  destination         TEXT NOT NULL,
  queue               TEXT NOT NULL,
  confidence          REAL NOT NULL,
  runner_up           TEXT,
  runner_up_posterior REAL,
  held                TEXT CHECK (held IS NULL OR
                        held IN ('threshold', 'no_terms', 'min_documents', 'audit')),
  model_version       INTEGER NOT NULL,
  time                TEXT NOT NULL,
  by                  TEXT NOT NULL,
  mode                TEXT NOT NULL CHECK (mode IN ('move', 'copy', 'link')),
  delivered           INTEGER NOT NULL DEFAULT 0 CHECK (delivered IN (0, 1)),
  terms               INTEGER NOT NULL DEFAULT 0 CHECK (terms >= 0),
  unknown_terms       INTEGER NOT NULL DEFAULT 0 CHECK (unknown_terms >= 0),
  review              TEXT CHECK (review IS NULL OR review IN ('moved', 'left')),
  reviewed_queue      TEXT,
  reviewed_path       TEXT,
  reviewed_at         TEXT
);
CREATE INDEX decisions_by_digest ON decisions(digest);
CREATE INDEX decisions_by_time ON decisions(time);
CREATE INDEX decisions_undelivered ON decisions(id) WHERE delivered = 0;
CREATE TABLE unreadable (
  path       TEXT PRIMARY KEY,
  size       INTEGER NOT NULL,
  mtime_ns   INTEGER NOT NULL,
  digest     TEXT,
  reason     TEXT NOT NULL,
  first_seen TEXT NOT NULL,
  set_aside  TEXT
) WITHOUT ROWID;
ALTER TABLE queues ADD COLUMN threshold REAL
  CHECK (threshold IS NULL OR (threshold > 0 AND threshold <= 1));
ALTER TABLE queues ADD COLUMN min_documents INTEGER
  CHECK (min_documents IS NULL OR min_documents >= 0);
)sql",
};

int UserVersion(sqlite3* db) {
  sql::Statement st(db, "PRAGMA user_version");
  return st.ok() && st.Step() == SQLITE_ROW ? static_cast<int>(st.ColumnInt(0))
                                            : -1;
}

}  // namespace

int SchemaVersion() { return static_cast<int>(std::size(kMigrations)); }

Status Migrate(sqlite3* db, int target) {
  for (int v = UserVersion(db); v < target; ++v) {
    sql::Transaction tx(db);
    if (!tx.status().ok()) return tx.status();
    Status s = sql::Exec(db, kMigrations[v]);
    if (!s.ok()) return s;
    std::string bump = "PRAGMA user_version = " + std::to_string(v + 1);
    s = sql::Exec(db, bump.c_str());
    if (!s.ok()) return s;
    if (v == 0) {
      std::string app = "PRAGMA application_id = " + std::to_string(kApplicationId);
      s = sql::Exec(db, app.c_str());
      if (!s.ok()) return s;
    }
    s = tx.Commit();
    if (!s.ok()) return s;
  }
  return Status::Ok();
}

}  // namespace chute
