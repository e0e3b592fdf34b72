// Watching an inbox folder for complete files: the eyes of `chute watch`.
// No store, no model: it only says which files are ready to be routed.
//
// A file is complete, and handed out by Next, when
//  - inotify(7) reports it closed after writing (IN_CLOSE_WRITE) or moved
//    in (IN_MOVED_TO): the producer is done with it;
//  - a scan finds it and two looks at least settle_time apart see the same
//    inode, size, mtime and ctime, and no write to it was seen whose close
//    was not (a writer that still has it open). The scans run at Open,
//    every rescan_interval, after the kernel's event queue overflowed
//    (IN_Q_OVERFLOW: events were lost), and on a folder that appears under
//    a recursive watch (files may be written there before its watch
//    exists). The two looks do not trust the file's mtime against this
//    machine's clock: on a network filesystem the writer's clock may
//    differ, and there inotify sees no remote writes, so this rule is the
//    only one that applies.
// Names beginning with '.' are skipped, files and folders alike (producers
// write under such a name and rename at the end; chute's own temporary
// files begin with ".chute-tmp-"). Symbolic links are never followed, and
// are reported once, like other files that are not regular files, until
// they change.
//
// A file handed out is not handed out again unless it is written again
// (closed after a write, moved in again, or seen by a scan with another
// inode, size or mtime). A file that is deleted or moved away is
// forgotten. A file queued as ready that is written to again before it is
// handed out waits for its next close.
//
// With recursive, every folder below the inbox is watched too: folders
// created or moved in get a watch and are scanned once it exists; folders
// moved away or deleted lose theirs. Without, only files directly in the
// inbox are seen.
//
// Not thread-safe: one thread calls Next.
#ifndef CHUTE_CLI_DELIVER_INBOX_WATCHER_H_
#define CHUTE_CLI_DELIVER_INBOX_WATCHER_H_

#include <chrono>
#include <cstddef>
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "cli/deliver/stop_request.h"
#include "cli/read/input_walker.h"
#include "store/status.h"

namespace chute {

struct InboxWatchOptions {
  std::string folder;      // the inbox; paths handed out begin with it
  bool recursive = false;  // watch the folders below it too
  // Between two full scans of the inbox (the safety net for events missed).
  std::chrono::milliseconds rescan_interval{60'000};
  // How long a file seen by a scan must stay unchanged to count as complete.
  std::chrono::milliseconds settle_time{2'000};
  size_t max_batch = 256;         // files one call of Next hands out at most
  StopRequest* stop = nullptr;    // borrowed; Next returns when it is asked
};

// Counters, for status lines and tests.
struct InboxWatchStats {
  int64_t events = 0;     // inotify events read
  int64_t overflows = 0;  // IN_Q_OVERFLOW seen
  int64_t scans = 0;      // full scans of the inbox (the one at Open included)
  int64_t handed_out = 0;
};

class InboxWatcher {
 public:
  // Watches options.folder (it must exist and be a folder; a symbolic link
  // named as the inbox is followed: the user chose it). The first scan
  // runs in the first call of Next.
  static Status Open(const InboxWatchOptions& options, std::unique_ptr<InboxWatcher>* out);

  // Waits until some files are complete and appends them (at most
  // max_batch; first come, first out; a scan's finds in byte order of
  // their paths) to *files, or until a stop is asked (*stopped = true;
  // nothing is appended then), or until max_wait has passed (nothing
  // appended, *stopped false). Files that are not regular files are
  // appended to *problems, once each (Next also returns when it found
  // only such). Fails when inotify fails or the inbox itself is deleted or
  // moved away.
  Status Next(std::vector<InputFile>* files, std::vector<WalkProblem>* problems, bool* stopped,
              std::chrono::milliseconds max_wait = std::chrono::milliseconds::max());

  // Scans the whole inbox at the next call of Next, as after an overflow.
  void RescanSoon();

  const InboxWatchStats& stats() const;

  ~InboxWatcher();
  InboxWatcher(const InboxWatcher&) = delete;  // owns the inotify descriptor
  InboxWatcher& operator=(const InboxWatcher&) = delete;

 private:
  InboxWatcher();
  struct State;
  std::unique_ptr<State> state_;
};

}  // namespace chute

#endif  // CHUTE_CLI_DELIVER_INBOX_WATCHER_H_
