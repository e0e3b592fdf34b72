#include "cli/format/atomic_file.h"

#include <fcntl.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <vector>

namespace chute {

Status WriteFileAtomically(const std::string& path, const std::string& content) {
  std::string folder, name = path;
  if (size_t slash = path.rfind('/'); slash != std::string::npos) {
    folder = path.substr(0, slash + 1);
    name = path.substr(slash + 1);
  }
  if (name.empty()) return Status::InvalidArgument(path + ": not a file name");
  std::string pattern = folder + "." + name + ".tmp-XXXXXX";
  std::vector<char> temp(pattern.begin(), pattern.end());
  temp.push_back('\0');
  const int fd = ::mkstemp(temp.data());
  if (fd < 0) return Status::IoError(path + ": cannot create a file beside it: " + std::strerror(errno));
  const std::string temp_path(temp.data());
  auto fail = [&](const std::string& what) {
    const std::string reason = std::strerror(errno);
    ::close(fd);
    ::unlink(temp_path.c_str());
    return Status::IoError(path + ": " + what + ": " + reason);
  };
  size_t written = 0;
  while (written < content.size()) {
    const ssize_t n = ::write(fd, content.data() + written, content.size() - written);
    if (n < 0) {
      if (errno == EINTR) continue;
      return fail("cannot write");
    }
    written += static_cast<size_t>(n);
  }
  if (::fsync(fd) != 0) return fail("cannot flush to disk");
  if (::close(fd) != 0) {
    ::unlink(temp_path.c_str());
    return Status::IoError(path + ": cannot close: " + std::strerror(errno));
  }
  if (::rename(temp_path.c_str(), path.c_str()) != 0) {
    const std::string reason = std::strerror(errno);
    ::unlink(temp_path.c_str());
    return Status::IoError(path + ": cannot rename into place: " + reason);
  }
  return Status::Ok();
}

}  // namespace chute
