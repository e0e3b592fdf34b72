#include "cli/deliver/inbox_watcher.h"

#include <dirent.h>
#include <fcntl.h>
#include <poll.h>
#include <sys/inotify.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <climits>
#include <cstring>
#include <deque>
#include <unordered_map>
#include <unordered_set>
#include <utility>

namespace chute {

namespace {

using Clock = std::chrono::steady_clock;

// What two looks at a file compare (inotify(7), "Limitations and caveats":
// events can be lost, so a file is judged by what stat shows).
struct FileLook {
  ino_t ino = 0;
  off_t size = 0;
  int64_t mtime_ns = 0;
  int64_t ctime_ns = 0;
  bool operator==(const FileLook&) const = default;
};

FileLook LookOf(const struct stat& st) {
  FileLook l;
  l.ino = st.st_ino;
  l.size = st.st_size;
  l.mtime_ns = static_cast<int64_t>(st.st_mtim.tv_sec) * 1'000'000'000 + st.st_mtim.tv_nsec;
  l.ctime_ns = static_cast<int64_t>(st.st_ctim.tv_sec) * 1'000'000'000 + st.st_ctim.tv_nsec;
  return l;
}

struct FileState {
  FileLook look;
  bool has_look = false;
  Clock::time_point unchanged_since;  // when a scan first saw `look`
  bool handed_out = false;            // with `look`
  bool writing = false;               // a write seen, its close not yet
  uint64_t seen_in_scan = 0;
};

// The events every watched folder reports. IN_EXCL_UNLINK: no events for
// files after they were unlinked (inotify(7)).
constexpr uint32_t kFolderEvents = IN_CLOSE_WRITE | IN_MOVED_TO | IN_MOVED_FROM | IN_DELETE |
                                   IN_MODIFY | IN_DELETE_SELF | IN_MOVE_SELF | IN_EXCL_UNLINK;

std::string Join(const std::string& folder, const std::string& name) {
  if (folder.empty()) return name;
  return folder.back() == '/' ? folder + name : folder + "/" + name;
}

bool Below(const std::string& path, const std::string& folder) {
  return path.size() > folder.size() && path.compare(0, folder.size(), folder) == 0 &&
         path[folder.size()] == '/';
}

}  // namespace

struct InboxWatcher::State {
  InboxWatchOptions o;
  int fd = -1;
  int root_wd = -1;
  bool root_gone = false;
  std::unordered_map<int, std::string> dir_of_wd;  // relative folder ("" the inbox)
  std::unordered_map<std::string, int> wd_of_dir;
  std::unordered_map<std::string, FileState> files;  // by relative path
  std::unordered_set<std::string> pending;           // waiting for a second look
  std::deque<std::string> ready_order;               // may hold stale names
  std::unordered_set<std::string> ready;             // complete, not handed out
  std::unordered_map<std::string, FileLook> reported;  // problems reported
  Clock::time_point next_rescan;
  bool rescan_due = false;
  uint64_t generation = 0;
  InboxWatchStats stats;

  std::string Path(const std::string& rel) const { return Join(o.folder, rel); }
  static std::string Child(const std::string& dir, const std::string& name) {
    return dir.empty() ? name : dir + "/" + name;
  }

  void ReportOnce(const std::string& rel, const FileLook& look, const std::string& reason,
                  std::vector<WalkProblem>* problems) {
    auto it = reported.find(rel);
    if (it != reported.end() && it->second == look) return;
    reported[rel] = look;
    problems->push_back({Path(rel), reason});
  }

  void Enqueue(const std::string& rel) {
    pending.erase(rel);
    if (ready.insert(rel).second) ready_order.push_back(rel);
  }

  // Watches folder rel (not the inbox). A folder that vanished meanwhile is
  // no problem; one that cannot be watched is reported (scans still cover
  // it).
  void AddWatch(const std::string& rel, std::vector<WalkProblem>* problems) {
    uint32_t mask = kFolderEvents | IN_ONLYDIR | IN_DONT_FOLLOW | IN_CREATE;
    int wd = ::inotify_add_watch(fd, Path(rel).c_str(), mask);
    if (wd < 0) {
      if (errno != ENOENT && errno != ENOTDIR) {
        ReportOnce(rel, FileLook{}, std::string("cannot watch folder: ") + std::strerror(errno) +
                                        (errno == ENOSPC ? " (see fs.inotify.max_user_watches)"
                                                         : ""),
                   problems);
      }
      return;
    }
    auto old = dir_of_wd.find(wd);
    if (old != dir_of_wd.end() && old->second != rel) wd_of_dir.erase(old->second);
    dir_of_wd[wd] = rel;
    wd_of_dir[rel] = wd;
  }

