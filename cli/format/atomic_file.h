// Writing a report file whole or not at all.
#ifndef CHUTE_CLI_FORMAT_ATOMIC_FILE_H_
#define CHUTE_CLI_FORMAT_ATOMIC_FILE_H_

#include <string>

#include "store/status.h"

namespace chute {

// Writes content to a new temporary file beside path (same folder, name
// beginning with '.'), flushes it to disk, then renames it over path
// (rename(2) is atomic within a file system: readers see the old file or
// the new one, never half of one; common practice). On failure the
// temporary file is removed and path is left as it was. The file has mode
// 0600, as mkstemp(3) makes it: reports can hold personal data (file
// names); widen it by hand to share.
Status WriteFileAtomically(const std::string& path, const std::string& content);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_ATOMIC_FILE_H_
