// A point in time given as an age counted back from now or as an RFC 3339
// time: the cutoff of `purge --older-than`, and the start of `--since`
// (log, evaluate --from-log, drift) and `correct --confirm-after`.
#ifndef CHUTE_CLI_OLDER_THAN_H_
#define CHUTE_CLI_OLDER_THAN_H_

#include <ctime>
#include <string>
#include <string_view>

namespace chute {

// Turns arg into a cutoff, RFC 3339 UTC as the ledger and the decision log
// record times (YYYY-MM-DDTHH:MM:SSZ): entries learned before it are older
// than arg; decisions at or after it are --since arg. Text order of such
// times is time order, so the store compares them as strings.
//
//   Nd, Nh, Nm   N days (of 86400 s), hours or minutes before now; N is 0
//                to 12 decimal digits
//   an RFC 3339 date-time (Klyne & Newman, "Date and Time on the Internet:
//                Timestamps", RFC 3339, 2002, section 5.6; sections
//                recalled from memory), such as
//                2025-01-31T00:00:00Z or 2025-01-31T09:30:00.5+01:00; "t"
//                and "z" may be lowercase (section 5.6, NOTE); a second
//                of 60 (a leap second) counts as the next second; a
//                fraction of a second rounds the cutoff up to the whole
//                second, since the ledger records whole seconds
//
// A cutoff before 1970-01-01T00:00:00Z is that time (nothing was learned
// earlier). Returns false, with the reason in plain words in *why, for any
// other form, a date that does not exist, or a time after now (purge never
// takes what is learned from now on).
bool ParseOlderThan(std::string_view arg, std::time_t now, std::string* cutoff,
                    std::string* why);

}  // namespace chute

#endif  // CHUTE_CLI_OLDER_THAN_H_
