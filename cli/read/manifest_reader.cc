#include "cli/read/manifest_reader.h"

#include "cli/read/csv_records.h"

namespace chute {

Status ReadManifest(const std::string& csv_path, std::vector<ManifestRow>* rows,
                    std::vector<WalkProblem>* problems) {
  rows->clear();
  std::vector<CsvRecord> records;
  Status s = ReadCsvRecords(csv_path, &records);
  if (!s.ok()) return s;
  if (records.empty()) {
    return Status::InvalidArgument(csv_path + ": empty; expected a header 'path,queue'");
  }
  int path_col = -1, queue_col = -1;
  const auto& header = records[0].fields;
  for (size_t i = 0; i < header.size(); ++i) {
    if (header[i] == "path") path_col = static_cast<int>(i);
    if (header[i] == "queue") queue_col = static_cast<int>(i);
  }
  if (path_col < 0 || queue_col < 0) {
    return Status::InvalidArgument(csv_path + ": line " + std::to_string(records[0].line) +
                                   ": the header has no '" +
                                   (path_col < 0 ? "path" : "queue") + "' column");
  }
  std::string folder;
  if (size_t slash = csv_path.rfind('/'); slash != std::string::npos) {
    folder = csv_path.substr(0, slash + 1);
  }
  for (size_t r = 1; r < records.size(); ++r) {
    const CsvRecord& rec = records[r];
    auto field = [&](int col) {
      return static_cast<size_t>(col) < rec.fields.size() ? rec.fields[col] : std::string();
    };
    std::string where = csv_path + ": line " + std::to_string(rec.line);
    std::string path = field(path_col), queue = field(queue_col);
    if (path.empty()) {
      problems->push_back({where, "no path"});
      continue;
    }
    if (queue.empty()) {
      problems->push_back({where, path + ": no queue"});
      continue;
    }
    if (path.front() != '/') path = folder + path;
    rows->push_back({rec.line, std::move(path), std::move(queue)});
  }
  return Status::Ok();
}

}  // namespace chute
