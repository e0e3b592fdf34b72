#include "cli/read/fold_manifest.h"

#include <charconv>

#include "cli/read/csv_records.h"

namespace chute {

Status ReadFoldManifest(const std::string& csv_path, std::vector<FoldRow>* rows) {
  rows->clear();
  std::vector<CsvRecord> records;
  if (Status s = ReadCsvRecords(csv_path, &records); !s.ok()) return s;
  if (records.empty()) {
    return Status::InvalidArgument(csv_path + ": empty; expected a header naming 'fold' and "
                                              "'digest' or 'path'");
  }
  int fold_col = -1, digest_col = -1, path_col = -1, queue_col = -1;
  const auto& header = records[0].fields;
  for (size_t i = 0; i < header.size(); ++i) {
    const int col = static_cast<int>(i);
    if (header[i] == "fold") fold_col = col;
    if (header[i] == "digest") digest_col = col;
    if (header[i] == "path") path_col = col;
    if (header[i] == "queue") queue_col = col;
  }
  const std::string head = csv_path + ": line " + std::to_string(records[0].line) + ": ";
  if (fold_col < 0) return Status::InvalidArgument(head + "the header has no 'fold' column");
  if (digest_col < 0 && path_col < 0) {
    return Status::InvalidArgument(head + "the header has neither a 'digest' nor a 'path' column");
  }
  if (digest_col >= 0 && path_col >= 0) {
    return Status::InvalidArgument(head + "the header has both 'digest' and 'path': name "
                                          "documents one way");
  }
  std::string folder;
  if (size_t slash = csv_path.rfind('/'); slash != std::string::npos) {
    folder = csv_path.substr(0, slash + 1);
  }
  for (size_t r = 1; r < records.size(); ++r) {
    const CsvRecord& rec = records[r];
    auto field = [&](int col) {
      return col >= 0 && static_cast<size_t>(col) < rec.fields.size() ? rec.fields[col]
                                                                        : std::string();
    };
    const std::string where = csv_path + ": line " + std::to_string(rec.line) + ": ";
    FoldRow row;
    row.line = rec.line;
    row.queue = field(queue_col);
    const std::string fold = field(fold_col);
    auto [end, ec] = std::from_chars(fold.data(), fold.data() + fold.size(), row.fold);
    if (fold.empty() || ec != std::errc() || end != fold.data() + fold.size() || row.fold < 1) {
      return Status::InvalidArgument(where + "fold '" + fold + "' is not a positive integer");
    }
    if (digest_col >= 0) {
      row.digest = field(digest_col);
      for (char& c : row.digest) {
        if (c >= 'A' && c <= 'F') c = static_cast<char>(c - 'A' + 'a');
      }
      if (row.digest.size() < kMinDigestPrefix || row.digest.size() > 64 ||
          row.digest.find_first_not_of("0123456789abcdef") != std::string::npos) {
        return Status::InvalidArgument(where + "digest '" + field(digest_col) +
                                       "' is not 12 to 64 hexadecimal digits");
      }
    } else {
      row.path = field(path_col);
      if (row.path.empty()) return Status::InvalidArgument(where + "no path");
      if (row.path.front() != '/') row.path = folder + row.path;
    }
    rows->push_back(std::move(row));
  }
  return Status::Ok();
}

}  // namespace chute
