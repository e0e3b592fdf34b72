// The store's schema and its numbered migrations.
//
// A chute store is one SQLite file. It is recognised by
// PRAGMA application_id = kApplicationId and carries its schema version in
// PRAGMA user_version. Tables (schema version 1):
//
//   settings  One row per model setting (key, value as text): the tokenizer
//             options and the model options fixed at `init`, plus the
//             version of chute that created the store.
//   queues    One row per queue: its name (validated, see queue_name.h),
//             the number of documents learned for it, N(q) (its total term
//             count), an optional prior set by hand, and when it was created.
//   terms     The vocabulary: one row per term with a non-zero count in some
//             queue (a term whose counts all reach zero is deleted, so the
//             row count is |V|).
//   counts    N(q, w) > 0, keyed (term_id, queue_id); no zero rows.
//   ledger    One row per learned document: the SHA-256 of its raw bytes
//             (lowercase hex), its queue, the source path, when it was
//             learned (RFC 3339, UTC), its number of term occurrences, and
//             its own term counts encoded in one blob (term_counts_codec.h),
//             so that it can be unlearned exactly.
//
// Schema version 2 adds:
//
//   ledger.in_model  1 when the document is counted in the current model;
//             0 when it is kept only for history (a rollback took it out,
//             or its queue was retired). Counts are the sum of the ledger
//             rows with in_model = 1.
//   ledger.text      the document's text, zstd-compressed, when the store
//             keeps text (setting keep_text); NULL otherwise or once purged.
//   queues.retired   when the queue was retired (RFC 3339), or NULL.
//   versions  One row per committed change of the model: id, time, command,
//             by, documents added / moved / removed, the model fingerprint
//             (fingerprint.h) and a header: the settings and the queues
//             (id, name, prior, retired) as they were after the change.
//   changes   The append-only change log: per version, each document
//             (ledger id) that entered the model (from_queue NULL), left it
//             (to_queue NULL) or moved between queues.
//   snapshots Every so many versions, the model's membership (ledger id,
//             queue id) encoded in one blob; a version's membership is the
//             nearest snapshot at or before it plus the changes after it.
//
// Schema version 3 adds (store_rebuild.cc, store_candidate.cc):
//
//   rebuild   At most one row: a recount under new settings in progress or
//             kept as a candidate: the version it started from, the target
//             settings (as a version header's "s" lines), when and by whom.
//   rebuild_docs  Per ledger document, its term counts recounted under the
//             rebuild's settings (same encoding as ledger.term_counts), and
//             the queue whose recounted counts include it (NULL: none).
//   rebuild_queues  Per queue, the documents and N(q) of the recount.
//             Beside them, while a recount exists, the tables rebuild_terms
//             and rebuild_counts, made by the rebuild with the definitions of
//             terms and counts (so not part of any migration): the
//             recounted vocabulary and N(q, w). The swap renames them to
//             terms and counts in one transaction; rebuild_counts always
//             equals the sum of the rebuild_docs rows with a counted_queue.
//   candidate At most one row: a model that `promote` may make current. Its
//             kind (rebuild or correct), the version it was made from, when
//             and by whom, a header like a version's (its settings and the
//             queues), its members (as a snapshot's blob), its own
//             corrections ("ledger_id from_queue to_queue" lines, oldest
//             first) and the figures of the last promotion the gate refused.
//
// Schema version 4 adds (store_decisions.cc, decision_log.h):
//
//   decisions One row per document routed into folders: its digest, where
//             it was found and where it was put (absolute paths), the
//             chosen queue (for a held document, the best guess), its
//             confidence, the runner-up and its posterior, why it was held
//             (NULL or threshold, no_terms, min_documents, audit), the model
//             version, time (RFC 3339 UTC), by whom, the delivery mode,
//             whether the delivery finished (0 while it is only intended),
//             the document's terms and how many the model did not know, and
//             the last review `correct --from-folders` learned from it.
//   unreadable Files chute could not read, by absolute path, with the size,
//             mtime and digest they had then, so that they are not retried
//             until they change; where --set-aside moved them.
//   queues.threshold, queues.min_documents  A queue's own routing rules.
//
// To change the schema: append a migration to kMigrations in schema.cc
// (never edit a released one), which bumps SchemaVersion().
// tests/store/schema_test.cc then builds a store of every older version,
// with data, and checks that Store::Open upgrades it; extend its checks to
// any table or column the migration adds.
#ifndef CHUTE_STORE_SCHEMA_H_
#define CHUTE_STORE_SCHEMA_H_

#include <sqlite3.h>

#include <cstdint>

#include "store/status.h"

namespace chute {

// "chut" in ASCII: tells a chute store from any other SQLite file.
inline constexpr int32_t kApplicationId = 0x63687574;

// The schema version this build writes: the number of migrations.
int SchemaVersion();

// Applies migrations (from the store's current user_version) up to
// `target`, each in its own transaction. REQUIRES: target <= SchemaVersion().
Status Migrate(sqlite3* db, int target);

}  // namespace chute

#endif  // CHUTE_STORE_SCHEMA_H_
