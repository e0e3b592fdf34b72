// The decision log: one row per document chute routed into folders (route
// --into, watch), what a reviewer later did with it, and the documents
// chute could not read (schema.h, version 4: decisions, unreadable).
//
// A delivery is logged in two steps so that a crash never loses track of a
// document: the decision with its intended destination is committed first
// (delivered = false), the file is moved, then the row is marked delivered.
// A later run finds the rows still undelivered (PendingDeliveries) and
// finishes or undoes them.
#ifndef CHUTE_STORE_DECISION_LOG_H_
#define CHUTE_STORE_DECISION_LOG_H_

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace chute {

// Why a document went to the review folder instead of its queue's folder.
// Written in the log as null (kNone) or the name HeldName gives.
enum class HeldReason {
  kNone,
  kThreshold,     // confidence below the threshold
  kNoTerms,       // no term known to the model: the prior alone decided
  kMinDocuments,  // its queue has fewer learned documents than its minimum
  kAudit,         // drawn for the audit sample (would have been routed)
};

// "" for kNone, else "threshold", "no_terms", "min_documents", "audit".
std::string_view HeldName(HeldReason reason);
// The reverse of HeldName; false for a word that is not one ("" is kNone).
bool ParseHeld(std::string_view name, HeldReason* out);

// How a document reaches its folder.
enum class DeliveryMode { kMove, kCopy, kLink };
// "move", "copy", "link".
std::string_view DeliveryModeName(DeliveryMode mode);
bool ParseDeliveryMode(std::string_view name, DeliveryMode* out);

// What a reviewer did with a delivered document, as `correct
// --from-folders` found it and learned it.
enum class ReviewKind {
  kNone,
  kMoved,  // a reviewer moved it into a queue folder (out of review, or
           // from the queue chute chose into another)
  kLeft,   // left in the folder chute chose for --confirm-after
};
std::string_view ReviewKindName(ReviewKind kind);  // "", "moved", "left"
bool ParseReviewKind(std::string_view name, ReviewKind* out);

struct DecisionRecord {
  int64_t id = 0;  // set by LogIntended
  // --- The fields `chute log` prints, in this order. ---
  std::string digest;       // SHA-256 of the document's bytes, lowercase hex
  std::string source;       // absolute path where the document was found
  std::string destination;  // absolute path it was (or is being) put at
  std::string queue;        // the chosen queue; for a held one, the best guess
  double confidence = 0;    // posterior of `queue`
  std::string runner_up;    // empty when the model has one queue
  std::optional<double> runner_up_posterior;
  HeldReason held = HeldReason::kNone;
  int64_t model_version = 0;
  std::string time;  // RFC 3339 UTC, when it was decided
  std::string by;
  // --- Kept for the other commands. ---
  DeliveryMode mode = DeliveryMode::kMove;
  bool delivered = false;     // false: intended, the delivery may be unfinished
  int64_t terms = 0;          // terms counted in the document
  int64_t unknown_terms = 0;  // of them, terms the model did not know
  // The last review `correct --from-folders` learned (kNone: none yet).
  ReviewKind review = ReviewKind::kNone;
  std::string reviewed_queue;  // the queue it was learned under
  std::string reviewed_path;   // where the file was then (absolute)
  std::string reviewed_at;     // RFC 3339 UTC
};

// Which rows ReadDecisions gives.
struct DecisionQuery {
  std::string since;  // RFC 3339 UTC as chute writes it; empty: all
  std::string queue;  // only decisions for this queue; empty: all
  bool delivered_only = true;
};

// A review `correct --from-folders` learns, written with the learning in
// one transaction.
struct ReviewMark {
  int64_t decision_id = 0;
  ReviewKind kind = ReviewKind::kMoved;
  std::string queue;  // learned under
  std::string path;   // where the file is now (absolute)
};

// A file chute could not read, remembered so that it is not retried until
// it changes.
struct UnreadableFile {
  std::string path;  // absolute
  int64_t size = 0;
  int64_t mtime_ns = 0;
  std::string digest;  // of its bytes when they could be read; else empty
  std::string reason;
  std::string first_seen;  // RFC 3339 UTC
  std::string set_aside;   // where --set-aside moved it (absolute), or empty
};

// A queue's routing rules (schema 4: queues.threshold, min_documents).
struct QueuePolicy {
  std::string name;
  int64_t documents = 0;  // learned documents in the model
  bool retired = false;
  std::optional<double> threshold;        // hold below this confidence
  std::optional<int64_t> min_documents;   // hold while documents < this
};

}  // namespace chute

#endif  // CHUTE_STORE_DECISION_LOG_H_
