// Recounting the ledger under new settings, from the documents' kept text:
// `chute rebuild` (and the candidate it may leave), and the recount a
// promotion of such a candidate swaps in. The SQL is in
// store/store_rebuild.cc; this module reads, tokenizes in parallel and
// orders the steps.
#ifndef CHUTE_CLI_RECOUNT_H_
#define CHUTE_CLI_RECOUNT_H_

#include <cstddef>
#include <cstdint>
#include <string>

#include "cli/format/json_writer.h"
#include "store/store.h"
#include "tokenize/tokenizer.h"

namespace chute {

// Documents recounted per transaction of the side tables: a few thousand,
// so that each transaction is short and the texts in memory stay small.
inline constexpr size_t kRecountBatch = 2000;

struct RebuildRequest {
  StoreSettings target;    // the settings to recount with
  bool candidate = false;  // stop before the swap, leaving a candidate
  size_t threads = 1;      // tokenizing threads (REQUIRES: >= 1)
  ChangeInfo change;
  size_t batch = kRecountBatch;  // REQUIRES: >= 1
};

struct RebuildOutcome {
  bool tokenizing_changed = false;
  int64_t recounted = 0;  // documents recounted before the swap
  int64_t batches = 0;    // transactions that wrote them
  bool replaced_candidate = false;
  SwapResult swap;          // with a swap
  double swap_seconds = 0;  // how long the swap's transaction took
  VersionInfo made;         // the version recorded (not for a candidate)
};

// Runs a rebuild: with the store's tokenizing settings, only the settings
// change (a new version, or a candidate); with others, every ledger
// document (in the model or not) is recounted from its kept text in
// batches beside the current counts, documents learned meanwhile are
// recounted too, and the recount is swapped in (or kept for a candidate).
// Fails with InvalidArgument, changing nothing, when tokenizing changes and
// some documents have no kept text, and when a document would have no term
// under the new settings.
Status Rebuild(Store* store, const RebuildRequest& request,
               RebuildOutcome* out);

// Recounts, with the recount's settings, the ledger documents learned since
// the recount was written (a candidate's recount falls behind the store).
Status CatchUpRecount(Store* store, size_t threads);

// Rollback to version v when a rebuild changed the tokenizing settings
// since (Store::Rollback refuses that): every ledger document is recounted
// with v's settings from its kept text, beside the current model, then the
// recount is swapped in and the model made v's in one transaction, as one
// version "rollback". Replaces any candidate. Fails with InvalidArgument,
// changing nothing, when some documents have no kept text.
Status RollbackAcrossTokenizing(Store* store, int64_t v,
                                const ChangeInfo& change, size_t threads,
                                RollbackResult* result);

// The counts of version v's model when its tokenizing settings are not the
// store's: its members recounted in memory from their kept texts with v's
// settings (read-only; for route --at-version). InvalidArgument naming how
// many members have no kept text.
Status RecountedModelAtVersion(Store* store, int64_t v, size_t threads,
                               VersionInfo* info, StoreSettings* settings,
                               ModelCounts* out);

// One document's term counts under tokenizer: terms sorted by bytes with
// their counts. InvalidArgument when the text gives no term.
Status RecountText(Tokenizer* tokenizer, const std::string& text,
                   RecountedDocument* doc);

// The settings as a JSON object, for a version's details:
// {"alpha":1,"prior":"learned","bigrams":"off",...}; WriteSettings writes it
// as the next value of w.
std::string SettingsJson(const StoreSettings& settings);
void WriteSettings(const StoreSettings& settings, JsonWriter* w);

}  // namespace chute

#endif  // CHUTE_CLI_RECOUNT_H_
