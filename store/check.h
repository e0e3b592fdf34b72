// chute's integrity check of a store: SQLite's own checks plus the
// invariants chute keeps between its tables (schema.h describes them).
#ifndef CHUTE_STORE_CHECK_H_
#define CHUTE_STORE_CHECK_H_

#include <cstdint>
#include <string>
#include <vector>

#include "store/status.h"

namespace chute {

// One line of a check's outcome. `check` is one of the names below; `ok`
// says whether this line reports a passed check (one line per check, saying
// what was verified) or a finding (one line per thing found wrong, in plain
// words).
//
//   sqlite_integrity     PRAGMA integrity_check: the file's pages, indexes
//                        and constraints as SQLite sees them
//   foreign_keys         PRAGMA foreign_key_check: no row names a queue or
//                        term that does not exist (orphan rows)
//   settings             the model settings can be read and used; hand-set
//                        priors are in (0, 1) and sum to at most 1
//   queue_names          every queue name is valid (queue_name.h)
//   ledger_blobs         every ledger entry's term counts decode
//   ledger_text          every kept text (ledger.text) unpacks: a whole
//                        zstd frame whose content matches its size and
//                        checksum (text_codec.h)
//   ledger_tokens        each ledger entry's token count equals the sum of
//                        its term counts
//   counts_positive      no count row is zero or negative
//   vocabulary           no term without a count (|V| counts only terms
//                        with a non-zero count)
//   queue_totals         each queue's documents and tokens equal its ledger
//                        entries' number and summed tokens
//   counts_match_ledger  each count N(q, w) equals the sum over the queue's
//                        ledger entries in the model of their counts of w
//   history              every version header and snapshot decodes, the
//                        change log and snapshots name only documents the
//                        ledger holds, and replaying them gives the current
//                        model's documents, each in its queue
//   fingerprint          the fingerprint of the model (fingerprint.h)
//                        equals the one the newest version recorded
struct CheckLine {
  std::string check;
  bool ok = true;
  std::string detail;
};

struct CheckReport {
  std::vector<CheckLine> lines;  // in the order the checks ran
  int64_t documents = 0;         // ledger entries
  int64_t queues = 0;            // rows of the queues table
  int64_t terms = 0;             // rows of the terms table, |V| when consistent
  // True when no line is a finding.
  bool consistent() const;
};

// At most this many findings are listed per check; the rest are summed up
// in one more line ("... and N more").
inline constexpr int kMaxFindingsPerCheck = 20;

// Checks the store at path inside one read transaction (a consistent view
// while other processes learn). Opening is as for Store::Open (an older
// schema is upgraded first), but damaged settings are a finding, not an
// error. Returns an error only when the file cannot be checked at all (no
// such file, not a chute store, a newer schema, an I/O error); everything
// found wrong inside is in *report. Cost: reads every row of every table
// and decodes every ledger blob and kept text once; memory in the number of distinct
// (queue, term) pairs.
Status CheckStore(const std::string& path, CheckReport* report);

}  // namespace chute

#endif  // CHUTE_STORE_CHECK_H_
