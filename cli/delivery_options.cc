#include "cli/delivery_options.h"

#include <chrono>
#include <filesystem>
#include <system_error>

namespace chute {

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
