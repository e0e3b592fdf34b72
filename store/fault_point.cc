#include "store/fault_point.h"

#include <unistd.h>

#include <cstdlib>
#include <string>

namespace chute {

void FaultPoint(std::string_view name) {
  // Read once: a function-local static is initialised thread-safely on the
  // first call and costs one comparison afterwards.
  static const std::string armed = [] {
    const char* value = std::getenv(kFaultEnvironmentVariable);
    return std::string(value ? value : "");
  }();
  if (!armed.empty() && armed == name) _exit(kFaultExitCode);
}

}  // namespace chute
