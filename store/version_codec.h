// The encodings a version's history is kept in (schema.h: versions,
// snapshots, candidate): a membership blob and a header of settings and
// queues. Shared by the version log, the rebuild and the candidate.
#ifndef CHUTE_STORE_VERSION_CODEC_H_
#define CHUTE_STORE_VERSION_CODEC_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "store/store.h"
#include "store/store_settings.h"

namespace chute {

// Members (ledger id, queue id), sorted by ledger id and distinct, as
// varint(id - previous id) varint(queue id), LEB128 varints (common
// practice; as in Protocol Buffers).
std::string EncodeMembers(const std::vector<std::pair<int64_t, int64_t>>& members);
// False on a malformed blob.
bool DecodeMembers(std::string_view blob, std::vector<std::pair<int64_t, int64_t>>* out);

// Settings and queues, one per line:
//   s <key> <value>
//   q <id> <retired 0|1> <hand-set prior or -> <name>
std::string EncodeHeader(const StoreSettings& settings, const std::vector<VersionQueue>& queues);
// False on a malformed header or settings chute cannot use.
bool DecodeHeader(std::string_view text, StoreSettings* settings,
                  std::vector<VersionQueue>* queues);

}  // namespace chute

#endif  // CHUTE_STORE_VERSION_CODEC_H_
