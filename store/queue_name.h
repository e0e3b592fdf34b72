#ifndef CHUTE_STORE_QUEUE_NAME_H_
#define CHUTE_STORE_QUEUE_NAME_H_

#include <string_view>

#include "store/status.h"

namespace chute {

// Longest queue name, in bytes; well under every filesystem's name limit.
inline constexpr size_t kMaxQueueNameBytes = 100;

// A queue name becomes a folder name, so it must be safe as one
// (DESIGN.md, "Non-negotiables"): not empty, at most kMaxQueueNameBytes
// bytes of valid UTF-8, no '/' or '\', no control characters (C0, DEL, C1),
// no line or paragraph separators and no format characters (Unicode general
// categories Zl, Zp, Cf: bidi controls, zero-width characters),
// not "." or "..", not beginning with '.' (hidden, and skipped by every
// folder walk) nor with '_' (kept for chute's own folders such as the review
// folder), and no leading or trailing spaces.
Status ValidateQueueName(std::string_view name);

}  // namespace chute

#endif  // CHUTE_STORE_QUEUE_NAME_H_
