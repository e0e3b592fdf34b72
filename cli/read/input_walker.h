// The one rule by which every command turns its arguments into documents.
//
//  - "-" is standard input;
//  - a file named on the command line is taken as it is (a symbolic link
//    named there is followed: the user chose it);
//  - a folder is walked recursively; its files are taken in byte order of
//    their whole paths; names beginning with '.' are skipped, files and
//    folders alike; symbolic links met in the walk are not followed and are
//    reported; other special files (FIFOs, sockets, devices) are reported.
#ifndef CHUTE_CLI_READ_INPUT_WALKER_H_
#define CHUTE_CLI_READ_INPUT_WALKER_H_

#include <string>
#include <vector>

namespace chute {

struct WalkProblem {
  std::string path;
  std::string reason;
};

struct InputFile {
  std::string path;  // as given, or folder argument + '/' + relative path
  std::string relative;  // path below the folder argument; empty for files
};

// Expands one argument after the rule above, appending to *files and
// *problems. A missing path is a problem, not a crash.
void WalkInput(const std::string& arg, std::vector<InputFile>* files,
               std::vector<WalkProblem>* problems);

// Expands every argument in order.
void WalkInputs(const std::vector<std::string>& args, std::vector<InputFile>* files,
                std::vector<WalkProblem>* problems);

}  // namespace chute

#endif  // CHUTE_CLI_READ_INPUT_WALKER_H_
