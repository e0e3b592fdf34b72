#include "tests/e2e/chute_runner.h"

#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <regex>
#include <stdexcept>

namespace chute::testing {

std::string ReadBytes(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), {});
}

RunResult RunChute(const std::vector<std::string>& args, const std::string& cwd,
                   const std::string& input) {
  // The child may exit before it has read all its input; writing to the
  // pipe must then fail with EPIPE here, not kill the test.
  static const bool ignore_sigpipe = [] {
    signal(SIGPIPE, SIG_IGN);
    return true;
  }();
  (void)ignore_sigpipe;
  int in[2], out[2], err[2];
  if (pipe(in) != 0 || pipe(out) != 0 || pipe(err) != 0) throw std::runtime_error("pipe");
  pid_t pid = fork();
  if (pid == 0) {
    dup2(in[0], 0);
    dup2(out[1], 1);
    dup2(err[1], 2);
    for (int fd : {in[0], in[1], out[0], out[1], err[0], err[1]}) close(fd);
    signal(SIGPIPE, SIG_DFL);  // chute itself runs with the usual disposition
    if (chdir(cwd.c_str()) != 0) _exit(127);
    unsetenv("CHUTE_DB");
    std::vector<char*> argv;
    std::string binary = CHUTE_BINARY;
    argv.push_back(binary.data());
    std::vector<std::string> copy = args;
    for (std::string& a : copy) argv.push_back(a.data());
    argv.push_back(nullptr);
    execv(binary.c_str(), argv.data());
    _exit(127);
  }
  close(in[0]);
  close(out[1]);
  close(err[1]);
  // Feed stdin and drain both outputs without blocking on any of them.
  size_t written = 0;
  if (input.empty()) close(in[1]);
  fcntl(in[1], F_SETFL, O_NONBLOCK);
  RunResult r;
  bool in_open = !input.empty(), out_open = true, err_open = true;
  char buf[65536];
  while (out_open || err_open) {
    std::vector<pollfd> fds;
    if (in_open) fds.push_back({in[1], POLLOUT, 0});
    if (out_open) fds.push_back({out[0], POLLIN, 0});
    if (err_open) fds.push_back({err[0], POLLIN, 0});
    poll(fds.data(), fds.size(), -1);
    for (const pollfd& p : fds) {
      if (p.revents == 0) continue;
      if (p.fd == in[1]) {
        ssize_t n = write(in[1], input.data() + written, input.size() - written);
        if (n > 0) written += static_cast<size_t>(n);
        if (n < 0 || written == input.size()) {
          close(in[1]);
          in_open = false;
        }
        continue;
      }
      ssize_t n = read(p.fd, buf, sizeof buf);
      if (n <= 0) {
        close(p.fd);
        (p.fd == out[0] ? out_open : err_open) = false;
      } else {
        (p.fd == out[0] ? r.out : r.err).append(buf, static_cast<size_t>(n));
      }
    }
  }
  if (in_open) close(in[1]);
  int status = 0;
  waitpid(pid, &status, 0);
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
  return r;
}

TempDir::TempDir() {
  std::string templ = (std::filesystem::temp_directory_path() / "chute-e2e-XXXXXX").string();
  if (mkdtemp(templ.data()) == nullptr) throw std::runtime_error("mkdtemp");
  path_ = templ;
}

TempDir::~TempDir() {
  std::error_code ec;
  std::filesystem::remove_all(path_, ec);
}

std::string TempDir::Write(const std::string& rel, const std::string& bytes) const {
  std::filesystem::path p = std::filesystem::path(path_) / rel;
  std::filesystem::create_directories(p.parent_path());
  std::ofstream(p, std::ios::binary) << bytes;
  return p.string();
}

std::string WithoutModelVersion(const std::string& jsonl) {
  static const std::regex kField(R"("model_version":[0-9]+,)");
  return std::regex_replace(jsonl, kField, "");
}

std::vector<std::string> Lines(const std::string& text) {
  std::vector<std::string> lines;
  size_t pos = 0;
  while (pos < text.size()) {
    size_t end = text.find('\n', pos);
    if (end == std::string::npos) end = text.size();
    std::string line = text.substr(pos, end - pos);
    if (!line.empty() && line.back() == '\r') line.pop_back();
    lines.push_back(line);
    pos = end + 1;
  }
  return lines;
}

}  // namespace chute::testing