  // Forgets folder rel (moved away or deleted) and everything below it.
  void ForgetTree(const std::string& rel) {
    for (auto it = wd_of_dir.begin(); it != wd_of_dir.end();) {
      if (it->first == rel || Below(it->first, rel)) {
        ::inotify_rm_watch(fd, it->second);
        dir_of_wd.erase(it->second);
        it = wd_of_dir.erase(it);
      } else {
        ++it;
      }
    }
    std::erase_if(files, [&](const auto& f) { return Below(f.first, rel); });
    std::erase_if(pending, [&](const std::string& f) { return Below(f, rel); });
    std::erase_if(ready, [&](const std::string& f) { return Below(f, rel); });
  }

  // A scan (or a second look) found regular file rel as `st` shows it.
  void Consider(const std::string& rel, const struct stat& st, Clock::time_point now,
                std::vector<std::string>* now_ready) {
    if (ready.count(rel) != 0) return;
    FileState& f = files[rel];
    f.seen_in_scan = generation;
    const FileLook look = LookOf(st);
    // Handed out and not written since. The ctime is left out here: a
    // hard link made by `watch --link` changes it, not the document.
    if (f.has_look && f.handed_out && f.look.ino == look.ino && f.look.size == look.size &&
        f.look.mtime_ns == look.mtime_ns) {
      return;
    }
    if (!f.has_look || !(f.look == look)) {
      f.look = look;
      f.has_look = true;
      f.handed_out = false;
      f.unchanged_since = now;
      pending.insert(rel);
      return;
    }
    if (f.handed_out || f.writing) return;
    if (now - f.unchanged_since >= o.settle_time) {
      pending.erase(rel);
      now_ready->push_back(rel);
    } else {
      pending.insert(rel);
    }
  }

  // Scans folder rel: files to Consider, folders (when recursive) watched
  // and scanned in turn.
  void ScanFolder(const std::string& rel, Clock::time_point now,
                  std::vector<std::string>* now_ready, std::vector<WalkProblem>* problems) {
    int flags = O_RDONLY | O_DIRECTORY | O_CLOEXEC | (rel.empty() ? 0 : O_NOFOLLOW);
    int dfd = ::open(Path(rel).c_str(), flags);
    if (dfd < 0) {
      if (errno != ENOENT && errno != ENOTDIR && errno != ELOOP) {
        ReportOnce(rel, FileLook{}, std::string("cannot read folder: ") + std::strerror(errno),
                   problems);
      }
      return;
    }
    DIR* d = ::fdopendir(dfd);
    if (d == nullptr) {
      ::close(dfd);
      return;
    }
    std::vector<std::string> names;
    while (dirent* e = ::readdir(d)) {
      if (e->d_name[0] == '.') continue;  // ".", "..", and hidden names
      names.emplace_back(e->d_name);
    }
    std::sort(names.begin(), names.end());
    for (const std::string& name : names) {
      const std::string child = Child(rel, name);
      struct stat st;
      if (::fstatat(dfd, name.c_str(), &st, AT_SYMLINK_NOFOLLOW) != 0) continue;  // gone
      if (S_ISDIR(st.st_mode)) {
        if (!o.recursive) continue;
        if (wd_of_dir.count(child) == 0) AddWatch(child, problems);
        ScanFolder(child, now, now_ready, problems);
      } else if (S_ISREG(st.st_mode)) {
        Consider(child, st, now, now_ready);
      } else {
        ReportOnce(child, LookOf(st),
                   S_ISLNK(st.st_mode) ? "symbolic link, not followed" : "not a regular file",
                   problems);
      }
    }
    ::closedir(d);
  }

  void EnqueueSorted(std::vector<std::string>* now_ready) {
    std::sort(now_ready->begin(), now_ready->end());
    for (const std::string& rel : *now_ready) Enqueue(rel);
    now_ready->clear();
  }

  void FullScan(Clock::time_point now, std::vector<WalkProblem>* problems) {
    ++generation;
    ++stats.scans;
    std::vector<std::string> now_ready;
    ScanFolder("", now, &now_ready, problems);
    EnqueueSorted(&now_ready);
    // Files the scan did not see are gone (or in a folder no longer
    // watched); ready ones are checked when handed out.
    std::erase_if(files, [&](const auto& f) {
      return f.second.seen_in_scan != generation && ready.count(f.first) == 0;
    });
    std::erase_if(pending, [&](const std::string& rel) { return files.count(rel) == 0; });
    std::erase_if(reported, [&](const auto& r) {
      struct stat st;
      return ::lstat(Path(r.first).c_str(), &st) != 0;
    });
  }

