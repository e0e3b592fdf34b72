#include "cli/deliver/file_delivery.h"

#include <dirent.h>
#include <fcntl.h>
#include <limits.h>
#include <sys/random.h>
#include <sys/stat.h>
#include <sys/syscall.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <memory>
#include <mutex>
#include <unordered_map>
#include <string_view>
#include <system_error>
#include <vector>

#include "cli/read/sha256.h"
#include "cli/read/utf8.h"

#ifndef RENAME_NOREPLACE
#define RENAME_NOREPLACE (1 << 0)  // linux/fs.h
#endif

namespace chute {

namespace {

// How many names Deliver tries (name, name-2, ...) before giving up: a
// bound that only a folder of a million copies of one name reaches.
constexpr int64_t kMaxNameTries = 1000000;

std::string Reason(int err) { return std::strerror(err); }

// Owns a file descriptor.
class Fd {
 public:
  Fd() = default;
  explicit Fd(int fd) : fd_(fd) {}
  Fd(const Fd&) = delete;  // one owner closes it
  Fd& operator=(const Fd&) = delete;
  Fd(Fd&& other) noexcept : fd_(other.fd_) { other.fd_ = -1; }
  Fd& operator=(Fd&& other) noexcept {
    if (this != &other) {
      Reset();
      fd_ = other.fd_;
      other.fd_ = -1;
    }
    return *this;
  }
  ~Fd() { Reset(); }

  int get() const { return fd_; }
  // Gives up ownership (to fdopendir, which closes it).
  int Release() {
    int fd = fd_;
    fd_ = -1;
    return fd;
  }
  bool valid() const { return fd_ >= 0; }
  void Reset() {
    if (fd_ >= 0) ::close(fd_);
    fd_ = -1;
  }
  // Closes and reports close()'s error (0 or errno): a write-back error of
  // a file written here must not pass unnoticed.
  int Close() {
    int fd = fd_;
    fd_ = -1;
    return ::close(fd) == 0 ? 0 : errno;
  }

