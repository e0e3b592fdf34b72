#ifndef CHUTE_CLI_FORMAT_CSV_WRITER_H_
#define CHUTE_CLI_FORMAT_CSV_WRITER_H_

#include <string>
#include <vector>

namespace chute {

// One CSV record after RFC 4180: fields joined by commas; a field holding a
// comma, a double quote, CR or LF is quoted with its quotes doubled; the
// record ends with CRLF. Bytes that are not UTF-8 are replaced by U+FFFD.
std::string CsvRecordLine(const std::vector<std::string>& fields);

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_CSV_WRITER_H_
