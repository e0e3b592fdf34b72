// Runs the built chute binary in a child process for end-to-end tests.
#ifndef CHUTE_TESTS_E2E_CHUTE_RUNNER_H_
#define CHUTE_TESTS_E2E_CHUTE_RUNNER_H_

#include <string>
#include <vector>

namespace chute::testing {

struct RunResult {
  int exit_code = -1;
  std::string out;
  std::string err;
};

// Runs CHUTE_BINARY with args in folder cwd, feeding `input` on stdin.
// CHUTE_DB is cleared so that the test decides the store.
RunResult RunChute(const std::vector<std::string>& args, const std::string& cwd,
                   const std::string& input = "");

// A fresh temporary folder, removed by the destructor.
class TempDir {
 public:
  TempDir();
  ~TempDir();
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;
  const std::string& path() const { return path_; }
  // Writes bytes to path()/rel, creating folders on the way.
  std::string Write(const std::string& rel, const std::string& bytes) const;

 private:
  std::string path_;
};

// The bytes of a file; empty when it does not exist.
std::string ReadBytes(const std::string& path);

// Lines of text, without their line ends.
std::vector<std::string> Lines(const std::string& text);

// route's JSON Lines without their "model_version" fields: two stores with
// the same model route alike (same posteriors and fingerprint) though their
// histories, and so their version numbers, differ.
std::string WithoutModelVersion(const std::string& jsonl);

}  // namespace chute::testing

#endif  // CHUTE_TESTS_E2E_CHUTE_RUNNER_H_
