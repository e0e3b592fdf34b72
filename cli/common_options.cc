#include "cli/common_options.h"

#include "cli/parallel.h"
#include "cli/recount.h"

#include <CLI/CLI.hpp>

#include <pwd.h>
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <filesystem>

#include "cli/parallel.h"
#include "cli/read/document_reader.h"

namespace chute {

std::string DefaultDbPath() {
  const char* env = std::getenv("CHUTE_DB");
  return env != nullptr && *env != '\0' ? env : "chute.db";
}

CLI::Validator PositiveReal() {
  return CLI::Validator(
      [](std::string& v) -> std::string {
        double a = 0;
        try {
          a = std::stod(v);
        } catch (const std::exception&) {
          return "'" + v + "' is not a number";
        }
        return a > 0 && std::isfinite(a) ? "" : "must be greater than 0";
      },
      "", "positive");
}

void AddDbOption(CLI::App* command, std::string* db) {
  *db = DefaultDbPath();
  command->add_option("--db", *db, "the store (default: $CHUTE_DB, else ./chute.db)");
}

void AddFormatOption(CLI::App* command, OutputFormat* format) {
  *format = OutputFormat::kTable;
  AddChoiceOption<OutputFormat>(command, "--format", format,
                                {{"table", OutputFormat::kTable},
                                 {"jsonl", OutputFormat::kJsonl},
                                 {"csv", OutputFormat::kCsv}},
                                "table for a person (default), jsonl or csv for programs");
}

void AddMaxBytesOption(CLI::App* command, int64_t* max_bytes) {
  *max_bytes = kDefaultMaxBytes;
  command
      ->add_option("--max-bytes", *max_bytes,
                   "refuse documents larger than this many bytes (default 33554432 = 32 MiB)")
      ->check(CLI::PositiveNumber);
}

void AddThreadsOption(CLI::App* command, size_t* threads) {
  *threads = DefaultThreads();
  command
      ->add_option("--threads", *threads,
                   "threads that read and tokenize documents (default: every core, here " +
                       std::to_string(*threads) + ")")
      ->check(CLI::Range(1, 256));
}

bool OpenStoreOrReport(std::string_view command, const std::string& db,
                       std::unique_ptr<Store>* store) {
  Status s = Store::Open(db, store);
  if (!s.ok()) Report(command, s.message());
  return s.ok();
}

bool LoadModelOrReport(std::string_view command, Store* store, std::optional<Model>* model) {
  LoadedModel loaded;
  if (!LoadModelOrReport(command, store, 0, &loaded)) return false;
  *model = std::move(loaded.model);
  return true;
}

bool LoadModelOrReport(std::string_view command, Store* store, int64_t at_version,
                       LoadedModel* out) {
  ModelCounts counts;
  Status s;
  if (at_version > 0) {
    s = store->ModelAtVersion(at_version, &out->version, &out->settings, &counts);
    if (s.code() == Status::Code::kInvalidArgument) {
      // A rebuild changed the tokenizing since: the version's documents are
      // counted again from their kept text (cli/recount.h).
      s = RecountedModelAtVersion(store, at_version, DefaultThreads(), &out->version,
                                  &out->settings, &counts);
    }
  } else {
    s = store->LoadModelCounts(&counts, &out->version);
    out->settings = store->settings();
  }
  if (!s.ok()) {
    Report(command, s.message());
    return false;
  }
  out->model = Model::Build(counts, out->settings.model);
  if (out->model->queue_count() == 0) {
    Report(command, store->path() + (at_version > 0
                                         ? ": version " + std::to_string(at_version) +
                                               " had learned no documents"
                                         : ": has learned no documents yet; run 'chute learn' first"));
    return false;
  }
  return true;
}

void Report(std::string_view command, std::string_view message) {
  std::string line = "chute ";
  line += command;
  line += ": ";
  for (char c : message) line += (c == '\n' || c == '\r') ? ' ' : c;
  line += '\n';
  std::fwrite(line.data(), 1, line.size(), stderr);
}

std::string ReasonOf(const Status& s, const std::string& path) {
  const std::string& m = s.message();
  return m.compare(0, path.size() + 2, path + ": ") == 0 ? m.substr(path.size() + 2) : m;
}

void Print(std::string_view text) { std::fwrite(text.data(), 1, text.size(), stdout); }

std::string SourcePath(const std::string& path) {
  if (path == "-") return path;
  std::error_code ec;
  auto abs = std::filesystem::absolute(path, ec);
  return ec ? path : abs.lexically_normal().string();
}

void AddByOption(CLI::App* command, std::string* by) {
  *by = LoginName();
  command->add_option("--by", *by, "who asks for the change (default: your login name)");
}

std::string LoginName() {
  if (const char* name = ::getlogin(); name != nullptr && *name != '\0') return name;
  if (const passwd* pw = ::getpwuid(::geteuid()); pw != nullptr && pw->pw_name != nullptr) {
    return pw->pw_name;
  }
  return "unknown";
}

std::string NowRfc3339() {
  std::time_t t = std::time(nullptr);
  std::tm tm;
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

}  // namespace chute
