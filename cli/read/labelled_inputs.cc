#include "cli/read/labelled_inputs.h"

#include <sys/stat.h>

#include "cli/read/manifest_reader.h"
#include "store/queue_name.h"

namespace chute {

Status CollectTree(const std::string& root, std::vector<LabelledFile>* files,
                   std::vector<WalkProblem>* problems) {
  struct stat st;
  if (::stat(root.c_str(), &st) != 0) return Status::NotFound(root + ": no such folder");
  if (!S_ISDIR(st.st_mode)) return Status::InvalidArgument(root + ": not a folder");
  std::vector<InputFile> found;
  WalkInput(root, &found, problems);
  for (InputFile& f : found) {
    size_t slash = f.relative.find('/');
    if (slash == std::string::npos) {
      problems->push_back({f.path, "not inside a queue folder (ROOT/<queue>/...)"});
      continue;
    }
    std::string queue = f.relative.substr(0, slash);
    Status valid = ValidateQueueName(queue);
    if (!valid.ok()) {
      problems->push_back({f.path, valid.message()});
      continue;
    }
    files->push_back({std::move(f.path), std::move(queue), ""});
  }
  return Status::Ok();
}

Status CollectManifest(const std::string& csv_path, std::vector<LabelledFile>* files,
                       std::vector<WalkProblem>* problems) {
  std::vector<ManifestRow> rows;
  Status s = ReadManifest(csv_path, &rows, problems);
  if (!s.ok()) return s;
  for (ManifestRow& row : rows) {
    std::string context = csv_path + ": line " + std::to_string(row.line);
    Status valid = ValidateQueueName(row.queue);
    if (!valid.ok()) {
      problems->push_back({context + ": " + row.path, valid.message()});
      continue;
    }
    files->push_back({std::move(row.path), std::move(row.queue), std::move(context)});
  }
  return Status::Ok();
}

Status CollectQueue(const std::string& queue, const std::vector<std::string>& inputs,
                    std::vector<LabelledFile>* files, std::vector<WalkProblem>* problems) {
  Status valid = ValidateQueueName(queue);
  if (!valid.ok()) return valid;
  std::vector<InputFile> found;
  WalkInputs(inputs, &found, problems);
  for (InputFile& f : found) {
    files->push_back({f.path, queue, ""});
  }
  return Status::Ok();
}

}  // namespace chute
