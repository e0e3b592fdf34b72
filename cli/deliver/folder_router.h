// Routing documents into queue folders: the work behind `route --into` and
// `watch`. Reads, tokenizes and scores documents (in parallel, as route
// does), decides which go to review (held) and which are drawn for the
// audit sample, logs each decision with its intended destination, delivers
// the files (file_delivery.h) and marks them delivered.
//
// Held (DEST/_review/, the best guess recorded), in this order of reasons:
// no known terms; the queue has fewer learned documents than its minimum;
// confidence below the threshold (--hold-below, else the queue's own
// threshold). Of the documents that would be routed automatically, a share
// (--audit-share, drawn per document from --audit-seed and its digest, so a
// rerun draws the same) goes to DEST/_review/ as "audit".
// Unreadable documents stay where they are and are remembered by path,
// size, mtime and digest until they change (reported once); with
// set_aside they are moved to DEST/_unreadable/.
#ifndef CHUTE_CLI_DELIVER_FOLDER_ROUTER_H_
#define CHUTE_CLI_DELIVER_FOLDER_ROUTER_H_

#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "cli/read/document_reader.h"
#include "cli/read/input_walker.h"
#include "store/decision_log.h"
#include "store/status.h"
#include "store/store.h"

namespace chute {

// chute's own folders below DEST (queue names never begin with '_').
inline constexpr const char* kReviewFolder = "_review";
inline constexpr const char* kUnreadableFolder = "_unreadable";

struct FolderRouteOptions {
  std::string into;  // DEST, created when missing
  DeliveryMode mode = DeliveryMode::kMove;
  bool again = false;      // --copy/--link: deliver documents delivered before
  bool dry_run = false;    // decide and report; log and move nothing
  bool set_aside = false;  // move unreadable documents to DEST/_unreadable
  std::optional<double> hold_below;  // overrides every queue's threshold
  double audit_share = 0;            // 0 <= share <= 1
  uint64_t audit_seed = 0;
  std::string by;
  size_t threads = 1;
  int64_t max_bytes = kDefaultMaxBytes;  // larger documents are unreadable
};

// What happened to one input.
struct RoutedDocument {
  enum class Outcome {
    kDelivered,     // record describes the decision (destination final)
    kWouldDeliver,  // dry run: record as it would be logged
    kSkipped,       // --copy/--link: delivered before; or unreadable before
                    // and unchanged since (not read again, not reported
                    // again); the reason says which
    kUnreadable,    // reason; record.destination set when set aside
    kFailed,        // could not be delivered (reason); the file is untouched
  };
  Outcome outcome = Outcome::kDelivered;
  std::string path;  // as given
  DecisionRecord record;
  std::string reason;
};

struct FolderRouteTally {
  int64_t delivered = 0, held = 0, audit = 0, skipped = 0, unreadable = 0, failed = 0;
  int64_t finished_pending = 0;  // deliveries of an earlier run finished
};

class FolderRouter {
 public:
  // Loads the current model and the queues' rules, prepares DEST, finishes
  // the deliveries an earlier run left unfinished (PendingDeliveries ->
  // FinishPending) and removes its temporary files. Each pending delivery
  // is given to report (when set): kDelivered once finished (the reason
  // says it was an earlier run's), kFailed when the document was found in
  // neither place (its row is dropped) or could not be finished (its row
  // stays for the next run). A dry run finishes nothing.
  static Status Open(Store* store, const FolderRouteOptions& options,
                     std::unique_ptr<FolderRouter>* out, FolderRouteTally* tally,
                     const std::function<void(const RoutedDocument&)>& report = {});

  // Loads the model again when the store has a newer version; *reloaded
  // says whether it did. Cheap when nothing changed (one short read).
  Status ReloadIfChanged(bool* reloaded);

  // Routes files in order, calling report for each as soon as it is done
  // (in input order). Fails only when the store fails (a document that
  // cannot be read or delivered is an outcome, not a failure). Documents
  // are delivered in batches (512; for tests, the environment variable
  // CHUTE_TEST_DELIVERY_BATCH sets the size) on a thread of their own
  // while the next batch is read and decided: report is called on that
  // thread, never two calls at once, and every call has returned when
  // Route returns.
  Status Route(const std::vector<InputFile>& files,
               const std::function<void(const RoutedDocument&)>& report,
               FolderRouteTally* tally);

  int64_t model_version() const;
  const std::string& fingerprint() const;
  // DEST, absolute and symlink-free (as the log records destinations).
  const std::string& root() const;

  ~FolderRouter();

 private:
  FolderRouter();
  struct State;
  std::unique_ptr<State> state_;
};

}  // namespace chute

#endif  // CHUTE_CLI_DELIVER_FOLDER_ROUTER_H_
