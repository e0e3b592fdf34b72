// What reviewers did in the destination folders, found for `chute correct
// --from-folders DEST`: documents chute delivered (the decision log) that
// now sit in another queue's folder, documents taken out of the review
// folder, and (with a cutoff) documents left where chute put them. Plans
// the learning; the command makes it one transaction (Store::LearnReviewed).
//
// Folders scanned: DEST's queue folders (names not beginning with '_' or
// '.') and DEST/_review, each one level deep (files directly inside;
// subfolders and names beginning with '.' are skipped; symbolic links are
// not followed). A decision's document is looked for at its last known
// place (where the last learned review found it, else its destination);
// when it is not there, by its file name in the other folders (the
// content's digest must match); then by digest among the files of those
// folders that are no decision's known place (renamed files). Digests are
// computed only for files that are not at a known place.
//
// What is learned (each move once: a decision's review marks record where
// the last learned review found it; a document moved again later is a new
// review):
//  - found in a queue folder other than its last known place: learned under
//    that folder's queue (ReviewKind kMoved): "corrected" when that queue
//    differs from chute's choice (or the last learned review), "confirmed"
//    when a reviewer took it out of review into the queue chute guessed;
//  - with confirm_before: a document still at its destination, in the
//    folder of the queue chute chose, decided at or before confirm_before,
//    not held (audit included) and never reviewed: learned under its
//    queue as confirmed (kLeft);
//  - held (and audit) documents still in _review that nobody touched are
//    skipped; so are documents found back in _review, in a folder that is
//    not a queue (without create_queues), unreadable or without terms, or
//    whose content changed.
// Documents no longer anywhere in DEST (taken away for work, or deleted)
// are counted as gone; nothing is learned from them.
#ifndef CHUTE_CLI_DELIVER_FOLDER_REVIEW_H_
#define CHUTE_CLI_DELIVER_FOLDER_REVIEW_H_

#include <cstdint>
#include <string>
#include <vector>

#include "cli/deliver/folder_router.h"  // kReviewFolder
#include "cli/read/document_reader.h"
#include "store/decision_log.h"
#include "store/learn_batch.h"
#include "store/status.h"
#include "store/store.h"
#include "tokenize/tokenizer.h"

namespace chute {

struct FolderReviewOptions {
  // Learn documents left at their destination and decided at or before
  // this time (RFC 3339 UTC, as the log writes it) as confirmed; empty:
  // confirm none.
  std::string confirm_before;
  // Learn documents found in a folder whose name is a valid queue name but
  // no active queue's, creating the queue (default: skip and report).
  bool create_queues = false;
  int64_t max_bytes = kDefaultMaxBytes;  // documents larger are skipped
};

enum class FolderReviewOutcome { kCorrected, kConfirmed, kSkipped };

// One decision the review learned from or skipped.
struct FolderReviewItem {
  int64_t decision_id = 0;
  std::string digest;
  std::string chosen;   // the queue chute chose (a held one's best guess)
  std::string queue;    // corrected/confirmed: learned under; skipped: chosen
  std::string path;     // where the document is now; empty when not found
  FolderReviewOutcome outcome = FolderReviewOutcome::kSkipped;
  ReviewKind kind = ReviewKind::kNone;  // corrected/confirmed: kMoved or kLeft
  // Skipped: why, in plain words.
  std::string reason;
  // Skipped because of something a person must fix (an unreadable file, a
  // folder that is not a queue): the command reports it and exits 3.
  bool refused = false;
};

struct FolderReview {
  std::vector<FolderReviewItem> items;  // in the log's order
  int64_t waiting = 0;  // at their destination, not (yet) confirmed
  int64_t unchanged = 0;  // where the last learned review found them
  int64_t gone = 0;       // no longer anywhere in DEST
  // Folders of DEST that are not queues, or could not be read: one line each.
  std::vector<std::string> problems;
  // The learning: the documents (one per digest) and a mark per learned
  // decision, for Store::LearnReviewed.
  LearnBatch batch;
  std::vector<ReviewMark> marks;
};

// REQUIRES: root is DEST made absolute and symlink-free (as the log's
// destinations are), without a trailing '/'. Fails only when the log or
// the store's queues cannot be read, or root cannot be listed.
Status PlanFolderReview(Store* store, const std::string& root, const FolderReviewOptions& options,
                        Tokenizer* tokenizer, FolderReview* out);

}  // namespace chute

#endif  // CHUTE_CLI_DELIVER_FOLDER_REVIEW_H_
