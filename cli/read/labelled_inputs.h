// Labelled documents, in the three ways a user can name them:
//   a folder tree   ROOT/<queue>/**   (every file below a queue's folder)
//   a CSV manifest  header path,queue (see manifest_reader.h)
//   a queue name and files or folders (walked by input_walker.h's rule)
#ifndef CHUTE_CLI_READ_LABELLED_INPUTS_H_
#define CHUTE_CLI_READ_LABELLED_INPUTS_H_

#include <string>
#include <vector>

#include "cli/read/input_walker.h"
#include "store/status.h"

namespace chute {

struct LabelledFile {
  std::string path;
  std::string queue;
  // Where it was named, for messages: "manifest.csv: line 7", or empty.
  std::string context;
};

// ROOT/<queue>/**. Files directly in ROOT, and folders whose name is not a
// valid queue name, are reported in *problems.
Status CollectTree(const std::string& root, std::vector<LabelledFile>* files,
                   std::vector<WalkProblem>* problems);

// The manifest's rows; rows with an invalid queue name are reported.
Status CollectManifest(const std::string& csv_path, std::vector<LabelledFile>* files,
                       std::vector<WalkProblem>* problems);

// Every file named or below a folder named, all under one queue.
// Fails when the queue name is invalid.
Status CollectQueue(const std::string& queue, const std::vector<std::string>& inputs,
                    std::vector<LabelledFile>* files, std::vector<WalkProblem>* problems);

}  // namespace chute

#endif  // CHUTE_CLI_READ_LABELLED_INPUTS_H_
