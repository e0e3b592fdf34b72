// How a user names a learned document on the command line or in a
// corrections file: a path (the digest of the file as it is now, falling
// back to the source path the ledger stored) or a digest prefix of at least
// kMinDigestPrefix hex digits. Store::ResolveDocument does the looking up.
#ifndef CHUTE_CLI_READ_DOCUMENT_NAME_H_
#define CHUTE_CLI_READ_DOCUMENT_NAME_H_

#include <string>

#include "cli/read/document_reader.h"
#include "store/status.h"
#include "store/store.h"

namespace chute {

// Shorter prefixes are taken as paths only.
inline constexpr size_t kMinDigestPrefix = 8;

struct NamedDocument {
  std::string path;      // the argument as a path (after `folder` was applied)
  bool is_file = false;  // a readable regular file is there
  Status read_status;    // why the file could not be read, when it could not
  Document document;     // the file's contents, when is_file and read
  DocumentName name;     // what to look up
};

// Builds the name for `arg`. A relative path is taken relative to `folder`
// (empty: the working folder). An existing file is read (and its digest
// taken); an argument of 8 to 64 hex digits (any case) is also a prefix.
void NameDocument(const std::string& arg, const std::string& folder,
                  const ReadOptions& options, NamedDocument* out);

// Why a name matched no learned document, for the report.
std::string UnknownReason(const std::string& arg, const NamedDocument& named);

// "a1b2c3d4e5f6…" style: the first 12 hex digits, for messages.
std::string ShortDigest(const std::string& digest);

}  // namespace chute

#endif  // CHUTE_CLI_READ_DOCUMENT_NAME_H_
