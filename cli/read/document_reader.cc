#include "cli/read/document_reader.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cstring>

#include "cli/read/sha256.h"
#include "cli/read/utf8.h"

namespace chute {

namespace {

std::string Errno(const std::string& path) { return path + ": " + std::strerror(errno); }

std::string TooLarge(const std::string& path, int64_t max_bytes) {
  return path + ": larger than the limit of " + std::to_string(max_bytes) +
         " bytes (see --max-bytes)";
}

// Reads fd to its end, refusing more than max_bytes.
Status ReadAll(int fd, const std::string& path, int64_t max_bytes, std::string* out) {
  out->clear();
  char buf[1 << 16];
  for (;;) {
    ssize_t n = ::read(fd, buf, sizeof buf);
    if (n < 0) {
      if (errno == EINTR) continue;
      return Status::IoError(Errno(path));
    }
    if (n == 0) return Status::Ok();
    if (static_cast<int64_t>(out->size()) + n > max_bytes) {
      return Status::InvalidArgument(TooLarge(path, max_bytes));
    }
    out->append(buf, static_cast<size_t>(n));
  }
}

}  // namespace

Status DocumentFromBytes(const std::string& source, std::string raw,
                         const ReadOptions& options, Document* out) {
  if (static_cast<int64_t>(raw.size()) > options.max_bytes) {
    return Status::InvalidArgument(TooLarge(source, options.max_bytes));
  }
  size_t probe = std::min(raw.size(), kBinaryProbeBytes);
  if (std::memchr(raw.data(), '\0', probe) != nullptr) {
    return Status::InvalidArgument(source + ": binary file (a NUL byte in its first 8 KiB)");
  }
  out->source = source;
  out->bytes = static_cast<int64_t>(raw.size());
  out->digest = Sha256Hex(raw);
  if (IsValidUtf8(raw)) {
    out->text = std::move(raw);
    out->replaced = 0;
  } else {
    out->replaced = ToValidUtf8(raw, &out->text);
  }
  return Status::Ok();
}

Status ReadDocument(const std::string& path, const ReadOptions& options, Document* out) {
  std::string raw;
  if (path == "-") {
    Status s = ReadAll(STDIN_FILENO, "-", options.max_bytes, &raw);
    if (!s.ok()) return s;
    return DocumentFromBytes(path, std::move(raw), options, out);
  }
  int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NOCTTY | O_NONBLOCK);
  if (fd < 0) {
    if (errno == ENOENT) return Status::NotFound(path + ": no such file");
    return Status::IoError(Errno(path));
  }
  struct stat st;
  if (::fstat(fd, &st) != 0) {
    Status s = Status::IoError(Errno(path));
    ::close(fd);
    return s;
  }
  if (S_ISDIR(st.st_mode)) {
    ::close(fd);
    return Status::InvalidArgument(path + ": is a folder");
  }
  if (!S_ISREG(st.st_mode)) {
    ::close(fd);
    return Status::InvalidArgument(path + ": not a regular file");
  }
  if (st.st_size > options.max_bytes) {
    ::close(fd);
    return Status::InvalidArgument(TooLarge(path, options.max_bytes));
  }
  raw.reserve(static_cast<size_t>(st.st_size));
  Status s = ReadAll(fd, path, options.max_bytes, &raw);
  ::close(fd);
  if (!s.ok()) return s;
  return DocumentFromBytes(path, std::move(raw), options, out);
}

}  // namespace chute
