// What `route --into` and `watch` share between their command lines and
// the folder router: the delivery choices, turned into FolderRouteOptions,
// and the check that DEST does not lie inside an inbox.
#ifndef CHUTE_CLI_DELIVERY_OPTIONS_H_
#define CHUTE_CLI_DELIVERY_OPTIONS_H_

#include <CLI/CLI.hpp>

#include <cstdint>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "cli/deliver/folder_router.h"

namespace chute {

struct DeliveryChoices {
  std::string into;
  bool move = false, copy = false, link = false;
  bool set_aside = false;
  std::optional<double> hold_below;
  double audit_share = 0;
  std::optional<uint64_t> audit_seed;
  std::string by;
};

// Adds --move, --copy, --link, --hold-below, --audit-share, --audit-seed,
// --set-aside and --by (default: the login name) to cmd, each help text
// beginning with help_prefix; returns them by name, so that a command can
// tell whether any was given.
std::vector<std::pair<std::string, CLI::Option*>> AddDeliveryOptions(
    CLI::App* cmd, DeliveryChoices* c, const std::string& help_prefix);

// Empty when exactly one of --move, --copy and --link was given; else the
// usage error to report.
std::string ModeProblem(const DeliveryChoices& c);

// The router's options for these choices (mode, hold, audit, by); the audit
// seed is taken from the clock when none was given, so the caller prints
// fo->audit_seed for the draw to be made again.
void ToFolderRouteOptions(const DeliveryChoices& c, FolderRouteOptions* fo);

// Whether `inner` is `outer` or lies below it, both resolved (symbolic
// links followed as far as the paths exist).
bool LiesInside(const std::string& inner, const std::string& outer);

}  // namespace chute

#endif  // CHUTE_CLI_DELIVERY_OPTIONS_H_
