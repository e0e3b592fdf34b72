#include "cli/read/csv_records.h"

#include <csv.h>

#include <algorithm>
#include <cerrno>
#include <cstring>
#include <fstream>
#include <sstream>

namespace chute {

namespace {

struct ParseState {
  std::vector<CsvRecord>* out;
  CsvRecord current;
  int64_t line = 0;               // physical line being fed
  int64_t embedded_newlines = 0;  // inside the current record's fields
};

void OnField(void* field, size_t len, void* data) {
  auto* st = static_cast<ParseState*>(data);
  const char* p = static_cast<const char*>(field);
  st->current.fields.emplace_back(p == nullptr ? "" : std::string(p, len));
  st->embedded_newlines += std::count(p, p + (p == nullptr ? 0 : len), '\n');
}

void OnRecord(int, void* data) {
  auto* st = static_cast<ParseState*>(data);
  st->current.line = st->line - st->embedded_newlines;
  st->out->push_back(std::move(st->current));
  st->current = CsvRecord();
  st->embedded_newlines = 0;
}

}  // namespace

Status ReadCsvRecords(const std::string& path, std::vector<CsvRecord>* out) {
  out->clear();
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    return errno == ENOENT ? Status::NotFound(path + ": no such file")
                           : Status::IoError(path + ": " + std::strerror(errno));
  }
  std::stringstream buffer;
  buffer << in.rdbuf();
  std::string text = buffer.str();
  if (text.compare(0, 3, "\xEF\xBB\xBF") == 0) text.erase(0, 3);

  csv_parser parser;
  if (csv_init(&parser, CSV_STRICT | CSV_STRICT_FINI) != 0) {
    return Status::IoError(path + ": cannot start the CSV parser");
  }
  ParseState st{out, {}, 0, 0};
  // Feed one physical line at a time so that record lines are known.
  size_t pos = 0;
  Status status;
  while (pos < text.size() && status.ok()) {
    size_t end = text.find('\n', pos);
    end = end == std::string::npos ? text.size() : end + 1;
    ++st.line;
    if (csv_parse(&parser, text.data() + pos, end - pos, OnField, OnRecord, &st) != end - pos) {
      status = Status::InvalidArgument(path + ": line " + std::to_string(st.line) +
                                       ": " + csv_strerror(csv_error(&parser)));
    }
    pos = end;
  }
  if (status.ok() && csv_fini(&parser, OnField, OnRecord, &st) != 0) {
    status = Status::InvalidArgument(path + ": line " + std::to_string(st.line) +
                                     ": a quoted field is never closed");
  }
  csv_free(&parser);
  return status;
}

}  // namespace chute
