// `chute correct --from-folders DEST`: learns what reviewers did in the
// destination folders (cli/deliver/folder_review.h), in one transaction.
#ifndef CHUTE_CLI_CORRECT_FROM_FOLDERS_H_
#define CHUTE_CLI_CORRECT_FROM_FOLDERS_H_

#include <cstdint>
#include <string>

#include "cli/common_options.h"

namespace chute {

struct CorrectFromFoldersOptions {
  std::string db;
  std::string dest;           // DEST as given
  std::string confirm_after;  // an age or time (older_than.h); empty: confirm none
  std::string by;
  bool create_queues = false;
  bool dry_run = false;  // plan and print, learn nothing
  OutputFormat format = OutputFormat::kTable;
  int64_t max_bytes = 0;
};

// Returns an ExitCode.
int RunCorrectFromFolders(const CorrectFromFoldersOptions& options);

}  // namespace chute

#endif  // CHUTE_CLI_CORRECT_FROM_FOLDERS_H_