  // The earliest time a pending file may be complete.
  Clock::time_point NextSettle() const {
    Clock::time_point t = Clock::time_point::max();
    for (const std::string& rel : pending) {
      auto it = files.find(rel);
      if (it != files.end()) t = std::min(t, it->second.unchanged_since + o.settle_time);
    }
    return t;
  }

  // The second look at the files a scan found.
  void CheckPending(Clock::time_point now) {
    std::vector<std::string> now_ready;
    std::vector<std::string> names(pending.begin(), pending.end());
    for (const std::string& rel : names) {
      auto it = files.find(rel);
      struct stat st;
      if (it == files.end() || it->second.writing || ::lstat(Path(rel).c_str(), &st) != 0 ||
          !S_ISREG(st.st_mode)) {
        pending.erase(rel);  // gone, or its close will be reported
        if (it != files.end() && !it->second.writing) files.erase(it);
        continue;
      }
      Consider(rel, st, now, &now_ready);
    }
    EnqueueSorted(&now_ready);
  }

  Status ReadEvents(std::vector<WalkProblem>* problems) {
    alignas(inotify_event) char buffer[64 * 1024];
    for (;;) {
      ssize_t n = ::read(fd, buffer, sizeof buffer);
      if (n < 0) {
        if (errno == EAGAIN) return Status::Ok();
        if (errno == EINTR) continue;
        return Status::IoError(o.folder + ": reading inotify events: " + std::strerror(errno));
      }
      if (n == 0) return Status::Ok();
      for (char* p = buffer; p < buffer + n;) {
        const auto* ev = reinterpret_cast<const inotify_event*>(p);
        p += sizeof(inotify_event) + ev->len;
        ++stats.events;
        HandleEvent(*ev, problems);
      }
    }
  }

  void HandleEvent(const inotify_event& ev, std::vector<WalkProblem>* problems) {
    if (ev.mask & IN_Q_OVERFLOW) {
      // Events were lost: a close may be among them, so no write is taken
      // as still open; the scan finds what was missed.
      ++stats.overflows;
      for (auto& f : files) f.second.writing = false;
      rescan_due = true;
      return;
    }
    auto it = dir_of_wd.find(ev.wd);
    if (ev.mask & IN_IGNORED) {
      if (ev.wd == root_wd) root_gone = true;
      if (it != dir_of_wd.end()) {
        auto back = wd_of_dir.find(it->second);
        if (back != wd_of_dir.end() && back->second == ev.wd) wd_of_dir.erase(back);
        dir_of_wd.erase(it);
      }
      return;
    }
    if (it == dir_of_wd.end()) return;  // a watch removed meanwhile
    if (ev.mask & (IN_DELETE_SELF | IN_MOVE_SELF | IN_UNMOUNT)) {
      if (ev.wd == root_wd) root_gone = true;
      return;  // a folder below: its parent's event says where it went
    }
    if (ev.len == 0) return;
    const std::string name(ev.name, ::strnlen(ev.name, ev.len));
    if (name.empty() || name[0] == '.') return;
    const std::string rel = Child(it->second, name);
    if (ev.mask & IN_ISDIR) {
      if (!o.recursive) return;
      if (ev.mask & (IN_CREATE | IN_MOVED_TO)) {
        // Watch first, then scan: what is written after the watch exists
        // is reported; what was written before, the scan finds.
        AddWatch(rel, problems);
        std::vector<std::string> now_ready;
        ScanFolder(rel, Clock::now(), &now_ready, problems);
        EnqueueSorted(&now_ready);
      } else if (ev.mask & (IN_MOVED_FROM | IN_DELETE)) {
        ForgetTree(rel);
      }
      return;
    }
    if (ev.mask & (IN_CLOSE_WRITE | IN_MOVED_TO)) {
      FileState& f = files[rel];
      f.writing = false;
      f.has_look = false;  // looked at when handed out
      Enqueue(rel);
    } else if (ev.mask & IN_MODIFY) {
      files[rel].writing = true;
      pending.erase(rel);
      ready.erase(rel);  // written again: wait for its close
    } else if (ev.mask & (IN_MOVED_FROM | IN_DELETE)) {
      files.erase(rel);
      pending.erase(rel);
      ready.erase(rel);
      reported.erase(rel);
    }
  }

