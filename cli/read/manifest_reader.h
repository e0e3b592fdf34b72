// Labelled-data manifests: a CSV file (RFC 4180) with a header naming at
// least the columns `path` and `queue`, one document per record. Relative
// paths are relative to the folder of the CSV file.
#ifndef CHUTE_CLI_READ_MANIFEST_READER_H_
#define CHUTE_CLI_READ_MANIFEST_READER_H_

#include <cstdint>
#include <string>
#include <vector>

#include "cli/read/input_walker.h"
#include "store/status.h"

namespace chute {

struct ManifestRow {
  int64_t line = 0;   // where the record starts in the CSV file
  std::string path;   // resolved against the CSV's folder
  std::string queue;
};

// Reads the manifest. A missing column or a malformed file fails the whole
// read; records with an empty path or queue are reported in *problems
// (path "<csv>: line N") and left out.
Status ReadManifest(const std::string& csv_path, std::vector<ManifestRow>* rows,
                    std::vector<WalkProblem>* problems);

}  // namespace chute

#endif  // CHUTE_CLI_READ_MANIFEST_READER_H_
