// Named fault points for the crash-safety tests (tests/e2e/crash_test.py).
//
// FaultPoint("learn.before_commit") does nothing unless the environment
// variable CHUTE_TEST_FAULT, read once per process, names that point: then
// the process ends at once with _exit(kFaultExitCode), committing and
// cleaning up nothing, as if it had been killed there. Test-only: a user
// never sets the variable (DEVELOPERS.md, "Fault points").
#ifndef CHUTE_STORE_FAULT_POINT_H_
#define CHUTE_STORE_FAULT_POINT_H_

#include <string_view>

namespace chute {

// The exit status of a process stopped at a fault point.
inline constexpr int kFaultExitCode = 86;

// The environment variable that names the fault point to stop at.
inline constexpr const char kFaultEnvironmentVariable[] = "CHUTE_TEST_FAULT";

// Ends the process with _exit(kFaultExitCode) when CHUTE_TEST_FAULT equals
// name; otherwise returns (one comparison after the first call).
void FaultPoint(std::string_view name);

}  // namespace chute

#endif  // CHUTE_STORE_FAULT_POINT_H_
