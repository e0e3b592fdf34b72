// Reading one document: a file or standard input to UTF-8 text.
//
// Rules (the same for every command):
//  - a document larger than ReadOptions::max_bytes is refused;
//  - a document whose first 8 KiB hold a NUL byte is refused as binary
//    (common practice: the test of diff and grep);
//  - otherwise ill-formed UTF-8 is replaced by U+FFFD and the number of
//    replacements is reported, never an error.
// The digest is the SHA-256 of the raw bytes, before any replacement.
#ifndef CHUTE_CLI_READ_DOCUMENT_READER_H_
#define CHUTE_CLI_READ_DOCUMENT_READER_H_

#include <cstdint>
#include <string>

#include "store/status.h"

namespace chute {

// Bytes inspected for a NUL byte before a document is taken as text.
inline constexpr size_t kBinaryProbeBytes = 8192;
// Default size limit of one document: 32 MiB.
inline constexpr int64_t kDefaultMaxBytes = int64_t{32} << 20;

struct ReadOptions {
  int64_t max_bytes = kDefaultMaxBytes;  // larger documents are refused
};

struct Document {
  std::string source;     // the path as given; "-" for standard input
  std::string digest;     // SHA-256 of the raw bytes, lowercase hex
  std::string text;       // well-formed UTF-8
  int64_t bytes = 0;      // size of the raw bytes
  int64_t replaced = 0;   // ill-formed sequences replaced by U+FFFD
};

// Reads path ("-" reads standard input). On error, the Status message is one
// line naming the path and the reason.
Status ReadDocument(const std::string& path, const ReadOptions& options,
                    Document* out);

// Checks raw bytes against the rules above and fills *out.
Status DocumentFromBytes(const std::string& source, std::string raw,
                         const ReadOptions& options, Document* out);

}  // namespace chute

#endif  // CHUTE_CLI_READ_DOCUMENT_READER_H_