 private:
  int fd_ = -1;
};

// "dir" + "/" + "name", without doubling a trailing '/'.
std::string Join(const std::string& dir, const std::string& name) {
  if (!dir.empty() && dir.back() == '/') return dir + name;
  return dir + "/" + name;
}

// Splits a path into its folder ("." when none) and its last component.
// False when the path has no last component (empty, or ends in '/').
bool SplitPath(const std::string& path, std::string* dir, std::string* base) {
  if (path.empty() || path.back() == '/') return false;
  const size_t slash = path.rfind('/');
  if (slash == std::string::npos) {
    *dir = ".";
    *base = path;
  } else {
    *dir = slash == 0 ? "/" : path.substr(0, slash);
    *base = path.substr(slash + 1);
  }
  return true;
}

// A single file or folder name: not empty, no '/', not "." or "..".
bool IsPlainName(const std::string& name) {
  return !name.empty() && name.find('/') == std::string::npos && name != "." && name != "..";
}

// The longest prefix of s no longer than max bytes, ending between whole
// UTF-8 sequences when utf8 is true.
size_t CutLength(std::string_view s, size_t max, bool utf8) {
  if (max >= s.size()) return s.size();
  size_t cut = max;
  if (utf8) {
    while (cut > 0 && (static_cast<unsigned char>(s[cut]) & 0xC0) == 0x80) --cut;
  }
  return cut;
}

// True when the test-only environment variable is set to "1".
bool TestSwitch(const char* name) {
  const char* v = std::getenv(name);
  return v != nullptr && std::strcmp(v, "1") == 0;
}

// NAME_MAX of the filesystem holding the folder fd (255 when it does not
// say).
size_t NameMax(int dir_fd) {
  long v = ::fpathconf(dir_fd, _PC_NAME_MAX);
  return v > 0 ? static_cast<size_t>(v) : NAME_MAX;
}

// Renames without ever replacing: 0, or the errno (EEXIST when the new
// name is taken). renameat2(RENAME_NOREPLACE) through syscall() so that it
// does not depend on the C library's wrapper; where the filesystem or
// kernel does not support the flag (EINVAL, ENOSYS, EOPNOTSUPP), link() to
// the new name (which fails on an existing name) then unlink() the old.
// CHUTE_TEST_NO_RENAMEAT2=1 (tests only) takes the fallback as if the flag
// were unsupported.
int RenameNoReplace(int old_dir, const std::string& old_name, int new_dir,
                    const std::string& new_name) {
  int err = EINVAL;
  if (!TestSwitch("CHUTE_TEST_NO_RENAMEAT2")) {
    if (::syscall(SYS_renameat2, old_dir, old_name.c_str(), new_dir, new_name.c_str(),
                  RENAME_NOREPLACE) == 0) {
      return 0;
    }
    err = errno;
  }
  if (err != EINVAL && err != ENOSYS && err != EOPNOTSUPP) return err;
  if (::linkat(old_dir, old_name.c_str(), new_dir, new_name.c_str(), 0) != 0) return errno;
  if (::unlinkat(old_dir, old_name.c_str(), 0) != 0) {
    const int unlink_err = errno;
    ::unlinkat(new_dir, new_name.c_str(), 0);  // both names are the same file
    return unlink_err;
  }
  return 0;
}

// Opens a folder to work in; for a source's folder, read-only so that it
// can be fsync'ed, else (no read permission) as a path only.
Status OpenSourceFolder(const std::string& dir, Fd* out) {
  int fd = ::open(dir.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (fd < 0 && errno == EACCES) fd = ::open(dir.c_str(), O_PATH | O_DIRECTORY | O_CLOEXEC);
  if (fd < 0) return Status::IoError(dir + ": cannot open the folder: " + Reason(errno));
  *out = Fd(fd);
  return Status::Ok();
}

// Why root/folder cannot take documents, looked at without following a
// link; ok when it is a folder, NotFound when it is absent.
Status CheckFolderEntry(int root_fd, const std::string& folder_path, const std::string& folder) {
  struct stat st;
  if (::fstatat(root_fd, folder.c_str(), &st, AT_SYMLINK_NOFOLLOW) != 0) {
    if (errno == ENOENT) return Status::NotFound(folder_path + ": no such folder");
    return Status::IoError(folder_path + ": " + Reason(errno));
  }
  if (S_ISLNK(st.st_mode)) {
    return Status::InvalidArgument(folder_path +
                                   " is a symbolic link; refusing to deliver there");
  }
  if (!S_ISDIR(st.st_mode)) {
    return Status::InvalidArgument(folder_path + " is not a folder; refusing to deliver there");
  }
  return Status::Ok();
}

// Opens root/folder (O_NOFOLLOW | O_DIRECTORY) relative to the root's
// descriptor, creating it first when create is set. A symbolic link or a
// non-folder there is refused.
Status OpenDeliveryFolderAt(int root_fd, const std::string& root, const std::string& folder,
                            bool create, Fd* out) {
  const std::string folder_path = Join(root, folder);
  if (!IsPlainName(folder)) {
    return Status::InvalidArgument(folder_path + ": not a plain folder name");
  }
  if (create && ::mkdirat(root_fd, folder.c_str(), 0750) != 0 && errno != EEXIST) {
    return Status::IoError(folder_path + ": cannot create the folder: " + Reason(errno));
  }
  int fd = ::openat(root_fd, folder.c_str(), O_RDONLY | O_DIRECTORY | O_NOFOLLOW | O_CLOEXEC);
  if (fd < 0) {
    const int err = errno;
    Status why = CheckFolderEntry(root_fd, folder_path, folder);
    if (!why.ok()) return why;
    return Status::IoError(folder_path + ": cannot open the folder: " + Reason(err));
  }
  *out = Fd(fd);
  return Status::Ok();
}

// OpenDeliveryFolderAt with the root opened by path.
Status OpenDeliveryFolder(const std::string& root, const std::string& folder, bool create,
                          Fd* out) {
  Fd root_fd(::open(root.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC));
  if (!root_fd.valid()) {
    return Status::IoError(root + ": cannot open the folder: " + Reason(errno));
  }
  return OpenDeliveryFolderAt(root_fd.get(), root, folder, create, out);
}

// Delivery folders stay open between deliveries, so that a document costs
// no walk of DEST's path, no mkdir and no open of its folder: before each
// use the entry under the root is looked at again (one fstatat, not
// following links) and must still be the same folder (device and inode), so
// a queue folder replaced meanwhile, by a link or by another folder, is
// opened afresh (and a link refused) as on first use. Callers get their own
// descriptor (dup), so entries can be dropped at any time.
class FolderCache {
 public:
  Status Open(const std::string& root, const std::string& folder, Fd* out, size_t* name_max) {
    std::lock_guard<std::mutex> lock(mu_);
    const std::string key = Join(root, folder);
    auto it = entries_.find(key);
    if (it != entries_.end()) {
      struct stat st;
      const Entry& e = it->second;
      if (::fstatat(e.root.get(), folder.c_str(), &st, AT_SYMLINK_NOFOLLOW) == 0 &&
          S_ISDIR(st.st_mode) && st.st_dev == e.dev && st.st_ino == e.ino) {
        return Dup(e, out, name_max, key);
      }
      entries_.erase(it);
    }
    Entry e;
    e.root = Fd(::open(root.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC));
    if (!e.root.valid()) {
      return Status::IoError(root + ": cannot open the folder: " + Reason(errno));
    }
    Status s = OpenDeliveryFolderAt(e.root.get(), root, folder, /*create=*/true, &e.folder);
    if (!s.ok()) return s;
    struct stat st;
    if (::fstat(e.folder.get(), &st) != 0) return Status::IoError(key + ": " + Reason(errno));
    e.dev = st.st_dev;
    e.ino = st.st_ino;
    e.name_max = NameMax(e.folder.get());
    if (entries_.size() >= kMaxEntries) entries_.clear();
    return Dup(entries_.emplace(key, std::move(e)).first->second, out, name_max, key);
  }

 private:
  struct Entry {
    Fd root;
    Fd folder;
    dev_t dev = 0;
    ino_t ino = 0;
    size_t name_max = NAME_MAX;
  };
  static constexpr size_t kMaxEntries = 256;

  static Status Dup(const Entry& e, Fd* out, size_t* name_max, const std::string& key) {
    *out = Fd(::fcntl(e.folder.get(), F_DUPFD_CLOEXEC, 0));
    if (!out->valid()) return Status::IoError(key + ": " + Reason(errno));
    *name_max = e.name_max;
    return Status::Ok();
  }

  std::mutex mu_;
  std::unordered_map<std::string, Entry> entries_;
};

FolderCache& DeliveryFolders() {
  static FolderCache* cache = new FolderCache;  // never destroyed: used until exit
  return *cache;
}

// A fresh temporary name, kTempPrefix followed by 16 random hex digits.
std::string TempName() {
  unsigned char bytes[8];
  if (::getrandom(bytes, sizeof bytes, 0) != static_cast<ssize_t>(sizeof bytes)) {
    // No entropy source: the time and the process id are unique enough,
    // as the name is created with O_EXCL and retried when taken.
    struct timespec ts;
    ::clock_gettime(CLOCK_REALTIME, &ts);
    const uint64_t v = static_cast<uint64_t>(ts.tv_nsec) ^
                       (static_cast<uint64_t>(ts.tv_sec) << 20) ^
                       (static_cast<uint64_t>(::getpid()) << 40);
    for (int i = 0; i < 8; ++i) bytes[i] = static_cast<unsigned char>(v >> (8 * i));
  }
  static const char kHex[] = "0123456789abcdef";
  std::string name = kTempPrefix;
  for (unsigned char b : bytes) {
    name += kHex[b >> 4];
    name += kHex[b & 15];
  }
  return name;
}

// Writes all of bytes to fd; 0 or the errno.
int WriteAll(int fd, const char* data, size_t size) {
  while (size > 0) {
    ssize_t w = ::write(fd, data, size);
    if (w < 0) {
      if (errno == EINTR) continue;
      return errno;
    }
    data += w;
    size -= static_cast<size_t>(w);
  }
  return 0;
}

// The names Deliver tries in turn: `wanted` first, then the source's own
// name numbered 1, 2, ... (skipping `wanted`), shortened to name_max.
class NameSequence {
 public:
  NameSequence(std::string wanted, std::string base, size_t name_max)
      : wanted_(std::move(wanted)), base_(std::move(base)), name_max_(name_max) {}

  // False when the names ran out.
  bool Next(std::string* name) {
    if (!started_) {
      started_ = true;
      *name = wanted_;
      return true;
    }
    while (n_ < kMaxNameTries) {
      ++n_;
      std::string candidate = NumberedName(base_, n_, name_max_);
      if (!candidate.empty() && candidate != wanted_) {
        *name = std::move(candidate);
        return true;
      }
    }
    return false;
  }

 private:
  std::string wanted_;
  std::string base_;
  size_t name_max_;
  bool started_ = false;
  int64_t n_ = 0;
};

Status NoFreeName(const std::string& folder_path, const std::string& name) {
  return Status::IoError(folder_path + ": no free name for " + name + " after " +
                         std::to_string(kMaxNameTries) + " tries");
}

// What Deliver works on: the source's folder and name, the destination
// folder (open), and the names to try.
struct Places {
  std::string source;
  Fd source_dir;
  std::string source_name;
  std::string folder_path;  // DEST/<folder>
  Fd folder;
};

// The copy path: bytes to a temporary file in the destination folder,
// fsync'ed, renamed without replacing to the first free name, the folder
// fsync'ed; then, for a move, the source removed and its folder fsync'ed.
Status CopyDeliver(Places& p, NameSequence& names, bool remove_source, std::string* placed) {
  Fd src(::openat(p.source_dir.get(), p.source_name.c_str(),
                  O_RDONLY | O_NOFOLLOW | O_NONBLOCK | O_NOCTTY | O_CLOEXEC));
  if (!src.valid()) {
    if (errno == ELOOP) {
      return Status::InvalidArgument(p.source + " is a symbolic link; not followed");
    }
    if (errno == ENOENT) return Status::NotFound(p.source + ": no such file");
    return Status::IoError(p.source + ": cannot open: " + Reason(errno));
  }
  struct stat before;
  if (::fstat(src.get(), &before) != 0) {
    return Status::IoError(p.source + ": " + Reason(errno));
  }
  if (!S_ISREG(before.st_mode)) {
    return Status::InvalidArgument(p.source + " is not a regular file");
  }

  std::string temp;
  Fd out;
  for (int tries = 0; tries < 100 && !out.valid(); ++tries) {
    temp = TempName();
    out = Fd(::openat(p.folder.get(), temp.c_str(),
                      O_WRONLY | O_CREAT | O_EXCL | O_NOFOLLOW | O_CLOEXEC,
                      before.st_mode & 0777));
    if (!out.valid() && errno != EEXIST) {
      return Status::IoError(Join(p.folder_path, temp) + ": cannot create: " + Reason(errno));
    }
  }
  if (!out.valid()) {
    return Status::IoError(p.folder_path + ": no free temporary name after 100 tries");
  }
  auto fail = [&](std::string message) {
    out.Reset();
    ::unlinkat(p.folder.get(), temp.c_str(), 0);
    return Status::IoError(std::move(message));
  };

  std::vector<char> buffer(1 << 17);
  int64_t copied = 0;
  for (;;) {
    ssize_t r = ::read(src.get(), buffer.data(), buffer.size());
    if (r < 0) {
      if (errno == EINTR) continue;
      return fail(p.source + ": cannot read: " + Reason(errno));
    }
    if (r == 0) break;
    if (int err = WriteAll(out.get(), buffer.data(), static_cast<size_t>(r)); err != 0) {
      return fail(Join(p.folder_path, temp) + ": cannot write: " + Reason(err));
    }
    copied += r;
  }
  struct stat after;
  if (::fstat(src.get(), &after) != 0) return fail(p.source + ": " + Reason(errno));
  if (after.st_size != copied || after.st_mtim.tv_sec != before.st_mtim.tv_sec ||
      after.st_mtim.tv_nsec != before.st_mtim.tv_nsec) {
    return fail(p.source + ": changed while being copied; left where it is");
  }
  // The copy keeps the source's times (a failure here costs nothing).
  const struct timespec times[2] = {after.st_atim, after.st_mtim};
  ::futimens(out.get(), times);
  if (::fsync(out.get()) != 0) {
    return fail(Join(p.folder_path, temp) + ": cannot fsync: " + Reason(errno));
  }
  if (int err = out.Close(); err != 0) {
    ::unlinkat(p.folder.get(), temp.c_str(), 0);
    return Status::IoError(Join(p.folder_path, temp) + ": cannot close: " + Reason(err));
  }

  std::string name;
  for (;;) {
    if (!names.Next(&name)) {
      ::unlinkat(p.folder.get(), temp.c_str(), 0);
      return NoFreeName(p.folder_path, p.source_name);
    }
    const int err = RenameNoReplace(p.folder.get(), temp, p.folder.get(), name);
    if (err == 0) break;
    if (err != EEXIST) {
      ::unlinkat(p.folder.get(), temp.c_str(), 0);
      return Status::IoError(Join(p.folder_path, name) + ": cannot put the copy there: " +
                             Reason(err));
    }
  }
  if (::fsync(p.folder.get()) != 0) {
    const std::string reason = Reason(errno);
    ::unlinkat(p.folder.get(), name.c_str(), 0);
    return Status::IoError(p.folder_path + ": cannot fsync the folder: " + reason);
  }

  if (remove_source) {
    // Only the file that was copied is removed: if another file has taken
    // the source's name meanwhile, it is a different document and stays
    // (the copied one is delivered; nothing is lost either way).
    struct stat now;
    const bool same =
        ::fstatat(p.source_dir.get(), p.source_name.c_str(), &now, AT_SYMLINK_NOFOLLOW) == 0 &&
        now.st_dev == after.st_dev && now.st_ino == after.st_ino;
    if (same && ::unlinkat(p.source_dir.get(), p.source_name.c_str(), 0) != 0) {
      const std::string reason = Reason(errno);
      // Withdraw the copy: on failure nothing changed.
      ::unlinkat(p.folder.get(), name.c_str(), 0);
      ::fsync(p.folder.get());
      return Status::IoError(p.source + ": cannot remove it after copying: " + reason);
    }
    // An O_PATH descriptor cannot be fsync'ed (EBADF): the removal is then
    // as durable as the filesystem makes it on its own.
    ::fsync(p.source_dir.get());
  }
  *placed = std::move(name);
  return Status::Ok();
}

// Reads a regular file whole (not following a symbolic link). *present is
// false when there is no regular file at path.
Status ReadRegularFile(const std::string& path, bool* present, std::string* bytes) {
  *present = false;
  bytes->clear();
  Fd fd(::open(path.c_str(), O_RDONLY | O_NOFOLLOW | O_NONBLOCK | O_NOCTTY | O_CLOEXEC));
  if (!fd.valid()) {
    if (errno == ENOENT || errno == ELOOP || errno == ENOTDIR) return Status::Ok();
    return Status::IoError(path + ": cannot open: " + Reason(errno));
  }
  struct stat st;
  if (::fstat(fd.get(), &st) != 0) return Status::IoError(path + ": " + Reason(errno));
  if (!S_ISREG(st.st_mode)) return Status::Ok();
  std::vector<char> buffer(1 << 17);
  for (;;) {
    ssize_t r = ::read(fd.get(), buffer.data(), buffer.size());
    if (r < 0) {
      if (errno == EINTR) continue;
      return Status::IoError(path + ": cannot read: " + Reason(errno));
    }
    if (r == 0) break;
    bytes->append(buffer.data(), static_cast<size_t>(r));
  }
  *present = true;
  return Status::Ok();
}

// True when a regular file at path has the digest.
Status HoldsDocument(const std::string& path, const std::string& digest, bool* holds) {
  bool present = false;
  std::string bytes;
  Status s = ReadRegularFile(path, &present, &bytes);
  if (!s.ok()) return s;
  *holds = present && Sha256Hex(bytes) == digest;
  return Status::Ok();
}

// The names in a folder (without "." and ".."), from an open descriptor
// that this takes over.
Status ListFolder(Fd fd, const std::string& path, std::vector<std::string>* names) {
  DIR* dir = ::fdopendir(fd.get());
  if (dir == nullptr) return Status::IoError(path + ": cannot read the folder: " + Reason(errno));
  fd.Release();  // closedir closes it
  std::unique_ptr<DIR, int (*)(DIR*)> closer(dir, ::closedir);
  for (;;) {
    errno = 0;
    const struct dirent* entry = ::readdir(dir);
    if (entry == nullptr) {
      if (errno != 0) return Status::IoError(path + ": cannot read the folder: " + Reason(errno));
      break;
    }
    const std::string name = entry->d_name;
    if (name != "." && name != "..") names->push_back(name);
  }
  return Status::Ok();
}

}  // namespace

std::string NumberedName(const std::string& name, int64_t n, size_t name_max) {
  const std::string suffix = n >= 2 ? "-" + std::to_string(n) : "";
  const bool utf8 = IsValidUtf8(name);
  const size_t dot = name.rfind('.');
  if (dot != std::string::npos && dot > 0) {
    const std::string_view stem(name.data(), dot);
    const std::string_view ext(name.data() + dot, name.size() - dot);
    if (stem.size() + suffix.size() + ext.size() <= name_max) {
      return std::string(stem) + suffix + std::string(ext);
    }
    if (suffix.size() + ext.size() < name_max) {
      const size_t keep = CutLength(stem, name_max - suffix.size() - ext.size(), utf8);
      if (keep >= 1) return std::string(stem.substr(0, keep)) + suffix + std::string(ext);
    }
  }
  // No extension, or one too long to keep: the suffix goes at the end.
  if (suffix.size() >= name_max) return "";
  const size_t keep = CutLength(name, name_max - suffix.size(), utf8);
  if (keep == 0) return "";
  return name.substr(0, keep) + suffix;
}

Status PrepareDestinationRoot(const std::string& root, bool create_root,
                              std::string* absolute_root) {
  if (root.empty()) return Status::InvalidArgument("the destination folder is empty");
  if (create_root) {
    std::error_code ec;
    std::filesystem::create_directories(root, ec);
    if (ec) {
      return Status::IoError(root + ": cannot create the folder: " + ec.message());
    }
  }
  char* resolved = ::realpath(root.c_str(), nullptr);
  if (resolved == nullptr) {
    if (errno == ENOENT) return Status::NotFound(root + ": no such folder");
    return Status::IoError(root + ": " + Reason(errno));
  }
  std::string path(resolved);
  std::free(resolved);
  struct stat st;
  if (::stat(path.c_str(), &st) != 0) return Status::IoError(root + ": " + Reason(errno));
  if (!S_ISDIR(st.st_mode)) return Status::InvalidArgument(root + " is not a folder");
  *absolute_root = std::move(path);
  return Status::Ok();
}

Status ChooseDestination(const std::string& absolute_root, const std::string& folder,
                         const std::string& name, std::string* destination) {
  const std::string folder_path = Join(absolute_root, folder);
  if (!IsPlainName(folder)) {
    return Status::InvalidArgument(folder_path + ": not a plain folder name");
  }
  if (!IsPlainName(name)) {
    return Status::InvalidArgument(Join(folder_path, name) + ": not a plain file name");
  }
  Fd root_fd(::open(absolute_root.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC));
  if (!root_fd.valid()) {
    return Status::IoError(absolute_root + ": cannot open the folder: " + Reason(errno));
  }
  Status entry = CheckFolderEntry(root_fd.get(), folder_path, folder);
  if (entry.code() == Status::Code::kNotFound) {
    // Created on delivery: the name itself is free.
    std::string first = NumberedName(name, 1, NameMax(root_fd.get()));
    if (first.empty()) return NoFreeName(folder_path, name);
    *destination = Join(folder_path, first);
    return Status::Ok();
  }
  if (!entry.ok()) return entry;
  Fd dir;
  Status s = OpenDeliveryFolder(absolute_root, folder, /*create=*/false, &dir);
  if (!s.ok()) return s;
  const size_t name_max = NameMax(dir.get());
  for (int64_t n = 1; n <= kMaxNameTries; ++n) {
    const std::string candidate = NumberedName(name, n, name_max);
    if (candidate.empty()) break;
    struct stat st;
    if (::fstatat(dir.get(), candidate.c_str(), &st, AT_SYMLINK_NOFOLLOW) == 0) continue;
    if (errno != ENOENT) {
      return Status::IoError(Join(folder_path, candidate) + ": " + Reason(errno));
    }
    *destination = Join(folder_path, candidate);
    return Status::Ok();
  }
  return NoFreeName(folder_path, name);
}

Status Deliver(const std::string& source, const std::string& wanted, DeliveryMode mode,
               Delivered* out) {
  Places p;
  p.source = source;
  std::string source_dir, wanted_name, root, folder;
  if (!SplitPath(source, &source_dir, &p.source_name) || !IsPlainName(p.source_name)) {
    return Status::InvalidArgument(source + ": not a file path");
  }
  if (!SplitPath(wanted, &p.folder_path, &wanted_name) || !IsPlainName(wanted_name) ||
      !SplitPath(p.folder_path, &root, &folder)) {
    return Status::InvalidArgument(wanted + ": not a destination DEST/<folder>/<name>");
  }

  Status s = OpenSourceFolder(source_dir, &p.source_dir);
  if (!s.ok()) return s;
  struct stat st;
  if (::fstatat(p.source_dir.get(), p.source_name.c_str(), &st, AT_SYMLINK_NOFOLLOW) != 0) {
    if (errno == ENOENT) return Status::NotFound(source + ": no such file");
    return Status::IoError(source + ": " + Reason(errno));
  }
  if (S_ISLNK(st.st_mode)) {
    return Status::InvalidArgument(source + " is a symbolic link; not followed");
  }
  if (!S_ISREG(st.st_mode)) return Status::InvalidArgument(source + " is not a regular file");

  size_t name_max = NAME_MAX;
  s = DeliveryFolders().Open(root, folder, &p.folder, &name_max);
  if (!s.ok()) return s;
  NameSequence names(wanted_name, p.source_name, name_max);

  *out = Delivered();
  std::string name;
  if (mode == DeliveryMode::kLink) {
    for (;;) {
      if (!names.Next(&name)) return NoFreeName(p.folder_path, p.source_name);
      if (::linkat(p.source_dir.get(), p.source_name.c_str(), p.folder.get(), name.c_str(),
                   0) == 0) {
        out->destination = Join(p.folder_path, name);
        return Status::Ok();
      }
      if (errno == EEXIST) continue;
      if (errno == EXDEV) {
        return Status::InvalidArgument(source + ": cannot hard-link into " + p.folder_path +
                                       ": it is on another filesystem (use --copy or --move)");
      }
      return Status::IoError(Join(p.folder_path, name) + ": cannot link " + source +
                             " there: " + Reason(errno));
    }
  }

  if (mode == DeliveryMode::kMove && !TestSwitch("CHUTE_TEST_FORCE_COPY")) {
    for (;;) {
      if (!names.Next(&name)) return NoFreeName(p.folder_path, p.source_name);
      const int err = RenameNoReplace(p.source_dir.get(), p.source_name, p.folder.get(), name);
      if (err == 0) {
        out->destination = Join(p.folder_path, name);
        return Status::Ok();
      }
      if (err == EEXIST) continue;
      if (err == EXDEV) break;  // across filesystems: the copy path
      return Status::IoError(source + ": cannot move it to " + Join(p.folder_path, name) +
                             ": " + Reason(err));
    }
    // Start the names again: the ones found taken may have been freed.
    names = NameSequence(wanted_name, p.source_name, name_max);
  }

  const bool move = mode == DeliveryMode::kMove;
  s = CopyDeliver(p, names, /*remove_source=*/move, &name);
  if (!s.ok()) return s;
  out->destination = Join(p.folder_path, name);
  out->crossed_filesystems = move;
  return Status::Ok();
}

Status FinishPending(const std::string& source, const std::string& destination,
                     DeliveryMode mode, const std::string& digest, PendingState* state,
                     Delivered* out) {
  *out = Delivered();
  if (digest.empty()) {
    return Status::InvalidArgument(source + ": the logged delivery has no digest");
  }
  // A file counts as the document only when its bytes have the digest: a
  // different file that took the name since is never removed or taken for
  // it.
  bool source_holds = false, destination_holds = false;
  Status s = HoldsDocument(source, digest, &source_holds);
  if (!s.ok()) return s;
  s = HoldsDocument(destination, digest, &destination_holds);
  if (!s.ok()) return s;

  if (destination_holds && (!source_holds || mode != DeliveryMode::kMove)) {
    *state = PendingState::kDone;
    out->destination = destination;
    return Status::Ok();
  }
  if (destination_holds) {  // a move, the document in both places
    *state = PendingState::kBothThere;
    if (::unlink(source.c_str()) != 0 && errno != ENOENT) {
      return Status::IoError(source + ": cannot remove it (already delivered to " +
                             destination + "): " + Reason(errno));
    }
    std::string dir, base;
    if (SplitPath(source, &dir, &base)) {
      Fd dir_fd(::open(dir.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC));
      if (dir_fd.valid()) ::fsync(dir_fd.get());
    }
    out->destination = destination;
    return Status::Ok();
  }
  if (source_holds) {
    // Not delivered (or the destination's name was taken by another file
    // meanwhile): deliver now, to the logged name or the next free one.
    *state = PendingState::kNotStarted;
    return Deliver(source, destination, mode, out);
  }
  *state = PendingState::kLost;
  return Status::Ok();
}

Status CleanTemporaryFiles(const std::string& absolute_root, int64_t* removed) {
  *removed = 0;
  Fd root_fd(::open(absolute_root.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC));
  if (!root_fd.valid()) {
    return Status::IoError(absolute_root + ": cannot open the folder: " + Reason(errno));
  }
  Fd root_listing(::dup(root_fd.get()));
  if (!root_listing.valid()) return Status::IoError(absolute_root + ": " + Reason(errno));
  std::vector<std::string> folders;
  Status s = ListFolder(std::move(root_listing), absolute_root, &folders);
  if (!s.ok()) return s;
  for (const std::string& folder : folders) {
    // Only real folders: a symbolic link below DEST is not followed.
    Fd dir(::openat(root_fd.get(), folder.c_str(),
                    O_RDONLY | O_DIRECTORY | O_NOFOLLOW | O_CLOEXEC));
    if (!dir.valid()) continue;  // a file, a link, or gone meanwhile
    const std::string folder_path = Join(absolute_root, folder);
    Fd listing(::dup(dir.get()));
    if (!listing.valid()) return Status::IoError(folder_path + ": " + Reason(errno));
    std::vector<std::string> names;
    s = ListFolder(std::move(listing), folder_path, &names);
    if (!s.ok()) return s;
    int64_t here = 0;
    for (const std::string& name : names) {
      if (name.rfind(kTempPrefix, 0) != 0) continue;
      struct stat st;
      if (::fstatat(dir.get(), name.c_str(), &st, AT_SYMLINK_NOFOLLOW) != 0) continue;
      if (!S_ISREG(st.st_mode)) continue;
      if (::unlinkat(dir.get(), name.c_str(), 0) != 0) {
        if (errno == ENOENT) continue;
        return Status::IoError(Join(folder_path, name) + ": cannot remove: " + Reason(errno));
      }
      ++here;
    }
    if (here > 0) ::fsync(dir.get());
    *removed += here;
  }
  return Status::Ok();
}

}  // namespace chute
