#include "cli/format/csv_writer.h"

#include "cli/read/utf8.h"

namespace chute {

std::string CsvRecordLine(const std::vector<std::string>& fields) {
  std::string out;
  std::string valid;
  for (size_t i = 0; i < fields.size(); ++i) {
    if (i > 0) out += ',';
    const std::string* f = &fields[i];
    if (!IsValidUtf8(*f)) {
      ToValidUtf8(*f, &valid);
      f = &valid;
    }
    if (f->find_first_of(",\"\r\n") == std::string::npos) {
      out += *f;
      continue;
    }
    out += '"';
    for (char c : *f) {
      if (c == '"') out += '"';
      out += c;
    }
    out += '"';
  }
  out += "\r\n";
  return out;
}

}  // namespace chute
