// Putting one document into a folder without ever losing it or
// overwriting another (DESIGN.md, "Nothing is lost").
//
//  - Folders: DEST/<name>/ is created on demand (mode 0750 under umask);
//    an existing DEST/<name> that is a symbolic link, or not a folder, is
//    refused: a queue folder replaced by a link to elsewhere must not carry
//    documents there. Folders are opened with O_NOFOLLOW | O_DIRECTORY and
//    files placed relative to that descriptor.
//  - Names: the source's own file name is kept; when it is taken, "-2",
//    "-3", ... go before the extension (report.pdf -> report-2.pdf; a name
//    with no extension or only a leading dot gets the suffix at its end; a
//    name too long for the filesystem is shortened, keeping whole UTF-8
//    sequences, to make room).
//  - Never overwriting: on one filesystem, renameat2(RENAME_NOREPLACE),
//    falling back to link() + unlink() where the filesystem does not support
//    it (EINVAL/ENOSYS/EOPNOTSUPP; the test-only CHUTE_TEST_NO_RENAMEAT2=1
//    takes this fallback everywhere); EEXIST -> next name. Across
//    filesystems (EXDEV), or when the test-only environment variable
//    CHUTE_TEST_FORCE_COPY=1 is set, the bytes are copied to
//    ".chute-tmp-<random>" inside the destination folder and the file
//    fsync'ed; the copy takes its name without replacing (the same rename,
//    or link() + unlink() of the temporary name; EEXIST -> next name), the
//    folder is fsync'ed, and only then the source removed (and its folder
//    fsync'ed). A source that changed while it was copied (size or mtime)
//    is left where it is and the delivery fails. Copies keep the source's
//    atime and mtime. The same-filesystem rename is not followed by an
//    fsync: it is atomic, so a crash leaves the file in one place or the
//    other; after a power loss the filesystem's journal decides which.
//  - --copy: as the cross-filesystem path, without removing the source.
//    --link: a hard link (link(), next name on EEXIST); EXDEV is refused.
//
// Every function is safe to call again after a crash at any instant: the
// document is always in the source place, in the destination, or in both.
#ifndef CHUTE_CLI_DELIVER_FILE_DELIVERY_H_
#define CHUTE_CLI_DELIVER_FILE_DELIVERY_H_

#include <cstdint>
#include <string>

#include "store/decision_log.h"
#include "store/status.h"

namespace chute {

// The prefix of chute's temporary files in destination folders; folder
// walks skip them like every name beginning with '.'.
inline constexpr const char* kTempPrefix = ".chute-tmp-";

// Checks a destination root: it must exist (or be creatable, with
// create_root) and be a folder; returns its absolute, symlink-free path.
Status PrepareDestinationRoot(const std::string& root, bool create_root,
                              std::string* absolute_root);

// The absolute path DEST/<folder>/<name> that Deliver would try first:
// the first of name, name-2, ... that does not exist now. Creates nothing.
// Fails (InvalidArgument) when DEST/<folder> exists and is a symbolic link
// or not a folder.
Status ChooseDestination(const std::string& absolute_root, const std::string& folder,
                         const std::string& name, std::string* destination);

// The n-th name Deliver tries for `name` (n >= 1): n = 1 is the name
// itself; n >= 2 puts "-n" before the extension, the part from the last '.'
// on ("report.pdf" -> "report-2.pdf", "a.tar.gz" -> "a.tar-2.gz"); a name
// with no '.' or whose only '.' is its first byte (".notes") gets "-n" at
// its end. When the result would be longer than name_max bytes, the part
// before the extension is shortened (to at least one byte; else the whole
// name is shortened and "-n" goes at its end), cutting between whole UTF-8
// sequences when the name is valid UTF-8 and anywhere otherwise. Pure.
std::string NumberedName(const std::string& name, int64_t n, size_t name_max);

struct Delivered {
  std::string destination;  // absolute path the document now has
  // A move whose bytes were copied: across filesystems, or forced onto the
  // copy path by CHUTE_TEST_FORCE_COPY=1. False for --copy and --link.
  bool crossed_filesystems = false;
};

// Delivers `source` (a regular file, not followed if it is a symbolic
// link: refused) to `wanted` (from ChooseDestination) or, when that name
// was taken meanwhile, to the next free one. With kMove the source is gone
// afterwards; with kCopy and kLink it stays. On failure nothing changed
// (the source is where it was; no partial file is left under a real name;
// a temporary file may be left, which CleanTemporaryFiles removes).
Status Deliver(const std::string& source, const std::string& wanted, DeliveryMode mode,
               Delivered* out);

// What a rerun found for a logged delivery that may be unfinished.
enum class PendingState {
  kNotStarted,  // source there, destination absent: deliver again
  kDone,        // destination there, source gone (move) or any (copy/link)
  kBothThere,   // move: source and a complete destination with the same
                // bytes: the source should be removed (FinishPending does)
  kLost,        // neither there: someone else moved or deleted it
};

// Looks at a logged delivery (source, destination, mode, the digest of the
// document's bytes) and finishes it: kNotStarted -> Deliver (the name may
// change: out->destination), kBothThere -> remove the source after checking
// the destination's digest, kDone -> nothing. *state says what was found.
// A destination whose bytes differ from the digest is never taken as the
// document: then the source is delivered again under a free name.
Status FinishPending(const std::string& source, const std::string& destination,
                     DeliveryMode mode, const std::string& digest, PendingState* state,
                     Delivered* out);

// Removes chute's temporary files (kTempPrefix) left by a crash in the
// folders directly below absolute_root. *removed counts them.
Status CleanTemporaryFiles(const std::string& absolute_root, int64_t* removed);

}  // namespace chute

#endif  // CHUTE_CLI_DELIVER_FILE_DELIVERY_H_
