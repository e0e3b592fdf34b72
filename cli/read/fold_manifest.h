// Folds given by hand for cross-validation (chute evaluate --folds-csv): a
// CSV file (RFC 4180) with a header naming the column `fold` and either
// `digest` (a learned document's SHA-256, or a prefix of it of at least 12
// hex digits) or `path` (a file, read to find its digest; relative paths
// are relative to the folder of the CSV file). A `queue` column, when
// present, must agree with the queue the document was learned under.
// Other columns are ignored.
#ifndef CHUTE_CLI_READ_FOLD_MANIFEST_H_
#define CHUTE_CLI_READ_FOLD_MANIFEST_H_

#include <cstdint>
#include <string>
#include <vector>

#include "store/status.h"

namespace chute {

// The shortest digest prefix a fold manifest may name a document by.
inline constexpr size_t kMinDigestPrefix = 12;

struct FoldRow {
  int64_t line = 0;    // where the record starts in the CSV file
  std::string digest;  // lowercase hex (a prefix), or empty when path is given
  std::string path;    // resolved against the CSV's folder, or empty
  std::string queue;   // empty when the file has no queue column
  int64_t fold = 0;    // as written: a positive integer
};

// Reads the whole file. Fails, naming the file and line, on a missing
// column, an empty digest or path, a digest that is not hexadecimal or
// shorter than kMinDigestPrefix, or a fold that is not a positive integer.
Status ReadFoldManifest(const std::string& csv_path, std::vector<FoldRow>* rows);

}  // namespace chute

#endif  // CHUTE_CLI_READ_FOLD_MANIFEST_H_
