// Options and helpers shared by the commands: the store's path, the output
// format, the document size limit, one-line reports on stderr.
#ifndef CHUTE_CLI_COMMON_OPTIONS_H_
#define CHUTE_CLI_COMMON_OPTIONS_H_

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>

#include "store/status.h"
#include "store/store.h"

namespace CLI {
class App;
}

namespace chute {

enum class OutputFormat { kTable, kJsonl, kCsv };

// --db PATH; the default is $CHUTE_DB, else ./chute.db.
void AddDbOption(CLI::App* command, std::string* db);
// --format table|jsonl|csv (default table).
void AddFormatOption(CLI::App* command, OutputFormat* format);
// --max-bytes N: documents larger than N bytes are refused.
void AddMaxBytesOption(CLI::App* command, int64_t* max_bytes);

// The default store path: $CHUTE_DB when set and not empty, else chute.db.
std::string DefaultDbPath();

// Opens the store, or reports why not (one line on stderr) and returns
// false.
bool OpenStoreOrReport(std::string_view command, const std::string& db,
                       std::unique_ptr<Store>* store);

// "chute <command>: <message>" on stderr, one line.
void Report(std::string_view command, std::string_view message);

// The reason of a reader's Status without its leading "path: ".
std::string ReasonOf(const Status& s, const std::string& path);

// Writes text to stdout.
void Print(std::string_view text);

// An absolute, normalised form of path for the ledger; "-" stays "-".
std::string SourcePath(const std::string& path);

// The current time, RFC 3339 in UTC with seconds ("2026-12-02T01:48:18Z").
std::string NowRfc3339();

}  // namespace chute

#endif  // CHUTE_CLI_COMMON_OPTIONS_H_