  // Hands out ready files that are still regular files.
  void HandOut(std::vector<InputFile>* out, std::vector<WalkProblem>* problems) {
    size_t given = 0;
    while (!ready_order.empty() && given < o.max_batch) {
      std::string rel = std::move(ready_order.front());
      ready_order.pop_front();
      if (ready.erase(rel) == 0) continue;  // stale: handed out or withdrawn
      struct stat st;
      if (::lstat(Path(rel).c_str(), &st) != 0) {
        files.erase(rel);
        continue;
      }
      if (!S_ISREG(st.st_mode)) {
        ReportOnce(rel, LookOf(st),
                   S_ISLNK(st.st_mode) ? "symbolic link, not followed" : "not a regular file",
                   problems);
        continue;
      }
      FileState& f = files[rel];
      f.look = LookOf(st);
      f.has_look = true;
      f.handed_out = true;
      f.writing = false;
      f.seen_in_scan = generation;
      out->push_back({Path(rel), rel});
      ++given;
      ++stats.handed_out;
    }
  }
};

InboxWatcher::InboxWatcher() : state_(std::make_unique<State>()) {}

InboxWatcher::~InboxWatcher() {
  if (state_->fd >= 0) ::close(state_->fd);
}

Status InboxWatcher::Open(const InboxWatchOptions& options, std::unique_ptr<InboxWatcher>* out) {
  std::unique_ptr<InboxWatcher> w(new InboxWatcher());
  State& s = *w->state_;
  s.o = options;
  if (s.o.max_batch == 0) s.o.max_batch = 1;
  struct stat st;
  if (::stat(s.o.folder.c_str(), &st) != 0) {
    return Status::NotFound(s.o.folder + ": " +
                            (errno == ENOENT ? "no such folder" : std::strerror(errno)));
  }
  if (!S_ISDIR(st.st_mode)) return Status::InvalidArgument(s.o.folder + ": not a folder");
  s.fd = ::inotify_init1(IN_NONBLOCK | IN_CLOEXEC);
  if (s.fd < 0) {
    return Status::IoError(std::string("inotify_init1: ") + std::strerror(errno) +
                           (errno == EMFILE ? " (see fs.inotify.max_user_instances)" : ""));
  }
  uint32_t mask = kFolderEvents | IN_ONLYDIR | (s.o.recursive ? IN_CREATE : 0);
  s.root_wd = ::inotify_add_watch(s.fd, s.o.folder.c_str(), mask);
  if (s.root_wd < 0) {
    return Status::IoError(s.o.folder + ": cannot watch folder: " + std::strerror(errno));
  }
  s.dir_of_wd[s.root_wd] = "";
  s.wd_of_dir[""] = s.root_wd;
  // The first scan runs in the first call of Next, so that its problems
  // are reported there.
  s.rescan_due = true;
  *out = std::move(w);
  return Status::Ok();
}

void InboxWatcher::RescanSoon() { state_->rescan_due = true; }

const InboxWatchStats& InboxWatcher::stats() const { return state_->stats; }

Status InboxWatcher::Next(std::vector<InputFile>* files, std::vector<WalkProblem>* problems,
                          bool* stopped, std::chrono::milliseconds max_wait) {
  State& s = *state_;
  *stopped = false;
  const Clock::time_point give_up =
      max_wait == std::chrono::milliseconds::max() ? Clock::time_point::max()
                                                   : Clock::now() + max_wait;
  const size_t files_before = files->size(), problems_before = problems->size();
  std::vector<pollfd> fds;
  for (;;) {
    if (s.o.stop != nullptr && s.o.stop->Requested()) {
      *stopped = true;
      return Status::Ok();
    }
    Status st = s.ReadEvents(problems);
    if (!st.ok()) return st;
    if (s.root_gone) {
      return Status::NotFound(s.o.folder + ": the inbox was deleted or moved away");
    }
    Clock::time_point now = Clock::now();
    if (s.rescan_due || now >= s.next_rescan) {
      s.FullScan(now, problems);
      s.rescan_due = false;
      s.next_rescan = now + s.o.rescan_interval;
    }
    if (!s.pending.empty() && now >= s.NextSettle()) s.CheckPending(now);
    s.HandOut(files, problems);
    if (files->size() > files_before || problems->size() > problems_before) {
      return Status::Ok();
    }
    // Nothing yet: wait for an event, a stop, the next scan or second look.
    if (Clock::now() >= give_up) return Status::Ok();
    Clock::time_point wake = std::min(s.next_rescan, give_up);
    if (!s.pending.empty()) wake = std::min(wake, s.NextSettle());
    auto wait = std::chrono::ceil<std::chrono::milliseconds>(wake - Clock::now()).count();
    int timeout = static_cast<int>(std::clamp<int64_t>(wait, 0, INT_MAX));
    fds.clear();
    fds.push_back({s.fd, POLLIN, 0});
    if (s.o.stop != nullptr) s.o.stop->AddPollFds(&fds);
    if (::poll(fds.data(), fds.size(), timeout) < 0 && errno != EINTR) {
      return Status::IoError(std::string("poll: ") + std::strerror(errno));
    }
  }
}

}  // namespace chute
