// Reading CSV files (RFC 4180) into records, with the line each record
// starts on, through libcsv (Debian libcsv-dev). A UTF-8 byte order mark at
// the start is ignored; CRLF and LF line ends are both accepted; quoted
// fields may hold commas, quotes and line breaks.
#ifndef CHUTE_CLI_READ_CSV_RECORDS_H_
#define CHUTE_CLI_READ_CSV_RECORDS_H_

#include <cstdint>
#include <string>
#include <vector>

#include "store/status.h"

namespace chute {

struct CsvRecord {
  int64_t line = 0;  // 1-based line on which the record starts
  std::vector<std::string> fields;
};

// Parses the whole file. Fails (naming the file and line) on a malformed
// file, such as a quoted field that never ends.
Status ReadCsvRecords(const std::string& path, std::vector<CsvRecord>* out);

}  // namespace chute

#endif  // CHUTE_CLI_READ_CSV_RECORDS_H_
