// The encodings of the version history (schema.h: versions.header and
// snapshots.members), shared by the store and its check.
#ifndef CHUTE_STORE_VERSION_CODEC_H_
#define CHUTE_STORE_VERSION_CODEC_H_

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "store/store_settings.h"

namespace chute {

// A queue as a version's header recorded it.
struct VersionQueue {
  int64_t id = 0;
  std::string name;
  std::optional<double> set_prior;
  bool retired = false;
};

// Members (ledger id, queue id), REQUIRES: sorted by ledger id, distinct,
// ids > 0; encoded as LEB128 varint(id - previous id) varint(queue id).
std::string EncodeMembers(const std::vector<std::pair<int64_t, int64_t>>& members);
// False for a malformed blob (a varint cut short, ids not increasing).
bool DecodeMembers(std::string_view blob, std::vector<std::pair<int64_t, int64_t>>* out);

// A version's header, one line per setting and per queue:
//   s <key> <value>
//   q <id> <retired 0|1> <hand-set prior or -> <name>
std::string EncodeHeader(const StoreSettings& settings, const std::vector<VersionQueue>& queues);
// False when a line is malformed or the settings do not decode.
bool DecodeHeader(std::string_view text, StoreSettings* settings,
                  std::vector<VersionQueue>* queues);

}  // namespace chute

#endif  // CHUTE_STORE_VERSION_CODEC_H_
