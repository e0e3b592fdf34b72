// Writing a command's report files (--json FILE, --html FILE, --csv DIR),
// each whole or not at all (atomic_file.h); shared by evaluate and
// evaluate --from-log.
#ifndef CHUTE_CLI_FORMAT_REPORT_FILES_H_
#define CHUTE_CLI_FORMAT_REPORT_FILES_H_

#include <string>
#include <utility>
#include <vector>

#include "store/status.h"

namespace chute {

// The content of each report file asked for (an empty path: not asked).
struct ReportFiles {
  std::string json_path, json;
  std::string html_path, html;
  std::string csv_dir;  // created (mode 0700) when missing
  std::vector<std::pair<std::string, std::string>> csv_files;  // (name, content)
};

// Writes them in the order json, html, csv; stops at the first failure,
// whose message names the file.
Status WriteReportFiles(const ReportFiles& files);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_REPORT_FILES_H_
