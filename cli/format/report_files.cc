#include "cli/format/report_files.h"

#include <sys/stat.h>

#include <cerrno>
#include <cstring>

#include "cli/format/atomic_file.h"

namespace chute {

Status WriteReportFiles(const ReportFiles& f) {
  if (!f.json_path.empty()) {
    if (Status s = WriteFileAtomically(f.json_path, f.json); !s.ok()) return s;
  }
  if (!f.html_path.empty()) {
    if (Status s = WriteFileAtomically(f.html_path, f.html); !s.ok()) return s;
  }
  if (!f.csv_dir.empty()) {
    if (::mkdir(f.csv_dir.c_str(), 0700) != 0 && errno != EEXIST) {
      return Status::IoError(f.csv_dir + ": cannot create the folder: " + std::strerror(errno));
    }
    struct stat st;
    if (::stat(f.csv_dir.c_str(), &st) != 0 || !S_ISDIR(st.st_mode)) {
      return Status::InvalidArgument(f.csv_dir + ": not a folder");
    }
    const std::string folder = f.csv_dir.back() == '/' ? f.csv_dir : f.csv_dir + "/";
    for (const auto& [name, content] : f.csv_files) {
      if (Status s = WriteFileAtomically(folder + name, content); !s.ok()) return s;
    }
  }
  return Status::Ok();
}

}  // namespace chute
