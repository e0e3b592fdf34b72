// chute terms-of: the terms chute counts for a document, in order.
#include <CLI/CLI.hpp>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/read/document_reader.h"
#include "cli/read/input_walker.h"
#include "tokenize/tokenizer.h"

namespace chute {

namespace {

struct TermsOfOptions {
  std::string db;
  bool db_given = false;
  std::vector<std::string> inputs;
  OutputFormat format = OutputFormat::kTable;
  int64_t max_bytes = kDefaultMaxBytes;
};

int RunTermsOf(const TermsOfOptions& o) {
  if (o.inputs.empty()) {
    Report("terms-of", "name files, folders, or - for standard input");
    return kExitUsage;
  }
  // The store's settings decide the terms; without a store, the defaults.
  StoreSettings settings;
  std::unique_ptr<Store> store;
  Status s = Store::Open(o.db, &store);
  if (s.ok()) {
    settings = store->settings();
  } else if (s.code() != Status::Code::kNotFound || o.db_given) {
    Report("terms-of", s.message());
    return kExitFailed;
  }
  store.reset();

  std::vector<InputFile> files;
  std::vector<WalkProblem> problems;
  WalkInputs(o.inputs, &files, &problems);
  int64_t refused = 0, done = 0;
  for (const WalkProblem& p : problems) {
    Report("terms-of", p.path + ": " + p.reason);
    ++refused;
  }
  Tokenizer tokenizer(settings.tokenizer);
  std::vector<std::string> terms;
  Document doc;
  if (o.format == OutputFormat::kCsv) Print(CsvRecordLine({"file", "term"}));
  for (const InputFile& f : files) {
    if (Status r = ReadDocument(f.path, ReadOptions{o.max_bytes}, &doc); !r.ok()) {
      Report("terms-of", r.message());
      ++refused;
      continue;
    }
    tokenizer.Tokenize(doc.text, &terms);
    ++done;
    std::string out;
    if (o.format == OutputFormat::kJsonl) {
      JsonWriter w;
      w.BeginObject().Key("file").String(f.path).Key("terms").BeginArray();
      for (const std::string& t : terms) w.String(t);
      out = w.EndArray().EndObject().Take() + "\n";
    } else if (o.format == OutputFormat::kCsv) {
      for (const std::string& t : terms) out += CsvRecordLine({f.path, t});
    } else {
      // Terms never hold a line break, and never begin with '#'.
      if (files.size() > 1) out = "# " + f.path + "\n";
      for (const std::string& t : terms) out += t + "\n";
    }
    Print(out);
  }
  return BatchExit(done, refused);
}

}  // namespace

CommandRun SetupTermsOf(CLI::App* cmd) {
  auto o = std::make_shared<TermsOfOptions>();
  AddDbOption(cmd, &o->db);
  cmd->get_option("--db")->each([o](const std::string&) { o->db_given = true; });
  cmd->add_option("inputs", o->inputs, "files, folders, or - for standard input");
  AddFormatOption(cmd, &o->format);
  AddMaxBytesOption(cmd, &o->max_bytes);
  cmd->footer(R"(Terms follow the store's settings (--db); with no store, the defaults.
The table format prints one term per line; with several files, each file's
terms follow a line "# <file>".

Examples:
  chute terms-of letter.txt
  chute terms-of inbox/ --format jsonl)");
  return [o] { return RunTermsOf(*o); };
}

}  // namespace chute
