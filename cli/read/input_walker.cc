#include "cli/read/input_walker.h"

#include <dirent.h>
#include <sys/stat.h>

#include <algorithm>
#include <cerrno>
#include <cstring>

namespace chute {

namespace {

// Walks folder `dir` (whose path is `path`, relative path `rel`), collecting
// regular files.
void WalkFolder(const std::string& path, const std::string& rel,
                std::vector<InputFile>* files, std::vector<WalkProblem>* problems) {
  DIR* d = ::opendir(path.c_str());
  if (d == nullptr) {
    problems->push_back({path, std::string("cannot read folder: ") + std::strerror(errno)});
    return;
  }
  std::vector<std::string> names;
  while (dirent* e = ::readdir(d)) {
    if (e->d_name[0] == '.') continue;  // ".", "..", and hidden names
    names.emplace_back(e->d_name);
  }
  ::closedir(d);
  std::sort(names.begin(), names.end());
  for (const std::string& name : names) {
    std::string child = path.empty() || path.back() == '/' ? path + name : path + "/" + name;
    std::string child_rel = rel.empty() ? name : rel + "/" + name;
    struct stat st;
    if (::lstat(child.c_str(), &st) != 0) {
      problems->push_back({child, std::strerror(errno)});
    } else if (S_ISLNK(st.st_mode)) {
      problems->push_back({child, "symbolic link, not followed"});
    } else if (S_ISDIR(st.st_mode)) {
      WalkFolder(child, child_rel, files, problems);
    } else if (S_ISREG(st.st_mode)) {
      files->push_back({child, child_rel});
    } else {
      problems->push_back({child, "not a regular file"});
    }
  }
}

}  // namespace

void WalkInput(const std::string& arg, std::vector<InputFile>* files,
               std::vector<WalkProblem>* problems) {
  if (arg == "-") {
    files->push_back({arg, ""});
    return;
  }
  struct stat st;
  if (::stat(arg.c_str(), &st) != 0) {
    problems->push_back({arg, errno == ENOENT ? "no such file or folder" : std::strerror(errno)});
    return;
  }
  if (!S_ISDIR(st.st_mode)) {
    files->push_back({arg, ""});
    return;
  }
  size_t first = files->size();
  WalkFolder(arg, "", files, problems);
  // Per-folder name order differs from whole-path byte order when a name
  // is a prefix of another ("a/x" vs "a.txt"); sort the walk's paths.
  std::sort(files->begin() + static_cast<std::ptrdiff_t>(first), files->end(),
            [](const InputFile& a, const InputFile& b) { return a.path < b.path; });
}

void WalkInputs(const std::vector<std::string>& args, std::vector<InputFile>* files,
                std::vector<WalkProblem>* problems) {
  for (const std::string& arg : args) WalkInput(arg, files, problems);
}

}  // namespace chute
