// Options and helpers shared by the commands: the store's path, the output
// format, the document size limit, one-line reports on stderr.
#ifndef CHUTE_CLI_COMMON_OPTIONS_H_
#define CHUTE_CLI_COMMON_OPTIONS_H_

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include <CLI/CLI.hpp>

#include "classify/model.h"
#include "store/status.h"
#include "store/store.h"

namespace chute {

enum class OutputFormat { kTable, kJsonl, kCsv };

// An option whose value is one of a few words, each standing for a value of
// T: "--prior learned|uniform". Help shows the words; anything else is a
// usage error.
template <typename T>
void AddChoiceOption(CLI::App* command, const std::string& name, T* out,
                     std::vector<std::pair<std::string, T>> choices, const std::string& help);

// Accepts a finite number greater than 0 ("must be greater than 0"
// otherwise); for --alpha and the like.
CLI::Validator PositiveReal();

// --db PATH; the default is $CHUTE_DB, else ./chute.db.
void AddDbOption(CLI::App* command, std::string* db);
// --format table|jsonl|csv (default table).
void AddFormatOption(CLI::App* command, OutputFormat* format);
// --max-bytes N: documents larger than N bytes are refused.
void AddMaxBytesOption(CLI::App* command, int64_t* max_bytes);

// --threads N: worker threads for reading and tokenizing (default: the
// cores this process may use).
void AddThreadsOption(CLI::App* command, size_t* threads);

// --by NAME: who asks for a change; the default is LoginName().
void AddByOption(CLI::App* command, std::string* by);

// The login name (getlogin, else the password entry of the effective user,
// else "unknown").
std::string LoginName();

// The default store path: $CHUTE_DB when set and not empty, else chute.db.
std::string DefaultDbPath();

// Opens the store, or reports why not (one line on stderr) and returns
// false.
bool OpenStoreOrReport(std::string_view command, const std::string& db,
                       std::unique_ptr<Store>* store);

// The store's current model, built once for the command; reports why not
// (the store cannot be read, or has learned no documents) and returns false.
bool LoadModelOrReport(std::string_view command, Store* store, std::optional<Model>* model);

// A model with the version it is and the settings it tokenizes with.
struct LoadedModel {
  std::optional<Model> model;
  VersionInfo version;
  StoreSettings settings;
};

// The current version's model (at_version 0), or version at_version's,
// read from the history without changing anything; reports why not and
// returns false.
bool LoadModelOrReport(std::string_view command, Store* store, int64_t at_version,
                       LoadedModel* out);

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

template <typename T>
void AddChoiceOption(CLI::App* command, const std::string& name, T* out,
                     std::vector<std::pair<std::string, T>> choices, const std::string& help) {
  std::vector<std::string> words;
  std::string type;
  for (const auto& c : choices) {
    words.push_back(c.first);
    type += (type.empty() ? "" : "|") + c.first;
  }
  command
      ->add_option_function<std::string>(
          name,
          [out, choices](const std::string& v) {
            for (const auto& c : choices) {
              if (c.first == v) *out = c.second;
            }
          },
          help)
      ->check(CLI::IsMember(words).description(""))
      ->type_name(type);
}

}  // namespace chute

#endif  // CHUTE_CLI_COMMON_OPTIONS_H_
