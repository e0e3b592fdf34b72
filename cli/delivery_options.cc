#include "cli/delivery_options.h"

#include <chrono>
#include <filesystem>
#include <system_error>

#include "cli/common_options.h"

namespace chute {

std::vector<std::pair<std::string, CLI::Option*>> AddDeliveryOptions(
    CLI::App* cmd, DeliveryChoices* c, const std::string& help_prefix) {
  std::vector<std::pair<std::string, CLI::Option*>> added;
  auto add = [&](const std::string& name, CLI::Option* option) {
    added.emplace_back(name, option);
  };
  add("--move", cmd->add_flag("--move", c->move, help_prefix + "move the documents"));
  add("--copy", cmd->add_flag("--copy", c->copy,
                              help_prefix + "copy them (documents copied before are skipped)"));
  add("--link", cmd->add_flag("--link", c->link,
                              help_prefix +
                                  "hard-link them (same filesystem only; linked before are "
                                  "skipped)"));
  add("--hold-below",
      cmd->add_option("--hold-below", c->hold_below,
                      "P: send documents whose confidence is below P to the review folder "
                      "(overrides every queue's own threshold)")
          ->check(CLI::Range(0.0, 1.0))
          ->type_name("P"));
  add("--audit-share",
      cmd->add_option("--audit-share", c->audit_share,
                      "S: also send this share (0 to 1) of the documents routed automatically "
                      "to review, marked audit")
          ->check(CLI::Range(0.0, 1.0))
          ->type_name("S"));
  add("--audit-seed",
      cmd->add_option("--audit-seed", c->audit_seed,
                      "N: the seed of the audit draw (default: from the clock, printed)")
          ->type_name("N"));
  add("--set-aside", cmd->add_flag("--set-aside", c->set_aside,
                                   help_prefix + "move unreadable documents to DEST/_unreadable/"));
  add("--by", cmd->add_option("--by", c->by,
                              "NAME: who routes, recorded in the log (default: your login name)")
                  ->type_name("NAME"));
  c->by = LoginName();
  return added;
}

std::string ModeProblem(const DeliveryChoices& c) {
  const int modes = c.move + c.copy + c.link;
  if (modes == 1) return "";
  return modes == 0 ? "needs one of --move, --copy or --link"
                    : "--move, --copy and --link exclude each other: choose one";
}

void ToFolderRouteOptions(const DeliveryChoices& c, FolderRouteOptions* fo) {
  fo->into = c.into;
  fo->mode = c.move ? DeliveryMode::kMove : c.copy ? DeliveryMode::kCopy : DeliveryMode::kLink;
  fo->set_aside = c.set_aside;
  fo->hold_below = c.hold_below;
  fo->audit_share = c.audit_share;
  fo->audit_seed = c.audit_seed ? *c.audit_seed
                                : static_cast<uint64_t>(
                                      std::chrono::system_clock::now().time_since_epoch().count());
  fo->by = c.by;
}

bool LiesInside(const std::string& inner, const std::string& outer) {
  auto canonical = [](const std::string& p) {
    std::error_code ec;
    std::string c = std::filesystem::weakly_canonical(p, ec).lexically_normal().string();
    while (c.size() > 1 && c.back() == '/') c.pop_back();
    return c;
  };
  const std::string in = canonical(inner), out = canonical(outer);
  return in == out || in.rfind(out == "/" ? "/" : out + "/", 0) == 0;
}

}  // namespace chute
